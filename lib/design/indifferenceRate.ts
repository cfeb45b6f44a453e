import { discountAt } from './discountFactor';
import { DesignInputError } from './DesignInputError';
import { findRoot } from './findRoot';
import { checkDelay, checkModel, checkPositive } from './validate';
import type { ModelSpec } from './types';

export type ChoiceItem = {
  soonerAmount: number;
  /** days; 0 = today */
  soonerDelay?: number;
  laterAmount: number;
  /** days */
  laterDelay: number;
};

/**
 * The discount rate (per day; per day^s for power-delay and exponential-power) at which a
 * chooser is indifferent between the sooner and the later amount: S·f(d) = L·f(D).
 * With d = 0 and r = L/S it is a closed form per model:
 *   exponential ln r / D; hyperbolic (r − 1)/D (Kirby, Petry & Bickel 1999, J Exp Psychol Gen
 *   128:78–87: k = (L/S − 1)/D); hyperboloid (r^(1/s) − 1)/D; power-delay (r − 1)/D^s;
 *   exponential-power ln r / D^s; quasi-hyperbolic ln(βr)/D (exists only when S < βL).
 * With d > 0: exponential and quasi-hyperbolic ln r/(D − d); exponential-power
 * ln r/(D^s − d^s); hyperbolic (L − S)/(S·D − L·d); hyperboloid and power-delay: the root of
 * L·f(D) − S·f(d) in ln k (Brent–Dekker, bracket ln k ∈ [−40, 20]).
 *
 * @throws DesignInputError for non-positive amounts, S ≥ L, negative delays, D ≤ d, or when
 *   no rate makes the two options equal (field 'soonerAmount')
 * @example indifferenceRate({ id: 'hyperbolic' }, { soonerAmount: 54, laterAmount: 55, laterDelay: 117 }) // (55/54 − 1)/117 ≈ 0.000158
 */
export function indifferenceRate(model: ModelSpec, item: ChoiceItem): number {
  checkModel(model);
  const { soonerAmount: S, laterAmount: L, laterDelay: D } = item;
  const d = item.soonerDelay ?? 0;
  checkPositive('soonerAmount', S);
  checkPositive('laterAmount', L);
  if (!(S < L)) throw new DesignInputError('soonerAmount', `a number below laterAmount (${L})`, S);
  checkDelay('soonerDelay', d);
  checkDelay('laterDelay', D);
  if (!(D > d)) throw new DesignInputError('laterDelay', `a number of days greater than soonerDelay (${d})`, D);
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  if (d === 0) {
    const lnR = Math.log(L / S);
    switch (model.id) {
      case 'exponential':
        return lnR / D;
      case 'hyperbolic':
        return (L - S) / S / D;
      case 'hyperboloid':
        return Math.expm1(lnR / s) / D;
      case 'power-delay':
        return (L - S) / S / Math.pow(D, s);
      case 'exponential-power':
        return lnR / Math.pow(D, s);
      case 'quasi-hyperbolic':
        if (!(Math.log(beta) + lnR > 0)) throw new DesignInputError('soonerAmount', `a number below presentBias × laterAmount (${beta * L}) for a quasi-hyperbolic indifference rate`, S);
        return (Math.log(beta) + lnR) / D;
    }
  }
  const lnR = Math.log(L / S);
  switch (model.id) {
    case 'exponential':
    case 'quasi-hyperbolic': // β multiplies both options when d > 0
      return lnR / (D - d);
    case 'exponential-power':
      return lnR / (Math.pow(D, s) - Math.pow(d, s));
    case 'hyperbolic':
      // L(1 + kd) = S(1 + kD) gives k = (L − S)/(S·D − L·d), a tie only when S·D > L·d
      if (!(S * D > L * d)) throw new DesignInputError('soonerAmount', `an amount with soonerAmount × laterDelay above laterAmount × soonerDelay (${L * d})`, S);
      return (L - S) / (S * D - L * d);
    default:
      break;
  }
  const gap = (lnK: number) => {
    const k = Math.exp(lnK);
    return L * discountAt(model.id, k, s, beta, D) - S * discountAt(model.id, k, s, beta, d);
  };
  if (!(gap(-40) > 0 && gap(20) < 0)) {
    throw new DesignInputError('soonerAmount', 'an amount that some discount rate makes exactly as good as the later one', S);
  }
  return Math.exp(findRoot(gap, { lower: -40, upper: 20, tolerance: 1e-13 }).root);
}
