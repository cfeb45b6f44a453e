import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createRandom, maxFeasibleGap, meetsGap, orderBlock } from '@/lib/design';

function block(pairs: number, singles: number) {
  return [
    ...Array.from({ length: pairs }, (_, p) => [{ id: `p${p}-far`, pairId: `p${p}` }, { id: `p${p}-near`, pairId: `p${p}` }]).flat(),
    ...Array.from({ length: singles }, (_, s) => ({ id: `s${s}`, pairId: null })),
  ];
}

describe('seeded ordering with the pair-gap constraint', () => {
  it('keeps the two views of every pair at least the achievable gap apart, for many seeds and block sizes', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 32 - 1 }), fc.integer({ min: 1, max: 12 }), fc.integer({ min: 0, max: 6 }), fc.integer({ min: 1, max: 6 }), (seed, pairs, singles, minGap) => {
        const items = block(pairs, singles);
        const { order, gap } = orderBlock(items, { random: createRandom({ seed }), minGap });
        expect(gap).toBe(Math.min(minGap, maxFeasibleGap(pairs, singles)));
        expect(meetsGap(order, gap)).toBe(true);
        if (pairs - 1 + singles >= 1) expect(meetsGap(order, 1)).toBe(true); // never adjacent when avoidable
        expect(order.map((i) => i.id).sort()).toEqual(items.map((i) => i.id).sort());
      }),
      { numRuns: 500 },
    );
  });

  it('gives the same order for the same seed', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 32 - 1 }), (seed) => {
        const a = orderBlock(block(5, 2), { random: createRandom({ seed }), minGap: 2 }).order;
        const b = orderBlock(block(5, 2), { random: createRandom({ seed }), minGap: 2 }).order;
        expect(a).toEqual(b);
      }),
      { numRuns: 100 },
    );
  });
});
