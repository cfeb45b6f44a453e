import { anchorsAround } from '../anchorDelays';
import { optimiseLateDelay } from '../optimiseLateDelay';
import { reversalZone, type ReversalZone } from '../reversalZone';
import type { LateDelayOptimum, PairInput } from '../types';
import type { BankDesign, DesignPoint, RatePair } from './types';

/** Late delays (days, unrounded) of the probe and anchor pairs for one set of rates. */
export type PairDelays = {
  soonDelay: number;
  zone: { lower: number; upper: number };
  probes: number[];
  lateAnchors: number[];
  soonAnchors: number[];
  /** anchors the design asked for that did not fit (no room below the zone, or beyond the late-delay limit) */
  omitted: { lateAnchors: number; soonAnchors: number };
};

/** The part of a design pairDelays reads. */
export type PairDelaysDesign = { spec: Pick<BankDesign['spec'], 'model' | 'ratio' | 'lateDelayLimit' | 'probePairs' | 'lateAnchors' | 'soonAnchors' | 'criterion'> };

/**
 * Probe and anchor late delays around the main probe delay for given rates. Rule of ours:
 * - one probe sits at the point's late delay; n > 1 probes spread evenly in ln(D − d) over the
 *   central half of the room between the main delay and the nearer zone edge, so each stays
 *   well inside the zone;
 * - the first late and soon anchors come from anchorDelays (as clear-cut as the probe); each
 *   further anchor steps the same distance in ln(D − d) again away from the zone;
 * - every delay stays at or below the design's late-delay limit (anchors that cannot are omitted);
 * - under the model-discrimination criterion the main delay is kept where the criterion put it, even
 *   outside the zone (that is where the models' predictions differ most), and n > 1 probes spread
 *   evenly over ±DISCRIMINATION_SPREAD in ln(D − d) around it, capped at the limit.
 *
 * @returns null when the rates have no reversal zone at the point's soon delay, or the zone starts beyond the limit
 */
export function pairDelays(design: PairDelaysDesign, point: DesignPoint, rates: RatePair): PairDelays | null {
  return pairDelaysAround(design, point, rates);
}

/**
 * pairDelays, for callers that already hold optimiseLateDelay's result for these rates at the
 * point's soon delay (the power simulation's probe sets): the same delays without solving it twice.
 */
export function pairDelaysAround(design: PairDelaysDesign, point: DesignPoint, rates: RatePair, known?: LateDelayOptimum | null): PairDelays | null {
  const { spec } = design;
  const d = point.soonDelay;
  const input = { model: spec.model, ratio: spec.ratio, soonDelay: d, kSmall: rates.kSmall, kLarge: rates.kLarge };
  const zone = reversalZone(input);
  const limit = spec.lateDelayLimit;
  if (!zone || zone.lower >= limit) return null;
  const n = spec.probePairs;
  const probes: number[] = [];
  if (spec.criterion === 'model-discrimination') {
    const t = Math.log(Math.min(Math.max(point.lateDelay, d + 1), limit) - d);
    for (let i = 0; i < n; i++) probes.push(Math.min(limit, d + Math.exp(n === 1 ? t : t + DISCRIMINATION_SPREAD * ((2 * i) / (n - 1) - 1))));
    return withAnchors(design, input, zone, d, probes, known);
  }
  const tMain = Math.log(Math.min(Math.max(point.lateDelay, zone.lower), limit) - d);
  const tLow = zone.lower > d ? Math.log(zone.lower - d) : tMain - 1;
  const tUp = Number.isFinite(zone.upper) ? Math.log(Math.min(zone.upper, limit) - d) : tMain + 1;
  const half = 0.5 * Math.max(0, Math.min(tMain - tLow, tUp - tMain));
  for (let i = 0; i < n; i++) probes.push(d + Math.exp(n === 1 ? tMain : tMain + half * ((2 * i) / (n - 1) - 1)));
  return withAnchors(design, input, zone, d, probes, known);
}

/** Half-width in ln(D − d) over which a model-discrimination design spreads its probes (rule of ours: a factor e^0.25 ≈ 1.28 either side). */
export const DISCRIMINATION_SPREAD = 0.25;

function withAnchors(design: PairDelaysDesign, input: PairInput, zone: ReversalZone, d: number, probes: number[], known: LateDelayOptimum | null | undefined): PairDelays {
  const { spec } = design;
  const limit = spec.lateDelayLimit;
  // anchorDelays(input) with its defaults, reusing the caller's optimum when it has one
  const optimum = known === undefined ? optimiseLateDelay(input) : known;
  const anchors = optimum === null ? null : anchorsAround(input, optimum, 4, optimum.gapProduct);
  const lateAnchors = zone.lower > d ? steps(anchors?.late?.lateDelay, zone.lower, spec.lateAnchors, -1, d, limit) : [];
  const soonAnchors = Number.isFinite(zone.upper) ? steps(anchors?.soon?.lateDelay, zone.upper, spec.soonAnchors, 1, d, limit) : [];
  return {
    soonDelay: d,
    zone,
    probes,
    lateAnchors,
    soonAnchors,
    omitted: { lateAnchors: spec.lateAnchors - lateAnchors.length, soonAnchors: spec.soonAnchors - soonAnchors.length },
  };
}

/** `count` anchors from the first one outwards, each one step in ln(D − d) further from the zone; those past the limit left out. */
function steps(first: number | undefined, edge: number, count: number, direction: -1 | 1, d: number, limit: number): number[] {
  const delays: number[] = [];
  if (first === undefined || count === 0) return delays;
  const step = Math.abs(Math.log(first - d) - Math.log(edge - d));
  for (let j = 0; j < count; j++) {
    const D = d + Math.exp(Math.log(first - d) + direction * j * step);
    if (D <= limit) delays.push(D);
  }
  return delays;
}
