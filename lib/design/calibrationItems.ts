import { discountAt } from './discountFactor';
import { DesignInputError } from './DesignInputError';
import { indifferenceRate } from './indifferenceRate';
import { checkInteger, checkModel, checkPositive } from './validate';
import type { ModelSpec } from './types';

export type Magnitude = 'small' | 'large';

/** One calibration question: sooner amount today (or after soonerDelay) vs later amount after laterDelay. */
export type CalibrationItem = {
  magnitude: Magnitude;
  soonerAmount: number;
  /** days; 0 = today */
  soonerDelay: number;
  laterAmount: number;
  /** days */
  laterDelay: number;
  /** the discount rate at which this item is an exact tie (after rounding of the amounts) */
  targetRate: number;
};

export type CalibrationOptions = {
  model: ModelSpec;
  /** items per magnitude, 2 to 200; default 10 */
  countPerMagnitude?: number;
  /** later delays span [min, max] days, log-spaced; default 1 to 365 */
  delayRange?: { min: number; max: number };
  /** target rates span [min, max] per day, log-spaced; default 1e-4 to 1 */
  rateRange?: { min: number; max: number };
  /** the later amounts for the small and the large magnitude; default 20 and 200 */
  amounts?: { small: number; large: number };
  /** sooner amounts are rounded to a multiple of this; default 0.01 of a currency unit; 0 = no rounding */
  roundTo?: number;
  /** round later delays to whole days (at least 1); default true */
  wholeDays?: boolean;
  /**
   * 'descending' (default): later delays descend over the log-spaced delay grid as rates ascend;
   * a number m (2 to 10): m log-spaced delay levels from delayRange.max down to delayRange.min,
   * item i at level i mod m, so each level asks across the whole rate range (needed to tell the
   * delay sensitivity s from the rate k: docs/mathematics.md, "Calibration that spans the probes")
   */
  delayLevels?: 'descending' | number;
};

/**
 * Calibration block: for each magnitude, items whose indifference rates span a log-spaced grid
 * over rateRange. Rule of ours: rates ascend while later delays descend over the log-spaced
 * delay grid, which keeps k·D (and so the sooner amount) well inside (0, L) rather than
 * piling items at amounts near 0 or near L. The sooner amount is L·f(D; k_target), rounded
 * to `roundTo` and kept strictly between 0 and L. With `delayLevels` m, the delays instead cycle
 * through m log-spaced levels (item i at level i mod m): within one level the choices switch at
 * the person's tie rate at that delay, and the switch points of different levels place s.
 * Later delays are rounded to whole days
 * unless wholeDays is false; `targetRate` is then recomputed from the
 * rounded amounts (indifferenceRate), so it is the item's exact tie rate.
 *
 * @returns items for 'small' then 'large', each sorted by ascending targetRate
 * @throws DesignInputError for a bad model, count, ranges (need 0 < min ≤ max, finite), amounts or roundTo
 * @example calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 2 }).length // 4
 */
export function calibrationItems(options: CalibrationOptions): CalibrationItem[] {
  const { model } = options;
  checkModel(model);
  const n = options.countPerMagnitude ?? 10;
  checkInteger('countPerMagnitude', n, 2, 200);
  const delays = options.delayRange ?? { min: 1, max: 365 };
  const rates = options.rateRange ?? { min: 1e-4, max: 1 };
  checkRange('delayRange', delays);
  checkRange('rateRange', rates);
  const amounts = options.amounts ?? { small: 20, large: 200 };
  checkPositive('amounts.small', amounts?.small);
  checkPositive('amounts.large', amounts?.large);
  const roundTo = options.roundTo ?? 0.01;
  if (!(roundTo >= 0 && roundTo < Infinity)) throw new DesignInputError('roundTo', 'a finite number, 0 or more', roundTo);
  const levels = options.delayLevels ?? 'descending';
  if (levels !== 'descending') checkInteger('delayLevels', levels, 2, 10);
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const items: CalibrationItem[] = [];
  for (const magnitude of ['small', 'large'] as const) {
    const L = amounts[magnitude];
    if (roundTo > 0 && !(2 * roundTo < L)) throw new DesignInputError('roundTo', `less than half the ${magnitude} amount (${L})`, roundTo);
    for (let i = 0; i < n; i++) {
      const u = i / (n - 1);
      let k = rates.min * Math.pow(rates.max / rates.min, u);
      const w = levels === 'descending' ? u : (i % levels) / (levels - 1);
      const exactDelay = delays.max * Math.pow(delays.min / delays.max, w);
      const D = options.wholeDays === false ? exactDelay : Math.max(1, Math.round(exactDelay));
      if (levels !== 'descending') k = levelRate(model, D, rates, Math.floor(i / levels), Math.ceil((n - (i % levels)) / levels));
      let S = L * discountAt(model.id, k, s, beta, D);
      if (roundTo > 0) S = Math.round(S / roundTo) * roundTo;
      const floor = roundTo > 0 ? roundTo : L * 1e-9;
      S = Math.min(Math.max(S, floor), L - floor);
      if (roundTo > 0) S = Number(S.toFixed(12)); // drop binary noise from the multiple of roundTo
      const item = { soonerAmount: S, soonerDelay: 0, laterAmount: L, laterDelay: D };
      items.push({ magnitude, ...item, targetRate: indifferenceRate(model, item) });
    }
  }
  return items;
}

/**
 * Target rate of the j-th of `count` items at one delay level D: log-spaced over the part of the
 * rate range whose items offer between 5 % and 95 % of the later amount today (rule of ours:
 * outside it nearly everybody in the range answers the same, so the item tells little), or over
 * the whole range when that part is empty.
 */
function levelRate(model: ModelSpec, D: number, rates: { min: number; max: number }, j: number, count: number): number {
  const tie = (share: number) => indifferenceRate(model, { soonerAmount: share, soonerDelay: 0, laterAmount: 1, laterDelay: D });
  const lo = tie(0.95);
  const hi = tie(0.05);
  return count <= 1 ? Math.sqrt(lo * hi) : lo * Math.pow(hi / lo, j / (count - 1));
}

function checkRange(field: string, range: { min: number; max: number }): void {
  if (range === null || typeof range !== 'object') throw new DesignInputError(field, 'an object { min, max }', range);
  if (!(range.min > 0 && range.min < Infinity)) throw new DesignInputError(`${field}.min`, 'a finite number greater than 0', range.min);
  if (!(range.max >= range.min && range.max < Infinity)) throw new DesignInputError(`${field}.max`, `a finite number, at least min (${range.min})`, range.max);
}
