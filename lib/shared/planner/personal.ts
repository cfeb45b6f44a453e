import { anchorDelays, optimiseLateDelayBatch, type ModelSpec, type RatePoints } from '@/lib/design';
import { addShares, noShares, patternProbabilities } from './patterns';
import type { PatternShares } from './types';

/** Each point's own pair delays in a personalised design (NaN where a role has no pair). */
export type PersonalDelays = { probe: Float64Array; late: Float64Array; soon: Float64Array; hasZone: Uint8Array };

/**
 * Personal delays for every point of the prior, as a personalised design would set them if the
 * calibration block recovered each participant's rates exactly: the probe at the late delay
 * with the largest gap product, the anchors where anchorDelays puts them. Delays beyond the
 * late-delay limit are cut to the limit. Points without a zone get the `fallback` delays.
 * `probeAt` replaces the gap-product probe delay of points with a zone (a model-discrimination design).
 */
export function personalDelays(
  model: ModelSpec,
  ratio: number,
  soonDelay: number,
  limit: number,
  points: RatePoints,
  fallback: { probe: number; late: number; soon: number },
  probeAt?: (kSmall: number, kLarge: number) => number,
): PersonalDelays {
  const n = points.kSmall.length;
  const out: PersonalDelays = { probe: new Float64Array(n), late: new Float64Array(n), soon: new Float64Array(n), hasZone: new Uint8Array(n) };
  // every point's optimum in one batch solve (NaN where the zone is empty)
  const optimum = optimiseLateDelayBatch(model, { ratio: new Float64Array(n).fill(ratio), soonDelay: new Float64Array(n).fill(soonDelay), kSmall: points.kSmall, kLarge: points.kLarge });
  for (let i = 0; i < n; i++) {
    const lateDelay = optimum.lateDelay[i];
    if (Number.isNaN(lateDelay)) {
      out.probe[i] = fallback.probe;
      out.late[i] = fallback.late;
      out.soon[i] = fallback.soon;
      continue;
    }
    const anchors = anchorDelays({ model, ratio, soonDelay, kSmall: points.kSmall[i], kLarge: points.kLarge[i] });
    out.hasZone[i] = 1;
    out.probe[i] = Math.min(limit, probeAt ? probeAt(points.kSmall[i], points.kLarge[i]) : lateDelay);
    out.late[i] = anchors?.late ? Math.min(limit, anchors.late.lateDelay) : NaN;
    out.soon[i] = anchors?.soon && anchors.soon.lateDelay <= limit ? anchors.soon.lateDelay : NaN;
  }
  return out;
}

/** Expected pattern shares over the points, each point with its own late delay (NaN delays are skipped and reweighted). */
export function sharesAt(
  model: ModelSpec,
  ratio: number,
  soonDelay: number,
  points: RatePoints,
  delays: ArrayLike<number>,
  gamma: number,
): PatternShares | null {
  const total = noShares();
  let mass = 0;
  const n = points.kSmall.length;
  for (let i = 0; i < n; i++) {
    const D = delays[i];
    if (!(D > soonDelay)) continue;
    const w = points.weights ? points.weights[i] : 1;
    addShares(total, patternProbabilities(model, ratio, soonDelay, D, points.kSmall[i], points.kLarge[i], gamma), w);
    mass += w;
  }
  if (!(mass > 0)) return null;
  return { LL: total.LL / mass, LS: total.LS / mass, SL: total.SL / mass, SS: total.SS / mass };
}
