// How a power run is cut into chunks (lib/server/jobs/power/run-scenario.ts splitIntoChunks): the same
// pieces for the in-process pool and the queue, every replicate exactly once, in order.
import { describe, expect, it } from 'vitest';
import type { PowerScenario } from '@/lib/design/power/types';
import { splitIntoChunks, type Chunk } from '@/lib/server/jobs/power/run-scenario';

// splitIntoChunks reads only the replication count of each scenario
const scenario = (replications: number) => ({ replications }) as PowerScenario;

/** The replicates of scenario `index` the chunks cover, checked to follow one another without gap or overlap. */
function covered(chunks: Chunk[], index: number): number {
  let next = 0;
  for (const chunk of chunks.filter((c) => c.index === index)) {
    expect(chunk.from).toBe(next);
    expect(chunk.to).toBeGreaterThan(chunk.from);
    next = chunk.to;
  }
  return next;
}

describe('splitIntoChunks', () => {
  it('ends a run with quarter-size chunks, so no thread or worker waits long for the last one', () => {
    const chunks = splitIntoChunks([scenario(20_000)]);
    expect(covered(chunks, 0)).toBe(20_000);
    const sizes = chunks.map((c) => c.to - c.from);
    expect(sizes.slice(0, 76)).toEqual(new Array(76).fill(250));
    expect(sizes.slice(76).every((size) => size <= 63)).toBe(true);
    expect(sizes.slice(76).reduce((a, b) => a + b, 0)).toBe(1_000);
  });

  it('splits only the run\'s last scenario: the stress truths before it are not the end of the run', () => {
    const chunks = splitIntoChunks([scenario(2_000), scenario(2_000), scenario(2_000)]);
    for (const index of [0, 1, 2]) expect(covered(chunks, index)).toBe(2_000);
    expect(chunks.filter((c) => c.index === 0).map((c) => c.to - c.from)).toEqual(new Array(40).fill(50));
    expect(chunks.filter((c) => c.index === 2).map((c) => c.to - c.from)).toEqual([...new Array(36).fill(50), ...new Array(15).fill(13), 5]);
  });

  it('keeps a chunk size it is given, to the end', () => {
    const chunks = splitIntoChunks([scenario(240)], 10);
    expect(chunks.map((c) => c.to - c.from)).toEqual(new Array(24).fill(10));
  });

  it('covers a run smaller than its tail', () => {
    const chunks = splitIntoChunks([scenario(30)]);
    expect(covered(chunks, 0)).toBe(30);
    expect(chunks.map((c) => c.to - c.from)).toEqual([3, 3, 3, 3, 3, 3, 3, 3, 3, 3]);
  });
});
