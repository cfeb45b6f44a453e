import type { SeededRandom } from '../random';

/** An entry to order: items sharing a `pairId` are the two views of one question pair. */
export type Orderable = { id: string; pairId: string | null };

/**
 * The largest gap (count of other items) that every pair's two views can be kept apart by in a
 * block of `pairs` pairs and `singles` other items: all first views, then the singles, then the
 * second views in the same pair order leaves P − 1 + C items between each pair's views, and no
 * order does better for the pair whose views are closest.
 */
export function maxFeasibleGap(pairs: number, singles: number): number {
  return pairs === 0 ? Infinity : pairs - 1 + singles;
}

/**
 * A seeded random order of one block in which the two views of each pair are at least `minGap`
 * other items apart (never adjacent when the block allows it). Method: up to 200 uniform
 * shuffles (Fisher–Yates) are tried in turn and the first meeting the constraint is kept, so
 * the order is uniform among valid orders whenever one is found; failing that, a random
 * layout that always meets it is built: shuffled first views, shuffled singles, then the
 * second views in the first views' order. The gap actually required is
 * min(minGap, maxFeasibleGap(...)); it is returned with the order.
 *
 * @example orderBlock([{ id: 'a', pairId: 'p' }, { id: 'b', pairId: 'p' }, { id: 'c', pairId: null }], { random: createRandom({ seed: 1 }), minGap: 1 }).order.indexOf('c') // 1
 */
export function orderBlock<T extends Orderable>(items: readonly T[], options: { random: SeededRandom; minGap: number }): { order: T[]; gap: number } {
  const pairs = new Map<string, number>();
  for (const item of items) if (item.pairId !== null) pairs.set(item.pairId, (pairs.get(item.pairId) ?? 0) + 1);
  const pairCount = [...pairs.values()].filter((n) => n === 2).length;
  const singles = items.length - 2 * pairCount;
  const gap = Math.max(0, Math.min(options.minGap, maxFeasibleGap(pairCount, singles)));
  for (let attempt = 0; attempt < 200; attempt++) {
    const order = shuffle(items, options.random);
    if (meetsGap(order, gap)) return { order, gap };
  }
  return { order: constructive(items, options.random), gap };
}

/** True when the two views of every pair in `order` have at least `gap` other items between them. */
export function meetsGap(order: readonly Orderable[], gap: number): boolean {
  const seen = new Map<string, number>();
  for (let i = 0; i < order.length; i++) {
    const pair = order[i].pairId;
    if (pair === null) continue;
    const first = seen.get(pair);
    if (first === undefined) seen.set(pair, i);
    else if (i - first - 1 < gap) return false;
  }
  return true;
}

/** Fisher–Yates shuffle (Knuth 1969, TAOCP vol. 2, Algorithm P) on a copy. */
export function shuffle<T>(items: readonly T[], random: SeededRandom): T[] {
  const out = items.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random.uniform() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

function constructive<T extends Orderable>(items: readonly T[], random: SeededRandom): T[] {
  const byPair = new Map<string, T[]>();
  const singles: T[] = [];
  for (const item of items) {
    if (item.pairId === null) singles.push(item);
    else byPair.set(item.pairId, [...(byPair.get(item.pairId) ?? []), item]);
  }
  const groups = shuffle([...byPair.values()], random).map((views) => (random.uniform() < 0.5 ? views : views.slice().reverse()));
  const whole = groups.filter((g) => g.length === 2);
  const loose = groups.filter((g) => g.length !== 2).flat();
  return [...whole.map((g) => g[0]), ...shuffle([...singles, ...loose], random), ...whole.map((g) => g[1])];
}
