// What the scale-out integration tests share: the frozen design their power runs simulate, the run
// settings, a frozen version of it in a study, and the hooks that point the file at the test Redis and
// stop its queue worker processes after each test.
import { afterAll, afterEach, beforeAll } from 'vitest';
import { Design, DesignVersion, PriorSet } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { closeSharedRedis } from '@/lib/server/redis';
import { POWER_PRIOR, powerDesign } from './frozen-design';
import { testRedisUrl, type Child } from './processes';

/** The design the queued runs simulate: a small calibration block, so a run takes seconds. */
export const QUEUED_DESIGN: FrozenDesign = powerDesign({ lateDelayLimit: 3650, calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365 } });

/** A power run's settings as the app takes them (replications and seed are each test's own). */
export const QUEUED_RUN = {
  label: 'As the design assumes',
  truth: { model: { id: 'hyperbolic' as const }, prior: POWER_PRIOR, gamma: 10, lapse: 0.02 },
  calibration: 'simulated' as const,
  test: { kind: 'mcnemar' as const, alpha: 0.05, alternative: 'greater' as const },
  sampleSizes: [5, 10, 20, 40],
};

/** Freezes QUEUED_DESIGN (with a prior set of its own) as version 1 of a design in the study. */
export async function freezeQueuedDesign(studyId: number, ownerId: number): Promise<DesignVersion> {
  const priorSet = await PriorSet.create({ studyId, name: 'Pilot prior', values: POWER_PRIOR, source: 'manual', notes: '', createdBy: ownerId });
  const designSpec = { ...QUEUED_DESIGN.spec, priorSetId: priorSet.id };
  const design = await Design.create({ studyId, name: designSpec.name, spec: designSpec, createdBy: ownerId });
  const frozen = { spec: designSpec, prior: QUEUED_DESIGN.prior };
  return DesignVersion.create({ designId: design.id, studyId, number: 1, hash: contentHash(frozen), content: frozen, frozenBy: ownerId });
}

/**
 * Sets REDIS_URL to the test Redis for the file's tests and returns the list a test puts its queue
 * worker processes in: they are stopped after each test, and the shared Redis client closed at the end.
 */
export function queueWorkersOfFile(): Child[] {
  const workers: Child[] = [];
  beforeAll(() => {
    process.env.REDIS_URL = testRedisUrl();
  });
  afterEach(async () => {
    await Promise.all(workers.splice(0).map((w) => w.stop()));
  });
  afterAll(async () => {
    delete process.env.REDIS_URL;
    await closeSharedRedis();
  });
  return workers;
}
