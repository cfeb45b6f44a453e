import { DesignInputError } from '../DesignInputError';
import type { Alternative } from './binomialTest';

/**
 * The exact null distribution of T = Σ ±vᵢ, each sign + or − with probability 1/2
 * independently, built one participant at a time: adding a participant with |score| v turns
 * P(T = t) into ½·P(T = t − v) + ½·P(T = t + v). Scores are whole numbers (a count of LS minus
 * a count of SL), so the support is the integers from −Σv to Σv and the distribution is exact
 * up to floating-point rounding (each step only halves and adds). Cost per participant is
 * proportional to Σv so far, which lets the simulation read p-values at every sample size of a
 * replicate from one pass over its participants.
 */
export class SignFlipDistribution {
  private current: Float64Array;
  private spare: Float64Array;
  private readonly offset: number;
  private range = 0;
  private total = 0;

  /** @param maxRange the largest Σ|score| that will be added (sizes the buffers) */
  constructor(maxRange: number) {
    if (!(Number.isSafeInteger(maxRange) && maxRange >= 0)) throw new DesignInputError('maxRange', 'a whole number, 0 or more', maxRange);
    this.current = new Float64Array(2 * maxRange + 1);
    this.spare = new Float64Array(2 * maxRange + 1);
    this.current[maxRange] = 1;
    this.offset = maxRange;
  }

  /** Back to no participants (the buffers are kept). */
  reset(): void {
    this.current.fill(0, this.offset - this.range, this.offset + this.range + 1);
    this.current[this.offset] = 1;
    this.range = 0;
    this.total = 0;
  }

  /** Adds one participant's score (a whole number) to the statistic and to the null distribution. */
  add(score: number): void {
    const v = Math.abs(score);
    this.total += score;
    if (v === 0) return;
    if (this.range + v > this.offset) throw new DesignInputError('score', `scores whose absolute values sum to at most ${this.offset}`, score);
    const o = this.offset;
    const from = o - this.range - v;
    const to = o + this.range + v;
    const next = this.spare;
    const prev = this.current;
    for (let t = from; t <= to; t++) {
      const a = t - v >= o - this.range && t - v <= o + this.range ? prev[t - v] : 0;
      const b = t + v >= o - this.range && t + v <= o + this.range ? prev[t + v] : 0;
      next[t] = 0.5 * (a + b);
    }
    // reads stay inside the current support, so the spare buffer needs no clearing
    this.spare = prev;
    this.current = next;
    this.range += v;
  }

  /** The observed statistic Σ scores so far. */
  get statistic(): number {
    return this.total;
  }

  /** The exact sign-flip p-value of the scores added so far ('greater': more positive scores than chance). */
  pValue(alternative: Alternative): number {
    const o = this.offset;
    const t = this.total;
    let upper = 0;
    for (let u = Math.max(t, -this.range); u <= this.range; u++) upper += this.current[o + u];
    let lower = 0;
    for (let u = -this.range; u <= Math.min(t, this.range); u++) lower += this.current[o + u];
    upper = Math.min(1, upper);
    lower = Math.min(1, lower);
    if (alternative === 'greater') return upper;
    if (alternative === 'less') return lower;
    if (alternative === 'two-sided') return Math.min(1, 2 * Math.min(upper, lower));
    throw new DesignInputError('alternative', "'two-sided', 'greater' or 'less'", alternative);
  }
}

/**
 * Exact sign-flip permutation test at the participant level (Fisher 1935, The Design of
 * Experiments, §21; Pitman 1937, J R Stat Soc Suppl 4:119–130): each participant contributes
 * one whole-number score, here the count of LS minus the count of SL patterns among their
 * probe pairs. Under the null hypothesis each participant's score is symmetric about 0, so
 * flipping the sign of any subset of scores is equally likely; the p-value is the share of
 * the 2ⁿ sign patterns whose sum Σ scores is at least as extreme as the observed one
 * ('greater': at least as large; 'two-sided': twice the smaller tail, capped at 1). The
 * participant, not the pair, is the unit, so several correlated probes per person do not
 * inflate the type I error as a pooled McNemar test does. Participants with score 0 change
 * nothing. With one probe pair per participant every score is −1, 0 or 1 and the test is the
 * sign test.
 *
 * @param options.scores one whole number per participant (LS − SL among their probe pairs)
 * @param options.alternative 'greater' (more LS than SL), 'less' or 'two-sided'
 * @throws DesignInputError for scores that are not whole numbers, or an unknown alternative
 * @example signFlipTest({ scores: [2, 1, 3, -1], alternative: 'greater' }).pValue // 3/16 = 0.1875
 */
export function signFlipTest(options: { scores: readonly number[]; alternative: Alternative }): { statistic: number; pValue: number } {
  const { scores, alternative } = options;
  if (!Array.isArray(scores)) throw new DesignInputError('scores', 'a list of whole numbers, one per participant', scores);
  let range = 0;
  scores.forEach((v, i) => {
    if (!Number.isSafeInteger(v)) throw new DesignInputError(`scores[${i}]`, 'a whole number', v);
    range += Math.abs(v);
  });
  if (!Number.isSafeInteger(range) || range > 50_000_000) throw new DesignInputError('scores', 'absolute values summing to at most 50,000,000', range);
  const distribution = new SignFlipDistribution(range);
  for (const v of scores) distribution.add(v);
  return { statistic: distribution.statistic, pValue: distribution.pValue(alternative) };
}
