import { createHash, randomBytes } from 'node:crypto';
import type { Redis } from 'ioredis';
import { sharedEstimateBuffer, SharedEstimates } from '@/lib/design/power/sharedEstimates';
import type { PowerScenario } from '@/lib/design/power/types';
import { RUN_KEYS_TTL_S, runKeys } from '../chunk-queue';
import { sharesEstimates } from './run-scenario';
import type { ChunkTask } from './worker';

/** The name of a design's estimates within a run (the assumed truth and its stress truths share one). */
export function designTag(scenario: PowerScenario): string {
  return createHash('sha256').update(JSON.stringify(scenario.design)).digest('hex').slice(0, 16);
}

/** The Redis lists of a run's shared estimates, one per design of its scenarios (removed when the run ends). */
export function estimateKeys(runKey: string, scenarios: readonly PowerScenario[]): string[] {
  return [...new Set(scenarios.filter(sharesEstimates).map((s) => runKeys(runKey).estimates(designTag(s))))];
}

/** What a worker process keeps of one design of one run: its threads' table and how far it has read and written the run's list. */
type Held = { runKey: string; table: SharedEstimates; buffer: SharedArrayBuffer; read: number; exported: number; waitMs: number };

/** Runs whose tables a worker process keeps (a table is about 9 MB); the oldest goes first. */
const RUNS_KEPT = 2;

/**
 * The wait before the first exchange while a run's chunks run (ms), doubled after each: most new
 * response vectors are met in a run's first chunks, so exchanges come often at its start and ever
 * more seldom after (an exchange costs this process and Redis some work however little it moves).
 */
const FIRST_EXCHANGE_MS = 50;
/** The longest wait between exchanges while chunks run (ms). */
const LONGEST_EXCHANGE_WAIT_MS = 60_000;

/**
 * The calibration estimates of a power run, shared by the worker processes that take its chunks
 * (`npm run worker`, on any machine that reaches the Redis). Within a process, the chunk's threads
 * share one table (SharedEstimates), as in an in-process run. Between processes the table travels
 * through a Redis list per run and design: before a chunk the process stores what the others have
 * added since it last looked, after it adds what its own threads estimated, and while it runs it
 * does both, often at the start of a run (its first chunks meet most new response vectors, which
 * every process would otherwise estimate for itself) and ever more seldom after.
 * An estimate depends only on the response vector and the design, so where it was computed changes
 * nothing in the tallies; sharing only saves estimating the same vector again in every process.
 */
export class EstimateExchange {
  /** Marks this process's own additions, so it does not store them a second time. */
  private readonly origin = randomBytes(8);
  private readonly held = new Map<string, Held>();

  constructor(private readonly redis: Redis) {}

  /**
   * Gives the chunk its design's table (in the task, for its thread) after storing the other
   * processes' latest estimates in it; returns how many of those were new here. An item of the
   * list that is not a valid export is skipped.
   */
  async beforeChunk(runKey: string, task: ChunkTask): Promise<number> {
    if (!sharesEstimates(task.scenario)) return 0;
    const key = runKeys(runKey).estimates(designTag(task.scenario));
    const entry = this.entry(runKey, key);
    task.estimates = entry.buffer;
    const start = entry.read;
    const items = await this.redis.lrangeBuffer(key, start, -1);
    entry.read = Math.max(entry.read, start + items.length);
    let added = 0;
    for (const item of items) {
      if (item.subarray(0, this.origin.length).equals(this.origin)) continue;
      try {
        added += entry.table.importEntries(item.subarray(this.origin.length));
      } catch {
        // not what exportEntries writes: its estimates are computed here instead
      }
    }
    return added;
  }

  /** Adds to the run's list what this process's threads have estimated since it last added; returns how many. */
  async afterChunk(runKey: string, task: ChunkTask): Promise<number> {
    if (!sharesEstimates(task.scenario)) return 0;
    const key = runKeys(runKey).estimates(designTag(task.scenario));
    const entry = this.entry(runKey, key);
    const { entries, next } = entry.table.exportEntries(entry.exported);
    const count = next - entry.exported;
    entry.exported = next;
    if (count === 0) return 0;
    await this.redis.multi().rpush(key, Buffer.concat([this.origin, entries])).expire(key, RUN_KEYS_TTL_S).exec();
    return count;
  }

  /**
   * Exchanges estimates while a chunk runs: what this process's threads have estimated so far goes
   * out, and what the others have added comes in, where the running thread finds it at once. The
   * waits between exchanges belong to the run (FIRST_EXCHANGE_MS, doubled after each exchange up to
   * LONGEST_EXCHANGE_WAIT_MS) and carry over to its next chunks. Call the returned function when the chunk ends: it stops the
   * exchanges, waits for one under way, and returns how many estimates came in and went out. A failed
   * exchange is skipped (the chunk's last catches up): sharing saves time, it is never needed.
   */
  whileRunning(runKey: string, task: ChunkTask): () => Promise<{ taken: number; added: number }> {
    const counts = { taken: 0, added: 0 };
    if (!sharesEstimates(task.scenario)) return async () => counts;
    const entry = this.entry(runKey, runKeys(runKey).estimates(designTag(task.scenario)));
    let stopped = false;
    let underway: Promise<void> = Promise.resolve();
    let timer: NodeJS.Timeout;
    const next = () => {
      timer = setTimeout(() => {
        entry.waitMs = Math.min(2 * entry.waitMs, LONGEST_EXCHANGE_WAIT_MS);
        underway = (async () => {
          counts.added += await this.afterChunk(runKey, task);
          counts.taken += await this.beforeChunk(runKey, task);
        })()
          .catch(() => {})
          .finally(() => {
            if (!stopped) next();
          });
      }, entry.waitMs);
    };
    next();
    return async () => {
      stopped = true;
      clearTimeout(timer);
      await underway;
      return counts;
    };
  }

  private entry(runKey: string, key: string): Held {
    let entry = this.held.get(key);
    if (!entry) {
      const runs = [...new Set([...this.held.values()].map((held) => held.runKey))];
      if (!runs.includes(runKey) && runs.length >= RUNS_KEPT) {
        for (const [other, held] of this.held) if (held.runKey === runs[0]) this.held.delete(other);
      }
      const buffer = sharedEstimateBuffer();
      entry = { runKey, table: new SharedEstimates(buffer), buffer, read: 0, exported: 0, waitMs: FIRST_EXCHANGE_MS };
      this.held.set(key, entry);
    }
    return entry;
  }
}
