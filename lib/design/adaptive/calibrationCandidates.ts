import type { Magnitude } from '../calibrationItems';
import { DesignInputError } from '../DesignInputError';
import { checkInteger, checkPositive } from '../validate';

/** One item adaptive calibration may ask: a sooner amount today against a later amount after laterDelay days. */
export type AdaptiveCandidate = {
  /** stable id within the candidate set, e.g. `acal-small-03-12` (delay node 3, amount node 12) */
  id: string;
  magnitude: Magnitude;
  soonerAmount: number;
  /** always 0: the sooner reward is today, as in the fixed calibration block */
  soonerDelay: 0;
  laterAmount: number;
  /** whole days, at least 1 */
  laterDelay: number;
};

export type CandidateOptions = {
  /** later amount of small-magnitude items (x·L) */
  smallAmount: number;
  /** later amount of large-magnitude items (L) */
  largeAmount: number;
  /** shortest and longest later delay, days (the design's calibration range) */
  minDelay: number;
  maxDelay: number;
  /** log-spaced later delays, 2 to 100; default 16 */
  delayCount?: number;
  /** sooner amounts as shares (j + ½)/count of the later amount, 2 to 200; default 20 */
  shareCount?: number;
  /** amounts are rounded to a multiple of this (the bank's amount unit); 0 = no rounding; default 0 */
  amountUnit?: number;
};

/**
 * The candidate set of adaptive calibration: for each magnitude, every combination of a later
 * delay (log-spaced over [minDelay, maxDelay], rounded to whole days) and a sooner amount (the
 * shares ½/n, 3/(2n), … of the later amount, rounded to `amountUnit` and kept strictly between 0
 * and the later amount), duplicates after rounding dropped. The defaults give 2 × 16 × 20 = 640
 * candidates when no two delays round to the same day (600 over 1 to 365 days, where
 * the shortest delays share whole days).
 *
 * @throws DesignInputError naming the field for non-positive amounts, a bad delay range or counts
 * @example calibrationCandidates({ smallAmount: 40, largeAmount: 100, minDelay: 7, maxDelay: 365 }).length // 640
 */
export function calibrationCandidates(options: CandidateOptions): AdaptiveCandidate[] {
  checkPositive('smallAmount', options.smallAmount);
  checkPositive('largeAmount', options.largeAmount);
  if (!(options.minDelay >= 1 && options.minDelay < Infinity)) throw new DesignInputError('minDelay', 'a finite number of days, at least 1', options.minDelay);
  if (!(options.maxDelay >= options.minDelay && options.maxDelay < Infinity)) throw new DesignInputError('maxDelay', `a finite number of days, at least minDelay (${options.minDelay})`, options.maxDelay);
  const delayCount = options.delayCount ?? 16;
  checkInteger('delayCount', delayCount, 2, 100);
  const shareCount = options.shareCount ?? 20;
  checkInteger('shareCount', shareCount, 2, 200);
  const unit = options.amountUnit ?? 0;
  if (!(unit >= 0 && unit < Infinity)) throw new DesignInputError('amountUnit', 'a finite number, 0 or more', unit);

  const delays: number[] = [];
  for (let i = 0; i < delayCount; i++) {
    const D = Math.max(1, Math.round(options.minDelay * Math.pow(options.maxDelay / options.minDelay, i / (delayCount - 1))));
    if (!delays.includes(D)) delays.push(D);
  }
  const out: AdaptiveCandidate[] = [];
  for (const magnitude of ['small', 'large'] as const) {
    const later = magnitude === 'small' ? options.smallAmount : options.largeAmount;
    if (unit > 0 && !(2 * unit < later)) throw new DesignInputError('amountUnit', `less than half the ${magnitude} amount (${later})`, unit);
    const floor = unit > 0 ? unit : later * 1e-9;
    const amounts: number[] = [];
    for (let j = 0; j < shareCount; j++) {
      let S = (later * (j + 0.5)) / shareCount;
      if (unit > 0) S = Number((Math.round(S / unit) * unit).toFixed(12));
      S = Math.min(Math.max(S, floor), later - floor);
      if (!amounts.includes(S)) amounts.push(S);
    }
    delays.forEach((laterDelay, i) => {
      amounts.forEach((soonerAmount, j) => {
        out.push({ id: `acal-${magnitude}-${pad(i)}-${pad(j)}`, magnitude, soonerAmount, soonerDelay: 0, laterAmount: later, laterDelay });
      });
    });
  }
  return out;
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}
