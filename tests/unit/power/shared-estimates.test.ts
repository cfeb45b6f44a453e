// The calibration estimates a run's worker threads share (lib/design/power/sharedEstimates.ts).
import { describe, expect, it } from 'vitest';
import { createPowerSimulator, mergeTallies, sharedEstimateBuffer, SharedEstimates } from '@/lib/design/power';
import { DesignInputError } from '@/lib/design';
import { createThreadPool } from '@/lib/server/jobs/thread-pool';
import type { ChunkResult, ChunkTask } from '@/lib/server/jobs/power/worker';
import { smallPowerScenario } from '../../support/frozen-design';

describe('SharedEstimates', () => {
  it('finds what was stored, by magnitude, with its flags, and nothing else', () => {
    const table = new SharedEstimates(sharedEstimateBuffer());
    expect(table.find(0, 5)).toBe(-1);
    table.store(0, 5, 0.0123, false, false);
    table.store(1, 5, 0.5, true, true);
    const small = table.find(0, 5);
    const large = table.find(1, 5);
    expect(table.rateAt(small)).toBe(0.0123);
    expect([table.flaggedAt(small), table.fallbackAt(small)]).toEqual([false, false]);
    expect(table.rateAt(large)).toBe(0.5);
    expect([table.flaggedAt(large), table.fallbackAt(large)]).toEqual([true, true]);
    expect(table.find(0, 6)).toBe(-1);
    // the first writer wins: a second store of the same vector changes nothing
    table.store(0, 5, 99, true, false);
    expect(table.rateAt(table.find(0, 5))).toBe(0.0123);
    expect(table.stored(0)).toBe(1);
  });

  it('keeps every one of many keys (colliding slots probe on) and stops storing at its fill limit', () => {
    const table = new SharedEstimates(sharedEstimateBuffer());
    for (let key = 1; key <= 150_000; key++) table.store(0, key * 7 + 1, key, false, key % 2 === 0);
    let found = 0;
    for (let key = 1; key <= 150_000; key++) {
      const at = table.find(0, key * 7 + 1);
      if (at >= 0) {
        expect(table.rateAt(at)).toBe(key);
        found++;
      }
    }
    expect(found).toBe(table.stored(0));
    expect(found).toBeGreaterThan(149_000); // a few long probe runs may give up; none stores a wrong rate
    for (let key = 150_001; key <= 400_000; key++) table.store(0, key * 7 + 1, key, false, false);
    expect(table.stored(0)).toBeLessThanOrEqual(Math.floor(2 ** 18 * 0.7));
    expect(table.stored(1)).toBe(0);
  });

  it('exports what was stored here since a point of its log, for another process to import, and imports nothing twice', () => {
    const here = new SharedEstimates(sharedEstimateBuffer());
    here.store(0, 0b1011, 0.01, false, false);
    here.store(1, 0b1011, 0.2, true, false);
    const first = here.exportEntries(0);
    expect(first.next).toBe(2);
    expect(first.entries.length).toBe(2 * 13);
    here.store(0, 0b1100, 0.03, true, true);
    const second = here.exportEntries(first.next);
    expect(second.next).toBe(3);
    expect(here.exportEntries(second.next).entries.length).toBe(0);

    const there = new SharedEstimates(sharedEstimateBuffer());
    there.store(0, 0b1100, 0.03, true, true); // estimated there too: the same number, not stored again
    expect(there.importEntries(first.entries)).toBe(2);
    expect(there.importEntries(second.entries)).toBe(0);
    expect(there.importEntries(first.entries)).toBe(0);
    for (const [magnitude, key] of [[0, 0b1011], [1, 0b1011], [0, 0b1100]] as const) {
      const at = there.find(magnitude, key);
      expect(there.rateAt(at)).toBe(here.rateAt(here.find(magnitude, key)));
      expect([there.flaggedAt(at), there.fallbackAt(at)]).toEqual([here.flaggedAt(here.find(magnitude, key)), here.fallbackAt(here.find(magnitude, key))]);
    }
    // imported estimates are not exported again: only what was estimated there
    expect(there.exportEntries(0).next).toBe(1);
  });

  it('refuses bytes that are not exported entries, naming the entry', () => {
    const table = new SharedEstimates(sharedEstimateBuffer());
    expect(() => table.importEntries(new Uint8Array(14))).toThrow(/entries/);
    const zeroKey = new Uint8Array(26);
    zeroKey.set([0, 0, 0, 5, 1], 0);
    expect(() => table.importEntries(zeroKey)).toThrow(/entries\[1\]/);
    expect(table.stored(0)).toBe(1); // the good first entry stays
  });

  it('refuses a buffer it did not make, naming the option', () => {
    expect(() => new SharedEstimates(new SharedArrayBuffer(64))).toThrow(DesignInputError);
    expect(() => new SharedEstimates(new SharedArrayBuffer(64))).toThrow(/sharedEstimates/);
  });
});

const scenario = smallPowerScenario({ replications: 16, seed: 5 });

describe('a run whose threads share their calibration estimates', () => {
  it('gives the tallies of one thread alone, and the threads do store estimates in the shared table', async () => {
    const direct = createPowerSimulator(scenario).run(0, 16);
    const buffer = sharedEstimateBuffer();
    const pool = await createThreadPool<ChunkTask, ChunkResult>('power', 2);
    try {
      const chunks = [0, 4, 8, 12].map((from) => ({ key: 'shared-test', index: 0, scenario, from, to: from + 4, estimates: buffer }));
      const parts = await Promise.all(chunks.map((task) => pool.run(task)));
      expect(mergeTallies(parts.map((part) => part.tally))).toEqual(direct);
    } finally {
      await pool.destroy();
    }
    const table = new SharedEstimates(buffer);
    expect(table.stored(0)).toBeGreaterThan(0);
    expect(table.stored(1)).toBeGreaterThan(0);
  });

  it('gives the same tallies when the table is full: the thread then keeps the estimates it cannot store in a memo of its own', () => {
    const direct = createPowerSimulator(scenario).run(0, 16);
    const buffer = sharedEstimateBuffer();
    const table = new SharedEstimates(buffer);
    // filled to its limit with keys no response vector of this design has (10 items a magnitude: its keys are below 2^11)
    for (let key = 1 << 30; !table.full(0) || !table.full(1); key++) {
      table.store(0, key, 1, false, false);
      table.store(1, key, 1, false, false);
    }
    expect(createPowerSimulator(scenario, { sharedEstimates: buffer }).run(0, 16)).toEqual(direct);
  });
});

