import { pairDelaysAround } from '../item-bank/pairDelays';
import { designChoiceModel } from '../designChoiceModel';
import { discriminationLateDelay } from '../modelDivergence';
import { optimiseLateDelay, type LateDelayOptimum } from '../optimiseLateDelay';
import { reversalZone } from '../reversalZone';
import type { PowerDesign } from './types';

/** Late delays (days) of one participant's probe block, per pair role. */
export type ProbeSet = { probe: number[]; lateAnchor: number[]; soonAnchor: number[] };

/**
 * The probe block a participant with rates (kSmall, kLarge) is served under the design's
 * model, as the item bank builds it: the main probe at the late delay with the largest gap
 * product at these rates (optimiseLateDelay), further probes and the anchors placed around it
 * by pairDelays (a model-discrimination design: the main probe where modelDiscrimination is largest);
 * with `point`, around that design point instead. Null when the rates give no
 * reversal zone within the design's limits.
 */
export function probeSet(design: PowerDesign, kSmall: number, kLarge: number, point?: { soonDelay: number; lateDelay: number }): ProbeSet | null {
  const { spec } = design;
  const d = point?.soonDelay ?? design.soonDelay;
  const rates = { kSmall, kLarge };
  let lateDelay = point?.lateDelay;
  let optimum: LateDelayOptimum | null | undefined;
  if (lateDelay === undefined && spec.criterion === 'model-discrimination') {
    // a model-discrimination design's own placement at these rates; anchors still from the gap-product optimum (pairDelays)
    if (!reversalZone({ model: spec.model, ratio: spec.ratio, soonDelay: d, ...rates })) return null;
    const choice = designChoiceModel(spec);
    lateDelay = discriminationLateDelay(spec.model, spec.ratio, d, kSmall, kLarge, choice.sensitivity, 0, spec.reversalWeight ?? 0, spec.lateDelayLimit);
  }
  if (lateDelay === undefined) {
    optimum = optimiseLateDelay({ model: spec.model, ratio: spec.ratio, soonDelay: d, ...rates });
    if (optimum === null) return null;
    lateDelay = optimum.lateDelay;
  }
  const delays = pairDelaysAround(design, { soonDelay: d, lateDelay }, rates, optimum);
  if (delays === null) return null;
  return { probe: delays.probes, lateAnchor: delays.lateAnchors, soonAnchor: delays.soonAnchors };
}
