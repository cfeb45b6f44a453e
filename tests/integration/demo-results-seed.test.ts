// The demo results seeder: an invented completed dataset and one saved analysis for the demo
// study; running it again adds nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import { db } from '@/db';
import { Analysis, Participant, Stage2Answer, Study } from '@/db/models';
import { DEMO_STUDY_NAME, seed as seedTeam } from '@/db/seeders/01-demo-team';
import { seed as seedPlanner } from '@/db/seeders/02-demo-planner';
import { seed as seedItemBank } from '@/db/seeders/03-demo-item-bank';
import { seed as seedResults } from '@/db/seeders/06-demo-results';
import type { StoredAnalysis } from '@/lib/shared/results/stored-analysis';
import { migrateUp } from '../support/integration';

beforeAll(migrateUp);

describe('the demo results seeder', () => {
  it('adds 36 participants with stage-2 answers and a saved analysis with zones, once', async () => {
    await seedTeam(db());
    await seedPlanner(db());
    await seedItemBank(db());
    const study = (await Study.findAll({ where: { name: DEMO_STUDY_NAME } }))[0];
    const before = await Participant.count({ where: { studyId: study.id } });
    await seedResults(db());
    const counts = async () => ({
      participants: await Participant.count({ where: { studyId: study.id } }),
      answers: await Stage2Answer.count({ where: { studyId: study.id } }),
      analyses: await Analysis.count({ where: { studyId: study.id } }),
    });
    const after = await counts();
    expect(after.participants - before).toBe(36);
    expect(after.analyses).toBe(1);
    await seedResults(db());
    expect(await counts()).toEqual(after);
    const analysis = await Analysis.findOne({ where: { studyId: study.id } });
    const result = (typeof analysis!.result === 'string' ? JSON.parse(analysis!.result) : analysis!.result) as StoredAnalysis;
    // two failed attention checks and one half-finished block are excluded by the default rules
    expect(result.exclusions.rules.find((r) => r.rule === 'attentionCheck')!.applies).toBe(2);
    expect(result.exclusions.rules.find((r) => r.rule === 'incompleteBlocks')!.applies).toBeGreaterThanOrEqual(1);
    expect(result.zones!.participants.length).toBe(result.participantsAnalysed);
    expect(analysis!.paragraph).toContain('not a clinical assessment');
  }, 120_000);
});
