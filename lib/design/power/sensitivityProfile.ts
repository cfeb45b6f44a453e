import { logChoiceProbability } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import type { ModelId } from '../types';
import type { MagnitudeItems } from './fastRateEstimate';

const S_COUNT = 17;
const S_LOW = 0.3;
const S_HIGH = 1.3;
/**
 * The delay sensitivities the simulation's stage-1 profile is tabulated at: 17 log-spaced values
 * from 0.3 to 1.3 (the search range of the simulated stage 1: a design choice of ours that keeps a
 * noisy s from sending probes decades out).
 */
export const PROFILE_SENSITIVITIES: Float64Array = Float64Array.from({ length: S_COUNT }, (_, g) => S_LOW * Math.pow(S_HIGH / S_LOW, g / (S_COUNT - 1)));
const H = Math.log(S_HIGH / S_LOW) / (S_COUNT - 1); // grid step in ln s
const K_COUNT = 49;
const LOG_K_MIN = Math.log(1e-6);
const LOG_K_MAX = Math.log(10);
const K_STEP = (LOG_K_MAX - LOG_K_MIN) / (K_COUNT - 1); // 0.34 in ln k

/**
 * One magnitude's profile likelihood over delay sensitivity s, for the power simulation's stage 1
 * with s estimated. The log-likelihood of every item's two answers is tabulated once on a grid of
 * 17 values of s by 49 of ln k ([ln 1e-6, ln 10], the estimators' range); for a response vector,
 * at each s the best ln k cell is refined by the vertex of the parabola through it and its
 * neighbours, which gives ln k̂(s) and the profile log-likelihood ℓ(s). The joint estimate of
 * (k, K, s) maximises the sum of the two magnitudes' profiles (jointSensitivityEstimate); a unit
 * test holds it against fitModel's Newton fit of the same choices.
 */
export class SensitivityProfile {
  private readonly n: number;
  private readonly table: Float64Array; // [s][k][item][later? 1 : 0]

  constructor(model: ModelId, items: MagnitudeItems, gamma: number, lapse: number) {
    this.n = items.length;
    this.table = new Float64Array(S_COUNT * K_COUNT * this.n * 2);
    for (let g = 0; g < S_COUNT; g++) {
      const s = PROFILE_SENSITIVITIES[g];
      for (let c = 0; c < K_COUNT; c++) {
        const k = Math.exp(LOG_K_MIN + c * K_STEP);
        for (let i = 0; i < this.n; i++) {
          const item = items[i];
          const gap = discountAt(model, k, s, 1, item.laterDelay) - item.soonerAmount / item.laterAmount;
          const at = ((g * K_COUNT + c) * this.n + i) * 2;
          this.table[at] = logChoiceProbability(gamma, lapse, gap, false);
          this.table[at + 1] = logChoiceProbability(gamma, lapse, gap, true);
        }
      }
    }
  }

  /** ln k̂ at each grid s, then the profile log-likelihood there: [ln k̂_0 … ln k̂_16, ℓ_0 … ℓ_16]. */
  profile(bits: ArrayLike<number>): Float64Array {
    const n = this.n;
    const out = new Float64Array(2 * S_COUNT);
    const row = new Float64Array(K_COUNT);
    for (let g = 0; g < S_COUNT; g++) {
      let best = 0;
      for (let c = 0; c < K_COUNT; c++) {
        let sum = 0;
        const base = (g * K_COUNT + c) * n * 2;
        for (let i = 0; i < n; i++) sum += this.table[base + i * 2 + (bits[i] ? 1 : 0)];
        row[c] = sum;
        if (sum > row[best]) best = c;
      }
      const vertex = parabola(row, best);
      out[g] = LOG_K_MIN + (best + vertex.offset) * K_STEP;
      out[S_COUNT + g] = vertex.value;
    }
    return out;
  }
}

/** Vertex of the parabola through values[at − 1 … at + 1] (offset in steps, at most ½), or the point itself at an end or where it is not concave. */
function parabola(values: ArrayLike<number>, at: number): { offset: number; value: number } {
  if (at === 0 || at === values.length - 1) return { offset: 0, value: values[at] };
  const lo = values[at - 1];
  const mid = values[at];
  const hi = values[at + 1];
  const curvature = lo - 2 * mid + hi;
  if (!(curvature < 0)) return { offset: 0, value: mid };
  const offset = Math.max(-0.5, Math.min(0.5, (0.5 * (lo - hi)) / curvature));
  return { offset, value: mid - 0.25 * (lo - hi) * offset };
}

/**
 * The joint estimate from two magnitudes' profiles: the grid s with the largest summed profile
 * log-likelihood, refined by the vertex of the parabola through it and its neighbours (in ln s),
 * with ln k and ln K interpolated linearly to the refined s.
 */
export function jointSensitivityEstimate(small: Float64Array, large: Float64Array): { kSmall: number; kLarge: number; sensitivity: number } {
  const total = new Float64Array(S_COUNT);
  let best = 0;
  for (let g = 0; g < S_COUNT; g++) {
    total[g] = small[S_COUNT + g] + large[S_COUNT + g];
    if (total[g] > total[best]) best = g;
  }
  const { offset } = parabola(total, best);
  const other = offset >= 0 ? Math.min(S_COUNT - 1, best + 1) : Math.max(0, best - 1);
  const w = Math.abs(offset);
  const at = (p: Float64Array) => Math.exp((1 - w) * p[best] + w * p[other]);
  return { kSmall: at(small), kLarge: at(large), sensitivity: Math.exp(Math.log(PROFILE_SENSITIVITIES[best]) + offset * H) };
}
