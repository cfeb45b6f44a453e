import { zoneConstants, type ZoneConstants } from './zoneBounds';
import { checkPairInput } from './validate';
import type { PairInput } from './types';

/** The open interval of late delays (days) that give the pattern LS. */
export type ReversalZone = { lower: number; upper: number };

const scratch: ZoneConstants = { a: 0, b: 0, p: 1, span: 0 };

/**
 * The reversal zone (D_lower, D_upper): late delays D for which the far view prefers LL
 * (A > 0) and the near view prefers SS (B > 0). Bounds are closed forms obtained by
 * inverting each discount function (see zoneBounds.ts), e.g. for the hyperbolic model
 * D_lower = d + (1 − x)/(xK), D_upper = (1 + kd − x)/(xK), non-empty iff k > xK;
 * for the exponential model D_lower = d + ln(1/x)/K, D_upper = (kd + ln(1/x))/K,
 * non-empty iff k > K.
 *
 * With d = 0 the two views coincide (A = −B), so the zone is always empty.
 * `upper` is Infinity when the bound overflows a double (e.g. tiny s).
 *
 * @returns the zone in days, or null when it is empty
 * @throws DesignInputError for any field out of range
 * @example reversalZone({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 }) // { lower: 30, upper: 60 }
 */
export function reversalZone(input: PairInput): ReversalZone | null {
  const { model, ratio, soonDelay, kSmall, kLarge } = input;
  checkPairInput(model, ratio, soonDelay, kSmall, kLarge);
  if (soonDelay === 0) return null;
  const c = zoneConstants(model.id, ratio, soonDelay, kSmall, model.sensitivity ?? 1, model.presentBias ?? 1, scratch);
  if (c.p === 1 && !(c.span > kLarge * soonDelay)) return null;
  const lower = soonDelay + (c.p === 1 ? c.a / kLarge : Math.pow(c.a / kLarge, c.p));
  const upper = c.p === 1 ? c.b / kLarge : Math.pow(c.b / kLarge, c.p);
  if (!(upper > lower)) return null;
  return { lower, upper };
}
