import { reversalZone, reversibleShare, type ModelSpec, type RatePoints } from '@/lib/design';
import type { PriorValues } from '@/lib/shared/validations/planner';
import { priorDraws } from './points';

export type PriorView = {
  draws: RatePoints;
  /** 1 where the draw's rates give a non-empty reversal zone */
  canReverse: Uint8Array;
  /** the largest large-reward rate (per day) that still allows a reversal, for each small-reward rate on a log grid */
  boundary: { kSmall: number[]; kLarge: number[] };
  /** share of the prior that can reverse (quadrature, not the draws) */
  share: number;
  /** densities of ln k for both rates, on a common log grid (per unit of ln k) */
  densities: { k: number[]; small: number[]; large: number[] };
  /** axis range covering the draws, per day */
  range: [number, number];
};

/**
 * The picture of a prior under a model, ratio and soon delay: the draws, which of them can
 * reverse, the line where reversals become possible, the share of the prior that can
 * reverse and the densities of both rates. For fixed k the zone is non-empty exactly when
 * K is below a threshold (reversibleShare's derivation), found here by bisection in ln K on
 * whether reversalZone is empty.
 */
export function priorView(prior: PriorValues, setting: { model: ModelSpec; ratio: number; soonDelay: number }, draws: RatePoints = priorDraws(prior)): PriorView {
  const { model, ratio, soonDelay } = setting;
  const n = draws.kSmall.length;
  const canReverse = new Uint8Array(n);
  let lo = Infinity;
  let hi = 0;
  for (let i = 0; i < n; i++) {
    const k = draws.kSmall[i];
    const K = draws.kLarge[i];
    lo = Math.min(lo, k, K);
    hi = Math.max(hi, k, K);
    if (soonDelay > 0 && reversalZone({ model, ratio, soonDelay, kSmall: k, kLarge: K })) canReverse[i] = 1;
  }
  const range: [number, number] = [lo / 1.5, hi * 1.5];
  return { draws, canReverse, boundary: boundaryLine(setting, range), share: reversibleShare(prior, { model, ratio, soonDelay }), densities: densities(prior, range), range };
}

function boundaryLine({ model, ratio, soonDelay }: { model: ModelSpec; ratio: number; soonDelay: number }, [lo, hi]: [number, number], steps = 48) {
  const kSmall: number[] = [];
  const kLarge: number[] = [];
  if (!(soonDelay > 0)) return { kSmall, kLarge };
  const a = Math.log(lo);
  const b = Math.log(hi);
  const opens = (k: number, lnK: number) => reversalZone({ model, ratio, soonDelay, kSmall: k, kLarge: Math.exp(lnK) }) !== null;
  for (let i = 0; i <= steps; i++) {
    const k = Math.exp(a + ((b - a) * i) / steps);
    let low = Math.log(k) - 40;
    let high = Math.log(k) + 40;
    if (!opens(k, low)) continue; // no K small enough: this k never reverses
    if (opens(k, high)) continue;
    for (let j = 0; j < 60; j++) {
      const mid = (low + high) / 2;
      if (opens(k, mid)) low = mid;
      else high = mid;
    }
    kSmall.push(k);
    kLarge.push(Math.exp(low));
  }
  return { kSmall, kLarge };
}

function densities(prior: PriorValues, [lo, hi]: [number, number], steps = 120) {
  const k: number[] = [];
  const small: number[] = [];
  const large: number[] = [];
  const a = Math.log(lo);
  const b = Math.log(hi);
  const pdf = (x: number, mu: number, sd: number) => (sd > 0 ? Math.exp(-0.5 * ((x - mu) / sd) ** 2) / (sd * Math.sqrt(2 * Math.PI)) : 0);
  for (let i = 0; i <= steps; i++) {
    const x = a + ((b - a) * i) / steps;
    k.push(Math.exp(x));
    small.push(pdf(x, Math.log(prior.medianSmall), prior.sdLogSmall));
    large.push(pdf(x, Math.log(prior.medianLarge), prior.sdLogLarge));
  }
  return { k, small, large };
}
