import { checkModel, checkRate, failDelay } from './validate';
import type { ModelId, ModelSpec } from './types';

/**
 * Discount factor f(D): the share of an amount's value left after a delay of D days.
 *
 * - exponential (Samuelson 1937, Rev Econ Stud 4:155–161): exp(−kD)
 * - hyperbolic (Mazur 1987, in Commons et al., Quantitative Analyses of Behavior V): 1 / (1 + kD)
 * - hyperboloid (Myerson & Green 1995, J Exp Anal Behav 64:263–276): (1 + kD)^(−s)
 * - power-delay (Rachlin 2006, J Exp Anal Behav 85:425–435): 1 / (1 + k·D^s)
 * - exponential-power (Ebert & Prelec 2007, Manage Sci 53:1423–1438): exp(−k·D^s)
 * - quasi-hyperbolic (Laibson 1997, Q J Econ 112:443–477): 1 at D = 0, else β·exp(−kD)
 *
 * @param model model id with its sensitivity s (default 1) and present bias β (default 1)
 * @param rate discount rate k, per day (for power-delay and exponential-power: per day^s)
 * @param delayDays delay D in days, 0 or more; Infinity gives 0
 * @throws DesignInputError for an unknown model, s ≤ 0, β outside (0, 1], a non-positive or
 *   non-finite rate, or a negative or NaN delay
 * @example discountFactor({ id: 'hyperbolic' }, 0.1, 10) // 0.5
 */
export function discountFactor(model: ModelSpec, rate: number, delayDays: number): number {
  checkModel(model);
  checkRate('rate', rate);
  if (!(delayDays >= 0)) failDelay('delayDays', delayDays);
  return discountAt(model.id, rate, model.sensitivity ?? 1, model.presentBias ?? 1, delayDays);
}

/** Unchecked discount factor for the hot paths (inputs already validated). */
export function discountAt(id: ModelId, k: number, s: number, beta: number, D: number): number {
  switch (id) {
    case 'exponential':
      return Math.exp(-k * D);
    case 'hyperbolic':
      return 1 / (1 + k * D);
    case 'hyperboloid':
      return Math.pow(1 + k * D, -s);
    case 'power-delay':
      return 1 / (1 + k * Math.pow(D, s));
    case 'exponential-power':
      return Math.exp(-k * Math.pow(D, s));
    case 'quasi-hyperbolic':
      return D === 0 ? 1 : beta * Math.exp(-k * D);
  }
}

/**
 * Unchecked discount factor just after a delay: equal to discountAt except for the
 * quasi-hyperbolic model at D = 0, where the right-hand limit β is returned. Used where a
 * near-view delay D − d shrinks towards 0 inside an open interval.
 */
export function discountAfter(id: ModelId, k: number, s: number, beta: number, D: number): number {
  if (D === 0 && id === 'quasi-hyperbolic') return beta;
  return discountAt(id, k, s, beta, D);
}
