import { discountAt } from './discountFactor';
import { maximiseBrent } from './maximiseBrent';
import { probabilityLarger } from './choiceProbability';
import type { ModelSpec } from './types';

/** The model-discrimination criterion's parts at one pair (see modelDiscrimination in lib/criteria). */
export type Discrimination = {
  /** symmetric (Jeffreys) Kullback–Leibler divergence, nats, summed over the far and near view */
  divergence: number;
  /** P(LL at far view)·P(SS at near view) under the design model at the estimates */
  reversal: number;
  /** divergence + w·reversal, the value the delays maximise */
  value: number;
};

/**
 * Unchecked model-discrimination criterion (docs/mathematics.md, "Model discrimination"): the
 * symmetric KL divergence between the hyperbolic and the exponential model's predicted choices
 * for the far view (SS at d, LL at D) and the near view (SS now, LL at D − d) at rates (k, K),
 * plus w times the reversal probability under `model`. The checked entry point is
 * modelDiscrimination in lib/criteria.
 */
export function discriminationAt(model: ModelSpec, x: number, d: number, D: number, k: number, K: number, gamma: number, lapse: number, w: number): Discrimination {
  const farH = discountAt('hyperbolic', K, 1, 1, D) - x * discountAt('hyperbolic', k, 1, 1, d);
  const farE = discountAt('exponential', K, 1, 1, D) - x * discountAt('exponential', k, 1, 1, d);
  const nearH = discountAt('hyperbolic', K, 1, 1, D - d) - x; // V_LL − V_SS at the near view
  const nearE = discountAt('exponential', K, 1, 1, D - d) - x;
  const divergence = jeffreys(gamma, lapse, farH, farE) + jeffreys(gamma, lapse, nearH, nearE);
  let reversal = 0;
  if (w > 0) {
    const s = model.sensitivity ?? 1;
    const beta = model.presentBias ?? 1;
    const gapFar = discountAt(model.id, K, s, beta, D) - x * discountAt(model.id, k, s, beta, d);
    const gapNear = x - discountAt(model.id, K, s, beta, D - d);
    reversal = probabilityLarger(gamma, lapse, gapFar) * probabilityLarger(gamma, lapse, gapNear);
  }
  return { divergence, reversal, value: divergence + w * reversal };
}

/**
 * J between two Bernoulli choices with value differences a and b: (p − q)(logit p − logit q).
 * Without lapse logit p = γ·a exactly; with lapse 1 − p is computed as P(LL | −a), so neither
 * tail loses digits.
 */
function jeffreys(gamma: number, lapse: number, a: number, b: number): number {
  const p = probabilityLarger(gamma, lapse, a);
  const q = probabilityLarger(gamma, lapse, b);
  const logitP = lapse === 0 ? gamma * a : Math.log(p) - Math.log(probabilityLarger(gamma, lapse, -a));
  const logitQ = lapse === 0 ? gamma * b : Math.log(q) - Math.log(probabilityLarger(gamma, lapse, -b));
  return (p - q) * (logitP - logitQ);
}

/**
 * Unchecked: the late delay D in [d + 1, lateDelayMax] maximising discriminationAt at a fixed soon
 * delay d: 24 grid points in ln(D − d), then Brent's maximiser inside the best point's neighbouring
 * cells. The same method as optimisePopulationDesign with one soon delay, for the power simulation
 * (which lives below lib/criteria).
 */
export function discriminationLateDelay(model: ModelSpec, x: number, d: number, k: number, K: number, gamma: number, lapse: number, w: number, lateDelayMax: number): number {
  const lo = 0; // ln(1 day)
  const hi = Math.log(Math.max(lateDelayMax - d, 1));
  if (!(hi > lo)) return d + 1;
  const f = (v: number) => discriminationAt(model, x, d, d + Math.exp(v), k, K, gamma, lapse, w).value;
  const n = 24;
  const step = (hi - lo) / (n - 1);
  let best = 0;
  let bestValue = -Infinity;
  for (let j = 0; j < n; j++) {
    const value = f(lo + j * step);
    if (value > bestValue) [best, bestValue] = [j, value];
  }
  const m = maximiseBrent(f, { lower: lo + Math.max(0, best - 1) * step, upper: lo + Math.min(n - 1, best + 1) * step, tolerance: 1e-9 });
  const v = m.value > bestValue ? m.argmax : lo + best * step;
  return Math.min(lateDelayMax, d + Math.exp(v));
}
