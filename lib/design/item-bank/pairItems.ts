import { predictPattern } from '../predictPattern';
import type { ChoicePattern } from '../types';
import type { PairDelays } from './pairDelays';
import { roundDelay, roundTo } from './rounding';
import type { BankDesign, DelayUnit, ItemRole, ItemSet, RatePair } from './types';

/** An item before it gets a side, a position and its text. */
export type DraftItem = {
  id: string;
  block: 'calibration' | 'probe';
  role: ItemRole;
  set: ItemSet;
  view: 'far' | 'near' | null;
  pairId: string | null;
  magnitude: 'small' | 'large' | null;
  soonerAmount: number;
  soonerDelay: number;
  laterAmount: number;
  laterDelay: number;
};

/** How rounding changed one pair, and whether the pattern it is meant to show survived. */
export type PairRoundingEntry = {
  pairId: string;
  role: ItemRole;
  expected: ChoicePattern;
  exact: { ratio: number; soonDelay: number; lateDelay: number; pattern: ChoicePattern };
  rounded: { ratio: number; soonDelay: number; lateDelay: number; pattern: ChoicePattern };
  /** true when the rounded pair no longer shows the pattern the exact pair shows */
  changed: boolean;
};

const EXPECTED: Partial<Record<ItemRole, ChoicePattern>> = { 'reversal-probe': 'LS', 'late-anchor': 'LL', 'soon-anchor': 'SS' };

/**
 * The far and near views of every probe and anchor pair, amounts rounded to `amountUnit` and
 * delays to whole `delayUnit`s, plus an attention check whose sooner option dominates (the
 * large amount sooner vs the small amount later). The rounding entry of each pair predicts its
 * pattern (predictPattern, noiseless) at `rates` with the exact and with the rounded numbers;
 * the rounded ratio is S/L after rounding.
 */
export function pairItems(
  design: BankDesign,
  delays: PairDelays,
  rates: RatePair,
  options: { set: ItemSet; amountUnit: number; delayUnit: DelayUnit },
): { items: DraftItem[]; rounding: PairRoundingEntry[] } {
  const { spec } = design;
  const L = roundTo(spec.largeAmount, options.amountUnit);
  const S = roundTo(spec.ratio * spec.largeAmount, options.amountUnit);
  const d = delays.soonDelay;
  const dr = roundDelay(d, options.delayUnit);
  const pairs: Array<{ pairId: string; role: ItemRole; D: number }> = [
    ...delays.probes.map((D, i) => ({ pairId: `probe-${i + 1}`, role: 'reversal-probe' as const, D })),
    ...delays.lateAnchors.map((D, i) => ({ pairId: `late-${i + 1}`, role: 'late-anchor' as const, D })),
    ...delays.soonAnchors.map((D, i) => ({ pairId: `soon-${i + 1}`, role: 'soon-anchor' as const, D })),
  ];
  const items: DraftItem[] = [];
  const rounding: PairRoundingEntry[] = [];
  for (const { pairId, role, D } of pairs) {
    const Dr = Math.max(roundDelay(D, options.delayUnit), dr + roundDelay(1, options.delayUnit));
    // Whole literals rather than `{ ...base, id, ... }`: in Node 20's V8, adding fields to a
    // spread copy costs microseconds per field, and the probe API builds these per request.
    const { set } = options;
    items.push({ block: 'probe', role, set, pairId, magnitude: null, soonerAmount: S, laterAmount: L, id: `${pairId}-far`, view: 'far', soonerDelay: dr, laterDelay: Dr });
    items.push({ block: 'probe', role, set, pairId, magnitude: null, soonerAmount: S, laterAmount: L, id: `${pairId}-near`, view: 'near', soonerDelay: 0, laterDelay: Dr - dr });
    const { model } = spec;
    const { kSmall, kLarge } = rates;
    const exactPattern = predictPattern({ model, kSmall, kLarge, ratio: spec.ratio, soonDelay: d, lateDelay: D });
    const roundedPattern = predictPattern({ model, kSmall, kLarge, ratio: S / L, soonDelay: dr, lateDelay: Dr });
    rounding.push({
      pairId,
      role,
      expected: EXPECTED[role]!,
      exact: { ratio: spec.ratio, soonDelay: d, lateDelay: D, pattern: exactPattern },
      rounded: { ratio: S / L, soonDelay: dr, lateDelay: Dr, pattern: roundedPattern },
      changed: exactPattern !== roundedPattern,
    });
  }
  const mainLate = items.find((i) => i.id === 'probe-1-far')?.laterDelay ?? dr + 1;
  items.push({
    id: 'check-probe',
    block: 'probe',
    role: 'attention-check',
    set: options.set,
    view: null,
    pairId: null,
    magnitude: null,
    soonerAmount: L,
    soonerDelay: dr,
    laterAmount: S,
    laterDelay: mainLate,
  });
  return { items, rounding };
}
