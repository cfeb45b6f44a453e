import { anchorDelays } from '../anchorDelays';
import { optimiseLateDelay } from '../optimiseLateDelay';
import type { ModelSpec } from '../types';

/** Late delays (days) of one participant's probe block; NaN where a role has no pair. */
export type ProbeSet = { probe: number; lateAnchor: number; soonAnchor: number };

/**
 * The probe block a participant with rates (kSmall, kLarge) gets under the design's model:
 * reversal probes at the late delay with the largest gap product (optimiseLateDelay), the late
 * and soon anchors on either side of the zone (anchorDelays). Delays beyond the design's
 * late-delay limit are held at the limit. Returns null when the rates give no reversal zone.
 */
export function probeSet(model: ModelSpec, ratio: number, soonDelay: number, lateDelayLimit: number, kSmall: number, kLarge: number): ProbeSet | null {
  const input = { model, ratio, soonDelay, kSmall, kLarge };
  const optimum = optimiseLateDelay(input);
  if (optimum === null) return null;
  const anchors = anchorDelays(input);
  const clamp = (D: number) => Math.min(D, lateDelayLimit);
  return {
    probe: clamp(optimum.lateDelay),
    lateAnchor: anchors?.late ? clamp(anchors.late.lateDelay) : NaN,
    soonAnchor: anchors?.soon ? clamp(anchors.soon.lateDelay) : NaN,
  };
}
