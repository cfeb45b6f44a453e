import { DesignInputError, discountAt } from '@/lib/design';
import { checkSetting, type PairSetting } from './pairSetting';

/**
 * Maximin gap criterion: the smallest preference gap min(A, B) over a set of rate scenarios
 * (e.g. priorScenarios), in units of the large amount. It is positive only when the pair is
 * inside every scenario's reversal zone; a design that maximises it keeps the weakest
 * scenario's weaker view as clear as possible.
 *
 * @param options.scenarios at least one {kSmall, kLarge} pair of positive finite rates per day
 * @throws DesignInputError for a bad setting or scenario
 * @example maximinGap({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 40, scenarios: [{ kSmall: 0.1, kLarge: 0.05 }] }) // min(1/3 − 1/4, 1/2 − 2/5) = 1/12
 */
export function maximinGap(options: PairSetting & { scenarios: readonly { kSmall: number; kLarge: number }[] }): number {
  checkSetting(options);
  const { model, ratio: x, soonDelay: d, lateDelay: D, scenarios } = options;
  if (!Array.isArray(scenarios) || scenarios.length === 0) throw new DesignInputError('scenarios', 'a non-empty list of {kSmall, kLarge}', scenarios);
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  let worst = Infinity;
  scenarios.forEach(({ kSmall: k, kLarge: K }, i) => {
    if (!(k > 0 && k < Infinity)) throw new DesignInputError(`scenarios[${i}].kSmall`, 'a finite rate greater than 0 (per day)', k);
    if (!(K > 0 && K < Infinity)) throw new DesignInputError(`scenarios[${i}].kLarge`, 'a finite rate greater than 0 (per day)', K);
    const far = discountAt(model.id, K, s, beta, D) - x * discountAt(model.id, k, s, beta, d);
    const near = x - discountAt(model.id, K, s, beta, D - d);
    worst = Math.min(worst, far, near);
  });
  return worst;
}
