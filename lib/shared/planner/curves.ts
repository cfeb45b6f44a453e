import { discountFactor, findRoot, type ModelSpec } from '@/lib/design';
import { gapProduct } from '@/lib/criteria';
import type { GapCurve, ValueCurve } from './types';

/**
 * Values (in the currency) of the smaller-sooner and larger-later rewards seen from standing
 * day t = 0 … d: V_S(t) = S·f_k(d − t), V_L(t) = L·f_K(D − t). Where the lines cross the
 * preference turns from LL to SS; null when d = 0 (nothing to watch).
 */
export function valueCurve(o: { model: ModelSpec; ratio: number; largeAmount: number; soonDelay: number; lateDelay: number; kSmall: number; kLarge: number; steps?: number }): ValueCurve | null {
  const { model, ratio, largeAmount: L, soonDelay: d, lateDelay: D, kSmall: k, kLarge: K } = o;
  if (!(d > 0) || !(D > d)) return null;
  const steps = o.steps ?? 60;
  const days: number[] = [];
  const small: number[] = [];
  const large: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const t = (d * i) / steps;
    days.push(t);
    small.push(ratio * L * discountFactor(model, k, d - t));
    large.push(L * discountFactor(model, K, D - t));
  }
  const diff = (t: number) => discountFactor(model, K, D - t) - ratio * discountFactor(model, k, d - t);
  let crossing: number | null = null;
  const lo = diff(0);
  const hi = diff(d);
  if (lo > 0 && hi < 0) crossing = findRoot(diff, { lower: 0, upper: d, tolerance: 1e-9 }).root;
  return { soonDelay: d, lateDelay: D, days, small, large, crossing };
}

/** The gap product C(D) on a log grid of late delays around the zone (0 outside it), with the optimum. */
export function gapCurve(o: {
  model: ModelSpec;
  ratio: number;
  soonDelay: number;
  kSmall: number;
  kLarge: number;
  limit: number;
  zone: { lower: number; upper: number } | null;
  optimum: { lateDelay: number; gapProduct: number } | null;
  steps?: number;
}): GapCurve | null {
  const { model, ratio, soonDelay: d, kSmall, kLarge, limit, zone } = o;
  if (!zone || !(d > 0)) return null;
  const steps = o.steps ?? 120;
  const from = Math.max(1e-3, (zone.lower - d) / 3);
  const to = Math.max(from * 2, Math.min(limit - d, Number.isFinite(zone.upper) ? (zone.upper - d) * 1.5 : limit - d));
  const a = Math.log(from);
  const b = Math.log(to);
  const lateDelays: number[] = [];
  const values: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const D = d + Math.exp(a + ((b - a) * i) / steps);
    lateDelays.push(D);
    values.push(gapProduct({ model, ratio, soonDelay: d, lateDelay: D, kSmall, kLarge }));
  }
  return { lateDelays, values, optimum: o.optimum, zone };
}
