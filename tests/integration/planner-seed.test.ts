import { beforeAll, describe, expect, it } from 'vitest';
import { db } from '@/db';
import { AuditEvent, Design, DesignVersion, PriorSet, Study } from '@/db/models';
import { DEMO_STUDY_NAME, seed as seedTeam } from '@/db/seeders/01-demo-team';
import { DEMO_DESIGN_NAMES, DEMO_PRIOR_NAME, seed as seedPlanner } from '@/db/seeders/02-demo-planner';
import { contentHash } from '@/lib/shared/canonical-json';
import { migrateUp } from '../support/integration';

beforeAll(migrateUp);

describe('the demo planner seeder', () => {
  it('adds the Harbourlight prior, two designs and one frozen version, and adds nothing when run again', async () => {
    await seedTeam(db());
    await seedPlanner(db());
    const study = (await Study.findAll({ where: { name: DEMO_STUDY_NAME } }))[0];
    const counts = async () => ({
      priors: await PriorSet.count({ where: { studyId: study.id } }),
      designs: await Design.count({ where: { studyId: study.id, name: [...DEMO_DESIGN_NAMES] } }),
      versions: await DesignVersion.count({ where: { studyId: study.id } }),
      freezes: await AuditEvent.count({ where: { studyId: study.id, action: 'design.freeze' } }),
    });
    const before = await counts();
    await seedPlanner(db());
    expect(await counts()).toEqual(before);
    expect(await PriorSet.count({ where: { studyId: study.id, name: DEMO_PRIOR_NAME } })).toBe(1);
    expect(before.designs).toBe(2);
    const version = await DesignVersion.findOne({ where: { studyId: study.id }, order: [['id', 'ASC']] });
    expect(version!.hash).toBe(contentHash(version!.content));
    expect(version!.content.prior.name).toBe(DEMO_PRIOR_NAME);
  });
});
