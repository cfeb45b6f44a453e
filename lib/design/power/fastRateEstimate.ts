import { logChoiceProbability } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { zeroin } from '../findRoot';
import { indifferenceRate } from '../indifferenceRate';
import type { ModelId, ModelSpec } from '../types';

const LOG_K_MIN = Math.log(1e-6);
const LOG_K_MAX = Math.log(10);
const GRID = 24;
const STEP = (LOG_K_MAX - LOG_K_MIN) / (GRID - 1);

/** One magnitude's calibration items: sooner amount today vs later amount after laterDelay days. */
export type MagnitudeItems = ReadonlyArray<{ soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number }>;

export type FastEstimate = { rate: number; flags: Array<'all-sooner' | 'all-later' | 'boundary' | 'non-monotone'> };

/**
 * The same maximum-likelihood estimate of one magnitude's rate as estimateRates (same model,
 * likelihood, bounds [1e-6, 10], 24-point grid in ln k, the best cell and its neighbours, flags
 * and consistency rule), computed for many response vectors of one fixed item set: the
 * log-likelihood of every item at every grid point is tabulated once, and the maximum inside
 * the best cells is located as the root of the analytic score (Brent–Dekker, 1e-10 in ln k)
 * instead of by function values. The simulation needs this speed; a unit test checks it
 * against estimateRates.
 *
 * @throws DesignInputError for items with a sooner delay (the calibration block asks "today or later")
 */
export class FastRateEstimator {
  private readonly n: number;
  private readonly share: Float64Array;
  private readonly delay: Float64Array;
  private readonly table: Float64Array; // [grid][item][later? 1 : 0]
  private readonly scoreTable: Float64Array; // score terms, laid out as table
  private readonly gridValues = new Float64Array(GRID); // log-likelihood of the current answers per grid point
  private readonly order: Int32Array; // items by ascending tie rate
  private readonly later: Uint8Array;
  /** score as a function value for the root finder, made once (not per fit) */
  private readonly scoreAt = (lnK: number): number => this.score(lnK);

  constructor(
    private readonly model: ModelSpec,
    items: MagnitudeItems,
    private readonly gamma: number,
    private readonly lapse: number,
  ) {
    this.n = items.length;
    items.forEach((item, i) => {
      if (item.soonerDelay !== 0) throw new DesignInputError(`items[${i}].soonerDelay`, '0 (calibration items offer the sooner amount today)', item.soonerDelay);
    });
    this.share = Float64Array.from(items, (item) => item.soonerAmount / item.laterAmount);
    this.delay = Float64Array.from(items, (item) => item.laterDelay);
    this.later = new Uint8Array(this.n);
    this.table = new Float64Array(GRID * this.n * 2);
    for (let g = 0; g < GRID; g++) {
      const k = Math.exp(LOG_K_MIN + g * STEP);
      for (let i = 0; i < this.n; i++) {
        const gap = this.gap(k, i);
        this.table[(g * this.n + i) * 2] = logChoiceProbability(gamma, lapse, gap, false);
        this.table[(g * this.n + i) * 2 + 1] = logChoiceProbability(gamma, lapse, gap, true);
      }
    }
    // the score's terms at the grid points too: every fit starts from two of them
    this.scoreTable = new Float64Array(GRID * this.n * 2);
    for (let g = 0; g < GRID; g++) {
      const k = Math.exp(LOG_K_MIN + g * STEP);
      for (let i = 0; i < this.n; i++) {
        this.scoreTable[(g * this.n + i) * 2] = this.scoreTerm(k, i, 0);
        this.scoreTable[(g * this.n + i) * 2 + 1] = this.scoreTerm(k, i, 1);
      }
    }
    const ties = items.map((item) => indifferenceRate(model, item));
    this.order = Int32Array.from(ties.map((_, i) => i).sort((a, b) => ties[a] - ties[b]));
  }

  private gap(k: number, i: number): number {
    const m = this.model;
    return discountAt(m.id, k, m.sensitivity ?? 1, m.presentBias ?? 1, this.delay[i]) - this.share[i];
  }

  private score(lnK: number): number {
    const k = Math.exp(lnK);
    let sum = 0;
    for (let i = 0; i < this.n; i++) sum += this.scoreTerm(k, i, this.later[i]);
    return sum;
  }

