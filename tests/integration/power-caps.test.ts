// Power runs are capped per server process and per study (POWER_MAX_RUNS_PER_SERVER,
// POWER_MAX_RUNS_PER_STUDY): further runs stay queued with a visible position and start by
// themselves, in order, when a slot frees.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { POST as cancelRun } from '@/app/api/studies/[id]/power-runs/[runId]/cancel/route';
import { Design, DesignVersion, PriorSet } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { frozenDesign as design } from '../support/frozen-design';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';

const saved = { server: process.env.POWER_MAX_RUNS_PER_SERVER, study: process.env.POWER_MAX_RUNS_PER_STUDY };
beforeAll(migrateUp);
afterAll(() => {
  for (const [name, value] of [['POWER_MAX_RUNS_PER_SERVER', saved.server], ['POWER_MAX_RUNS_PER_STUDY', saved.study]] as const) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
});

type Team = Awaited<ReturnType<typeof makeStudyWithTeam>>;
type Run = { id: number; status: string; queuePosition: number | null };

async function studyWithVersion(name: string) {
  const made = await makeStudyWithTeam(name);
  const content: FrozenDesign = design();
  const priorSet = await PriorSet.create({ studyId: made.study.id, name: 'Prior', values: content.prior, source: 'manual', notes: '', createdBy: made.team.editor.id });
  const spec = { ...content.spec, priorSetId: priorSet.id };
  const row = await Design.create({ studyId: made.study.id, name: spec.name, spec, createdBy: made.team.editor.id });
  const frozen = { spec, prior: content.prior };
  const version = await DesignVersion.create({ designId: row.id, studyId: made.study.id, number: 1, hash: contentHash(frozen), content: frozen, frozenBy: made.team.editor.id });
  return { ...made, version };
}

/** A run long enough to hold its slot until cancelled (20,000 replications of 40 sizes). */
async function start(s: Team & { version: DesignVersion }, replications = 20_000): Promise<Run> {
  const spec = {
    designVersionId: s.version.id,
    truth: { model: { id: 'hyperbolic' }, prior: { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.5 }, gamma: 10, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
    sampleSizes: Array.from({ length: 40 }, (_, i) => 100 * (i + 1)),
    replications,
    seed: 3,
  };
  const reply = await startRun(await requestAs(s.team.editor, 'POST', `/api/studies/${s.study.id}/power-runs`, { json: spec }), ctx({ id: String(s.study.id) }));
  expect(reply.status).toBe(202);
  return ((await reply.json()) as { run: Run }).run;
}

async function read(user: TestUser, studyId: number, runId: number): Promise<Run> {
  const reply = await getRun(await requestAs(user, 'GET', `/api/studies/${studyId}/power-runs/${runId}`), ctx({ id: String(studyId), runId: String(runId) }));
  return ((await reply.json()) as { run: Run }).run;
}

async function until(user: TestUser, studyId: number, runId: number, done: (run: Run) => boolean): Promise<Run> {
  const deadline = Date.now() + 60_000;
  for (;;) {
    const run = await read(user, studyId, runId);
    if (done(run)) return run;
    if (Date.now() > deadline) throw new Error(`run ${runId} stayed ${run.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function cancel(s: Team, runId: number) {
  await cancelRun(await requestAs(s.team.editor, 'POST', `/api/studies/${s.study.id}/power-runs/${runId}/cancel`), ctx({ id: String(s.study.id), runId: String(runId) }));
}

describe('power-run caps', () => {
  it('queues runs beyond the server cap with their positions, and starts them in turn as slots free', async () => {
    process.env.POWER_MAX_RUNS_PER_SERVER = '1';
    process.env.POWER_MAX_RUNS_PER_STUDY = '1';
    const a = await studyWithVersion('Caps A');
    const b = await studyWithVersion('Caps B');
    const first = await start(a);
    const second = await start(b);
    const third = await start(a);
    await until(a.team.viewer, a.study.id, first.id, (r) => r.status === 'running');
    expect(await read(b.team.viewer, b.study.id, second.id)).toMatchObject({ status: 'queued', queuePosition: 1 });
    expect(await read(a.team.viewer, a.study.id, third.id)).toMatchObject({ status: 'queued', queuePosition: 2 });

    await cancel(a, first.id);
    await until(b.team.viewer, b.study.id, second.id, (r) => r.status === 'running');
    expect(await read(a.team.viewer, a.study.id, third.id)).toMatchObject({ status: 'queued', queuePosition: 1 });

    await cancel(b, second.id);
    await until(a.team.viewer, a.study.id, third.id, (r) => r.status === 'running');
    await cancel(a, third.id);
  });

  it('lets another study pass a study at its own cap', async () => {
    process.env.POWER_MAX_RUNS_PER_SERVER = '2';
    process.env.POWER_MAX_RUNS_PER_STUDY = '1';
    const a = await studyWithVersion('Caps C');
    const b = await studyWithVersion('Caps D');
    const first = await start(a);
    const second = await start(a);
    const other = await start(b);
    await until(a.team.viewer, a.study.id, first.id, (r) => r.status === 'running');
    await until(b.team.viewer, b.study.id, other.id, (r) => r.status === 'running');
    expect(await read(a.team.viewer, a.study.id, second.id)).toMatchObject({ status: 'queued', queuePosition: 1 });
    // A queued run is kept alive (heartbeat), not taken for interrupted by a later read.
    await new Promise((r) => setTimeout(r, 2500));
    expect((await read(a.team.viewer, a.study.id, second.id)).status).toBe('queued');

    await cancel(a, second.id); // a queued run leaves the queue at once
    expect((await read(a.team.viewer, a.study.id, second.id)).status).toBe('cancelled');
    await cancel(a, first.id);
    await cancel(b, other.id);
  });
});
