import { Op } from 'sequelize';
import { db } from '@/db';
import { DesignVersion, PowerRun, User } from '@/db/models';
import { ApiError, ConflictError, NotFoundError, ValidationError } from '@/lib/server/errors';
import { parseEntityId } from '@/lib/server/route-ids';
import { createPowerSimulator, POWER_ENGINE_VERSION } from '@/lib/design/power';
import { DesignInputError } from '@/lib/design/DesignInputError';
import { activeRuns, launchRun, markInterruptedRuns, queuePositions, requestCancel, STALE_MS } from './power-runner';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerRunSpec, PowerStatus } from '@/lib/shared/validations/power';
import { recordAudit } from './audit';
import { buildScenarios, type PowerRunResult } from '@/lib/shared/power-scenario';
import { decodeJson } from '@/db/json';


/** A finished run's result; runs saved before stress truths existed read with none. */
export type PowerResultDto = PowerRunResult;

export type PowerRunDto = {
  id: number;
  label: string;
  status: PowerStatus;
  completed: number;
  total: number;
  percent: number;
  /** estimated seconds left while running (from the pace so far); null otherwise */
  secondsLeft: number | null;
  /** while queued behind the power-run caps: 1 for the next run to start; null otherwise */
  queuePosition: number | null;
  message: string | null;
  spec: PowerRunSpec;
  design: { versionId: number; number: number; hash: string; name: string };
  engineVersion: string;
  createdBy: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  result: PowerResultDto | null;
};

function readResult(result: PowerResultDto): PowerResultDto {
  return { ...result, stress: result.stress ?? [] };
}

/** A stored spec, with the stress list runs saved before stress truths lack. */
function readSpec(spec: PowerRunSpec): PowerRunSpec {
  return { ...spec, stress: spec.stress ?? [] };
}

function toDto(row: PowerRun, version: DesignVersion, creator: User | null, withResult: boolean, positions: Map<number, number>): PowerRunDto {
  const content = decodeJson<FrozenDesign>(version.content);
  let secondsLeft: number | null = null;
  if (row.status === 'running' && row.startedAt && row.completed > 0) {
    const elapsed = (Date.now() - row.startedAt.getTime()) / 1000;
    secondsLeft = Math.max(0, Math.round((elapsed / row.completed) * (row.total - row.completed)));
  }
  return {
    id: row.id,
    label: row.label,
    status: row.status,
    completed: row.completed,
    total: row.total,
    percent: row.total > 0 ? Math.floor((100 * row.completed) / row.total) : 0,
    secondsLeft,
    queuePosition: row.status === 'queued' ? (positions.get(row.id) ?? null) : null,
    message: row.message ?? null,
    spec: readSpec(decodeJson<PowerRunSpec>(row.spec)),
    design: { versionId: version.id, number: version.number, hash: version.hash, name: content.spec.name },
    engineVersion: row.engineVersion,
    createdBy: creator?.name ?? null,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
    result: withResult && row.result ? readResult(decodeJson<PowerResultDto>(row.result as PowerResultDto)) : null,
  };
}

async function withRelations(rows: PowerRun[], withResult: boolean): Promise<PowerRunDto[]> {
  const versions = new Map((await DesignVersion.findAll({ where: { id: [...new Set(rows.map((r) => r.designVersionId))] } })).map((v) => [v.id, v]));
  const userIds = [...new Set(rows.map((r) => r.createdBy).filter((v): v is number => v !== null))];
  const users = new Map((userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : []).map((u) => [u.id, u]));
  const positions = queuePositions();
  return rows.filter((r) => versions.has(r.designVersionId)).map((r) => toDto(r, versions.get(r.designVersionId)!, r.createdBy ? (users.get(r.createdBy) ?? null) : null, withResult, positions));
}

/** The study's runs, newest first (without the bulky results). */
export async function listPowerRuns(studyId: number): Promise<PowerRunDto[]> {
  db();
  await markInterruptedRuns(STALE_MS, { studyId });
  const rows = await PowerRun.findAll({ where: { studyId }, order: [['createdAt', 'DESC'], ['id', 'DESC']], attributes: { exclude: ['tally', 'result'] } });
  return withRelations(rows, false);
}

/** One run with its results; 404 when it is not in this study. */
export async function getPowerRun(studyId: number, runId: number): Promise<PowerRunDto> {
  db();
  await markInterruptedRuns(STALE_MS, { id: runId, studyId });
  const row = await PowerRun.findOne({ where: { id: runId, studyId } });
  if (!row) throw new NotFoundError('Power run not found.');
  return (await withRelations([row], true))[0];
}

