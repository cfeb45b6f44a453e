import { discountAt, probabilityLarger, type RatePoints } from '@/lib/design';
import { checkChoiceModel, checkPoints, checkSetting, type ChoiceModel, type PairSetting } from './pairSetting';

/**
 * Expected reversal rate of a question pair over a prior:
 *   E[ P(LL at far view) · P(SS at near view) ]
 * with P(LL at far view) = ε/2 + (1 − ε)·σ(γ·A) (value difference V_LL − V_SS = A) and, since the
 * near-view value difference is V_LL − V_SS = −B, P(SS at near view) = 1 − P(LL | −B) =
 * ε/2 + (1 − ε)·σ(γ·B). The two views are treated as independent given the rates.
 *
 * The expectation is the (weighted) mean over `points`. Its accuracy is the caller's choice of
 * points, against an error target of 1e-4 absolute:
 * - the tensor Gauss–Hermite rule (priorPoints, method 'quadrature') meets it with the node count
 *   expectedRateNodes gives for γ and the prior's spread (e.g. 40 per axis at γ = 20, σ = 0.8, where
 *   12 nodes err by 2.7e-3), checked against fine-grid references in the criteria tests;
 * - Monte Carlo draws have a standard error of at most 0.5/√n (a share's SD is at most 1/2), so the
 *   target would take 2.5·10^7 draws; 2,000 draws give about 0.01, enough to compare designs
 *   under common random numbers but not to report a rate to four decimals.
 * Note that choice noise alone produces "reversals" (at most 1/4 of choices when A ≈ 0 and
 * d = 0); compare designs, not absolute levels, when γ is small.
 *
 * @throws DesignInputError for a bad model, ratio, delays (D > d), choice model or points
 * @example expectedReversalRate({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 40, choice: { sensitivity: 1e6 }, points: { kSmall: new Float64Array([0.1]), kLarge: new Float64Array([0.05]), weights: null } }) // 1 (a noiseless chooser inside the zone)
 */
export function expectedReversalRate(options: PairSetting & { choice: ChoiceModel; points: RatePoints }): number {
  checkSetting(options);
  checkChoiceModel(options.choice);
  checkPoints(options.points);
  const { model, ratio: x, soonDelay: d, lateDelay: D, points } = options;
  const id = model.id;
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const gamma = options.choice.sensitivity;
  const lapse = options.choice.lapse ?? 0;
  const { kSmall, kLarge, weights } = points;
  const n = kSmall.length;
  const nearDelay = D - d;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const K = kLarge[i];
    const far = discountAt(id, K, s, beta, D) - x * discountAt(id, kSmall[i], s, beta, d);
    const near = x - discountAt(id, K, s, beta, nearDelay);
    const p = probabilityLarger(gamma, lapse, far) * probabilityLarger(gamma, lapse, near);
    sum += weights === null ? p : weights[i] * p;
  }
  return weights === null ? sum / n : sum;
}
