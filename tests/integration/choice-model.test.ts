// One frozen version, one choice sensitivity γ: the design page's numbers, a power run started
// from the version's defaults, the item-bank export and the probe-items API all use the γ the
// design sets (14 here, neither the old estimator default 10 nor the old planner default 20).
import { beforeAll, describe, expect, it } from 'vitest';
import { Design, DesignVersion, PriorSet } from '@/db/models';
import { POST as probeItems } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { contentHash } from '@/lib/shared/canonical-json';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { designSummary } from '@/lib/server/services/planner-summary';
import { previewItemBank } from '@/lib/server/services/item-bank';
import { buildScenario } from '@/lib/shared/power-scenario';
import { exportOptionsSchema } from '@/lib/shared/validations/item-bank';
import { assumedTruth, type PowerRunSpecInput } from '@/lib/shared/validations/power';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, demoContent } from './item-bank-support';

beforeAll(migrateUp);

const GAMMA = 14;

describe('one choice sensitivity per frozen version', () => {
  it('is the same γ on the design page, in the power run, in the item-bank export and in the probe-items API', async () => {
    const { study, team } = await makeStudyWithTeam('One choice model');
    const base = demoContent({ choiceSensitivity: GAMMA });
    const { name: _name, ...values } = base.prior;
    const priorSet = await PriorSet.create({ studyId: study.id, name: base.prior.name, values, source: 'manual', notes: '', createdBy: team.owner.id });
    const content: FrozenDesign = { spec: { ...base.spec, priorSetId: priorSet.id }, prior: base.prior };
    const design = await Design.create({ studyId: study.id, name: content.spec.name, spec: content.spec, createdBy: team.owner.id });
    const version = await DesignVersion.create({ designId: design.id, studyId: study.id, number: 1, hash: contentHash(content), content, frozenBy: team.owner.id });

    // the design page
    const { summary } = await designSummary(study.id, design.id);
    expect(summary.choiceSensitivity).toBe(GAMMA);

    // a power run started from the version's defaults (what the new-run form fills in)
    const truth = assumedTruth(content);
    expect(truth.gamma).toBe(GAMMA);
    const spec: PowerRunSpecInput = {
      designVersionId: version.id,
      label: 'As assumed',
      truth,
      calibration: 'simulated',
      test: { kind: 'sign', alpha: 0.05, alternative: 'greater' },
      sampleSizes: [5, 10],
      replications: 10,
      seed: 1,
    };
    const started = await startRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs`, { json: spec }), ctx({ id: String(study.id) }));
    expect(started.status).toBe(202);
    const { run } = await started.json();
    let finished: { status: string; spec: { truth: { gamma: number } }; result: { methodText: string } } | null = null;
    const deadline = Date.now() + 90_000;
    while (!finished && Date.now() < deadline) {
      const reply = await getRun(await requestAs(team.viewer, 'GET', `/api/studies/${study.id}/power-runs/${run.id}`), ctx({ id: String(study.id), runId: String(run.id) }));
      const body = (await reply.json()).run;
      if (body.status === 'finished') finished = body;
      else await new Promise((r) => setTimeout(r, 150));
    }
    expect(finished?.spec.truth.gamma).toBe(GAMMA);
    // the simulated participants choose with γ and their rates are re-estimated with the same γ
    expect(finished?.result.methodText).toContain(`sensitivity γ = ${GAMMA} per unit of the larger amount`);
    expect(finished?.result.methodText).toContain(`its choice model (γ = ${GAMMA} per unit of each item's later amount, no lapse)`);
    expect(buildScenario(spec as never, content).design.spec.choiceSensitivity).toBe(GAMMA);

    // the item-bank export states it
    const preview = previewItemBank(study, version, exportOptionsSchema.parse({ format: 'json' }));
    expect(preview.header.choiceModel).toEqual({ sensitivity: GAMMA, lapse: 0, unit: 'per unit of the larger amount' });
    // and the item-bank page's extrapolation risk is simulated with the same design (and so the same γ)
    expect(preview.extrapolationRisk?.message).toMatch(/^Under delay sensitivity drawn from U\(0\.4, 0\.9\), \d+\.\d % of probe pairs would fall outside the true reversal zone/);

    // the probe-items API estimates with it and says so
    const keyReply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Survey', designVersionId: version.id } }), ctx({ id: String(study.id) }));
    const { secret } = (await keyReply.json()) as { secret: string };
    const responses = answersOf(bankFor(version).bank.items, { kSmall: 0.05, kLarge: 0.01 });
    const served = await probeItems(
      await requestAs(null, 'POST', `/api/v1/studies/${study.id}/probe-items`, { json: { participantId: 'P-1', responses }, headers: { authorization: `Bearer ${secret}` } }),
      ctx({ id: String(study.id) }),
    );
    expect(served.status).toBe(200);
    const body = (await served.json()) as { estimates: { choiceSensitivity: number } };
    expect(body.estimates.choiceSensitivity).toBe(GAMMA);
  });
});
