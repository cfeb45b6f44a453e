import type { Sequelize } from 'sequelize';
import { createPowerSimulator, POWER_ENGINE_VERSION } from '../../lib/design/power';
import { buildScenarios, runResult } from '../../lib/shared/power-scenario';
import { assumedTruth, DEFAULT_POWER_TEST, powerRunSpecSchema } from '../../lib/shared/validations/power';
import type { FrozenDesign } from '../../lib/shared/validations/planner';
import { AuditEvent, DesignVersion, Membership, PowerRun, Study, User } from '../models';
import { demoAccounts } from './demo-accounts.mjs';
import { DEMO_STUDY_NAME } from './01-demo-team';
import { decodeJson } from '../json';

export const DEMO_POWER_LABEL = 'Truth as the design assumes (demo)';


/**
 * A small finished power run of the demo study's first frozen version (the default participant-level
 * test, the truth as the design assumes and one stress truth), simulated here in
 * process (no worker threads needed for 200 replicates). Seeds only when a frozen version
 * exists; safe to run again: a run with the demo label for that version is left alone.
 */
export async function seed(sequelize: Sequelize): Promise<void> {
  const editor = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'editor')!.email } });
  if (!editor) return;
  const membership = await Membership.findOne({ where: { userId: editor.id }, include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }] });
  if (!membership) return;
  const version = await DesignVersion.findOne({ where: { studyId: membership.studyId }, order: [['id', 'ASC']] });
  if (!version) return;
  if (await PowerRun.findOne({ where: { studyId: version.studyId, designVersionId: version.id, label: DEMO_POWER_LABEL } })) return;
  const content = decodeJson<FrozenDesign>(version.content);
  const spec = powerRunSpecSchema.parse({
    designVersionId: version.id,
    label: DEMO_POWER_LABEL,
    truth: assumedTruth(content),
    calibration: 'simulated',
    stress: [{ kind: 'delay-sensitivity', low: 0.4, high: 0.9 }],
    test: { kind: DEFAULT_POWER_TEST, alpha: 0.05, alternative: 'greater' },
    sampleSizes: [10, 20, 30, 40, 60, 80],
    replications: 200,
    seed: 2026,
  });
  const scenarios = buildScenarios(spec, content);
  const outcomes = scenarios.map((scenario) => {
    const simulator = createPowerSimulator(scenario);
    return { tally: simulator.run(0, spec.replications), longestCalibrationDelay: simulator.longestCalibrationDelay };
  });
  const tally = outcomes[0].tally;
  const result: object = runResult(scenarios, outcomes, { number: version.number, hash: version.hash, content }, spec.stress);
  const total = spec.replications * scenarios.length;
  const now = new Date();
  await sequelize.transaction(async (transaction) => {
    const run = await PowerRun.create(
      {
        studyId: version.studyId,
        designVersionId: version.id,
        label: DEMO_POWER_LABEL,
        spec,
        status: 'finished',
        completed: total,
        total,
        tally,
        result,
        engineVersion: POWER_ENGINE_VERSION,
        startedAt: now,
        heartbeatAt: now,
        finishedAt: now,
        createdBy: editor.id,
      },
      { transaction },
    );
    // the same event the app writes when an editor starts a run
    await AuditEvent.create(
      { actorId: editor.id, studyId: version.studyId, action: 'power-run.start', details: { runId: run.id, designVersionId: version.id, replications: spec.replications } },
      { transaction },
    );
  });
}
