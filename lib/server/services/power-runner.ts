import { Op } from 'sequelize';
import { db } from '@/db';
import { DesignVersion, PowerRun } from '@/db/models';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerRunSpec } from '@/lib/shared/validations/power';
import { notifyPowerRunFinished } from './notices';
import { buildScenarios, runResult } from '@/lib/shared/power-scenario';
import { runScenarios } from '@/lib/server/jobs/power/run-scenario';
import { decodeJson } from '@/db/json';

/** Runs executing in this process, with their cancel flags (on globalThis to survive dev reloads). */
const holder = globalThis as unknown as { switchbackPowerRuns?: Map<number, { cancel: boolean }> };
export const activeRuns = (holder.switchbackPowerRuns ??= new Map());

/** How often a running run's heartbeat is written; a run silent for STALE_MS is taken as interrupted. */
export const HEARTBEAT_MS = 2000;
export const STALE_MS = 20_000;


/** Asks this process to stop a run before its next chunk. */
export function requestCancel(runId: number): void {
  const state = activeRuns.get(runId);
  if (state) state.cancel = true;
}

/**
 * Starts a saved run off the request path: the promise is not awaited by the caller. Progress,
 * heartbeat and the result go to MariaDB; a cancel (here or from another process, seen as a
 * status change) stops it before the next chunk.
 */
export function launchRun(runId: number, options: { workers?: number } = {}): Promise<void> {
  if (activeRuns.has(runId)) return Promise.resolve();
  const state = { cancel: false };
  activeRuns.set(runId, state);
  return execute(runId, state, options)
    .catch((error) => console.error(`[switchback] power run ${runId} could not record its outcome:`, error))
    .finally(() => activeRuns.delete(runId));
}

async function execute(runId: number, state: { cancel: boolean }, options: { workers?: number }) {
  db();
  const run = await PowerRun.findByPk(runId);
  if (!run) return;
  const version = await DesignVersion.findByPk(run.designVersionId);
  if (!version) return void (await fail(runId, 'The frozen design version of this run no longer exists.'));
  const now = new Date();
  const [claimed] = await PowerRun.update(
    { status: 'running', startedAt: now, heartbeatAt: now, completed: 0, message: null, tally: null, result: null, finishedAt: null },
    { where: { id: runId, status: 'queued' } },
  );
  if (claimed === 0) return; // cancelled before it started, or taken by another process
  // MariaDB counts only changed rows as affected (a heartbeat within the same second changes
  // nothing), so a cancel from elsewhere is read from the status, not from an update's count
  const beat = setInterval(() => {
    PowerRun.update({ heartbeatAt: new Date() }, { where: { id: runId, status: 'running' } })
      .then(() => PowerRun.findByPk(runId, { attributes: ['status'] }))
      .then((row) => {
        if (!row || row.status !== 'running') state.cancel = true;
      })
      .catch((error) => console.warn(`[switchback] power run ${runId}: heartbeat not written (${error instanceof Error ? error.message : error})`)); // the next beat retries
  }, HEARTBEAT_MS);
  try {
    const spec = decodeJson<PowerRunSpec>(run.spec);
    const content = decodeJson<FrozenDesign>(version.content);
    const scenarios = buildScenarios(spec, content);
    const total = scenarios.reduce((sum, s) => sum + s.replications, 0);
    let lastWrite = 0;
    const outcomes = await runScenarios(scenarios, {
      workers: options.workers,
      shouldStop: () => state.cancel,
      onProgress: async (completed) => {
        const t = Date.now();
        if (t - lastWrite < 250 && completed < total) return;
        lastWrite = t;
        await PowerRun.update({ completed, heartbeatAt: new Date() }, { where: { id: runId, status: 'running' } }).catch((error) =>
          console.warn(`[switchback] power run ${runId}: progress not written (${error instanceof Error ? error.message : error})`),
        );
      },
    });
    if (!outcomes) return; // cancelled: the cancel already wrote the status
    const result: object = runResult(scenarios, outcomes, { number: version.number, hash: version.hash, content }, spec.stress ?? []);
    const [stored] = await PowerRun.update(
      {
        status: 'finished',
        completed: total,
        // the assumed truth's tally (the stress truths' summaries are in the result)
        tally: outcomes[0].tally,
        result,
        finishedAt: new Date(),
        heartbeatAt: new Date(),
      },
      { where: { id: runId, status: 'running' } },
    );
    if (stored > 0) await notifyPowerRunFinished(run.studyId, runId); // never rejects
  } catch (error) {
    const reference = `${Date.now().toString(36)}`;
    console.error(`[switchback] power run ${runId} failed (${reference}):`, error);
    const detail = error instanceof Error && /DesignInputError|must be|expected/.test(`${error.name} ${error.message}`) ? ` ${error.message}` : '';
    await fail(runId, `The simulation stopped with an error (reference ${reference}).${detail}`);
  } finally {
    clearInterval(beat);
  }
}

async function fail(runId: number, message: string) {
  await PowerRun.update({ status: 'failed', message, finishedAt: new Date() }, { where: { id: runId, status: { [Op.in]: ['queued', 'running'] } } });
}

/** The message an interrupted run shows. */
export function interruptedMessage(completed: number, total: number): string {
  return (
    `The server stopped while this run was in progress (${completed} of ${total} replicates done), so it was interrupted. ` +
    'Restart it to run it again from the start; with the same seed it gives the same result.'
  );
}

/**
 * Marks runs that are queued or running but not executing in this process, and silent for
 * longer than `staleMs`, as interrupted. Called at server start (instrumentation.ts) and
 * when a run is read, so a run whose server died never shows progress forever.
 *
 * @returns the number of runs marked
 */
export async function markInterruptedRuns(staleMs = STALE_MS, where: { id?: number; studyId?: number } = {}): Promise<number> {
  db();
  const cutoff = new Date(Date.now() - staleMs);
  const rows = await PowerRun.findAll({
    where: {
      ...where,
      status: { [Op.in]: ['queued', 'running'] },
      [Op.or]: [{ heartbeatAt: null }, { heartbeatAt: { [Op.lt]: cutoff } }],
    },
  });
  let marked = 0;
  for (const row of rows) {
    if (activeRuns.has(row.id)) continue;
    const [affected] = await PowerRun.update(
      { status: 'interrupted', message: interruptedMessage(row.completed, row.total) },
      { where: { id: row.id, status: { [Op.in]: ['queued', 'running'] } } },
    );
    marked += affected;
  }
  return marked;
}