/** The stored row (for exports). */
export async function findPowerRun(studyId: number, runId: number): Promise<PowerRun> {
  db();
  const row = await PowerRun.findOne({ where: { id: runId, studyId } });
  if (!row) throw new NotFoundError('Power run not found.');
  return row;
}

/** Parses a run id from a route parameter; anything malformed is "not found". */
export function parseRunId(raw: string | undefined): number {
  return parseEntityId(raw, 'Power run');
}

/**
 * Saves a run and starts it off the request path. The spec is checked against the frozen
 * design before anything is saved: a version of another study is a 422 on designVersionId, a
 * scenario the engine refuses a 422 naming its field.
 */
export async function createPowerRun(actorId: number, studyId: number, spec: PowerRunSpec): Promise<PowerRunDto> {
  db();
  const version = await DesignVersion.findOne({ where: { id: spec.designVersionId, studyId } });
  if (!version) throw new ValidationError([{ path: 'designVersionId', message: 'Choose a frozen design version of this study.' }]);
  let scenarioCount = 0;
  try {
    const scenarios = buildScenarios(spec, decodeJson<FrozenDesign>(version.content));
    for (const scenario of scenarios) createPowerSimulator(scenario);
    scenarioCount = scenarios.length;
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: error.field, message: error.message }]);
    throw error;
  }
  const row = await db().transaction(async (transaction) => {
    const created = await PowerRun.create(
      { studyId, designVersionId: version.id, label: spec.label, spec, total: spec.replications * scenarioCount, engineVersion: POWER_ENGINE_VERSION, createdBy: actorId, heartbeatAt: new Date() },
      { transaction },
    );
    await recordAudit({ actorId, studyId, action: 'power-run.start', details: { runId: created.id, designVersionId: version.id, replications: spec.replications } }, transaction);
    return created;
  });
  void launchRun(row.id, { studyId });
  return (await withRelations([row], false))[0];
}

/** Cancels a queued or running run; 409 when it has already ended. */
export async function cancelPowerRun(actorId: number, studyId: number, runId: number, actorName: string): Promise<PowerRunDto> {
  db();
  const row = await findPowerRun(studyId, runId);
  await db().transaction(async (transaction) => {
    const [affected] = await PowerRun.update(
      { status: 'cancelled', message: `Cancelled by ${actorName || 'an editor'} after ${row.completed} of ${row.total} replicates.`, finishedAt: new Date() },
      { where: { id: runId, studyId, status: { [Op.in]: ['queued', 'running'] } }, transaction },
    );
    if (affected === 0) throw new ConflictError('This run has already ended; there is nothing to cancel.');
    await recordAudit({ actorId, studyId, action: 'power-run.cancel', details: { runId, completed: row.completed } }, transaction);
  });
  requestCancel(runId); // after the commit: the runner also sees the status change itself
  return getPowerRun(studyId, runId);
}

/** Starts an interrupted, cancelled or failed run again from the start (same spec and seed). */
export async function restartPowerRun(actorId: number, studyId: number, runId: number): Promise<PowerRunDto> {
  db();
  await findPowerRun(studyId, runId);
  if (activeRuns.has(runId)) throw new ConflictError('This run is still stopping; try again in a moment.');
  await db().transaction(async (transaction) => {
    const [affected] = await PowerRun.update(
      { status: 'queued', completed: 0, message: null, tally: null, result: null, startedAt: null, finishedAt: null, heartbeatAt: new Date() },
      { where: { id: runId, studyId, status: { [Op.in]: ['interrupted', 'cancelled', 'failed'] } }, transaction },
    );
    if (affected === 0) throw new ConflictError('Only an interrupted, cancelled or failed run can be restarted.');
    await recordAudit({ actorId, studyId, action: 'power-run.restart', details: { runId } }, transaction);
  });
  void launchRun(runId, { studyId }); // after the commit, so the runner claims the queued row
  return getPowerRun(studyId, runId);
}

/** The finished result of a run, or 409 when it has none yet. */
export async function finishedResult(studyId: number, runId: number): Promise<{ run: PowerRunDto; result: PowerResultDto }> {
  const run = await getPowerRun(studyId, runId);
  if (run.status !== 'finished' || !run.result) throw new ApiError(409, 'This run has no results yet: downloads are ready when it has finished.');
  return { run, result: run.result };
}