  /** Item i's term of the score at rate k for an answer LL (later 1) or SS (0). */
  private scoreTerm(k: number, i: number, later: number): number {
    const g = this.gamma;
    const e = this.lapse;
    const m = this.model;
    const s = m.sensitivity ?? 1;
    const D = this.delay[i];
    // the gap and its slope share the discount factor: computed once here
    const f = discountAt(m.id, k, s, m.presentBias ?? 1, D);
    const z = g * (f - this.share[i]);
    let p: number;
    if (z >= 0) p = 1 / (1 + Math.exp(-z));
    else {
      const ez = Math.exp(z);
      p = ez / (1 + ez);
    }
    const density = (1 - e) * g * p * (1 - p);
    const w = later === 1 ? density / (0.5 * e + (1 - e) * p) : -density / (0.5 * e + (1 - e) * (1 - p));
    return w * slopeAt(m.id, k, s, D, f);
  }

  /** The score at grid point g from the tabulated terms: the same sum, in the same order, as score(). */
  private gridScore(g: number): number {
    const base = g * this.n * 2;
    let sum = 0;
    for (let i = 0; i < this.n; i++) sum += this.scoreTable[base + i * 2 + this.later[i]];
    return sum;
  }

  /** Estimate from one response vector: bit i (most significant first) 1 when item i was answered LL. */
  estimate(bits: ArrayLike<number>): FastEstimate {
    const n = this.n;
    let laterCount = 0;
    for (let i = 0; i < n; i++) {
      this.later[i] = bits[i] ? 1 : 0;
      laterCount += this.later[i];
    }
    const flags: FastEstimate['flags'] = [];
    let lnK: number;
    if (laterCount === 0 || laterCount === n) {
      flags.push(laterCount === 0 ? 'all-sooner' : 'all-later');
      lnK = laterCount === 0 ? LOG_K_MAX : LOG_K_MIN;
    } else {
      lnK = this.fit();
      if (lnK - LOG_K_MIN < 1e-6 || LOG_K_MAX - lnK < 1e-6) flags.push('boundary');
    }
    if (this.consistency() < 0.75) flags.push('non-monotone');
    return { rate: Math.exp(lnK), flags };
  }

  private fit(): number {
    let best = 0;
    let bestValue = -Infinity;
    for (let g = 0; g < GRID; g++) {
      let v = 0;
      const base = g * this.n * 2;
      for (let i = 0; i < this.n; i++) v += this.table[base + i * 2 + this.later[i]];
      this.gridValues[g] = v;
      if (v > bestValue) {
        bestValue = v;
        best = g;
      }
    }
    // the ends of the best cells are grid points, where score and log-likelihood are tabulated
    // (the same k = exp(LOG_K_MIN + g·STEP), the same terms summed in the same order)
    const gLow = Math.max(0, best - 1);
    const gHigh = Math.min(GRID - 1, best + 1);
    const lower = LOG_K_MIN + gLow * STEP;
    const upper = LOG_K_MIN + gHigh * STEP;
    const sLow = this.gridScore(gLow);
    const sHigh = this.gridScore(gHigh);
    if (sLow > 0 && sHigh < 0) {
      // the score changes sign inside the cells: its root is the interior maximum
      const root = zeroin(this.scoreAt, lower, upper, sLow, sHigh, 1e-10, 100);
      if (!Number.isNaN(root)) return root;
    }
    // no sign change: the likelihood is largest at an end of the cells (as estimateRates compares them)
    return this.gridValues[gHigh] > this.gridValues[gLow] ? upper : lower;
  }

  private consistency(): number {
    const n = this.n;
    let agree = 0;
    for (let j = 0; j < n; j++) agree += this.later[this.order[j]];
    let best = agree;
    for (let c = 1; c <= n; c++) {
      agree += this.later[this.order[c - 1]] === 1 ? -1 : 1;
      if (agree > best) best = agree;
    }
    return best / n;
  }
}

/** d f/d ln k at rate k and delay D > 0, given f = f_k(D): the slope of an item's gap. */
function slopeAt(id: ModelId, k: number, s: number, D: number, f: number): number {
  switch (id) {
    case 'hyperbolic':
      return -k * D * f * f;
    case 'hyperboloid':
      return (-s * k * D * f) / (1 + k * D);
    case 'power-delay':
      return -k * Math.pow(D, s) * f * f;
    case 'exponential-power':
      return -k * Math.pow(D, s) * f;
    default: // exponential, quasi-hyperbolic (D > 0)
      return -k * D * f;
  }
}
