import { discountAt } from './discountFactor';
import { checkLateDelay, checkPairInput } from './validate';
import type { QuestionPair } from './types';

/** The two preference gaps of a question pair, in units of the large amount. */
export type PreferenceGaps = {
  /** A = f_K(D) − x·f_k(d); > 0 means LL is preferred in the far view (standing at day 0) */
  far: number;
  /** B = x·f_k(0) − f_K(D − d); > 0 means SS is preferred in the near view (standing at day d) */
  near: number;
};

/**
 * Far-view and near-view preference gaps of a question pair (docs/mathematics.md, "Preference gaps and the reversal zone"):
 * A(D) = f_K(D) − x·f_k(d) and B(D) = x − f_K(D − d), with L normalised to 1 and S = x.
 *
 * @param input model, ratio x = S/L, soon delay d and late delay D (days, D > d; D may be
 *   Infinity), rates kSmall = k and kLarge = K (per day)
 * @throws DesignInputError for any field out of range (see DesignInputError messages)
 * @example preferenceGaps({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 20, kSmall: 0.1, kLarge: 0.05 }) // { far: 0.25, near: 0.5 - 1 / 1.5 }
 */
export function preferenceGaps(input: QuestionPair): PreferenceGaps {
  const { model, ratio, soonDelay, kSmall, kLarge, lateDelay } = input;
  checkPairInput(model, ratio, soonDelay, kSmall, kLarge);
  checkLateDelay(lateDelay, soonDelay);
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const far = discountAt(model.id, kLarge, s, beta, lateDelay) - ratio * discountAt(model.id, kSmall, s, beta, soonDelay);
  const near = ratio - discountAt(model.id, kLarge, s, beta, lateDelay - soonDelay);
  return { far, near };
}
