import { checkChoiceModel, DesignInputError, discriminationAt, type ChoiceModel, type Discrimination } from '@/lib/design';
import { checkSetting, type PairSetting } from './pairSetting';

/** The two rival models a model-discrimination design tells apart. */
export const RIVAL_MODELS = ['hyperbolic', 'exponential'] as const;

/** Default weight of the reversal term in the model-discrimination criterion: 0, pure discrimination. */
export const DEFAULT_REVERSAL_WEIGHT = 0;

export type DiscriminationOptions = PairSetting & {
  /** the participant's estimates, per day */
  kSmall: number;
  kLarge: number;
  /** the design's choice model (designChoiceModel) */
  choice: ChoiceModel;
  /** weight w ≥ 0 of the reversal term; default DEFAULT_REVERSAL_WEIGHT (0 = pure discrimination) */
  reversalWeight?: number;
};

export type { Discrimination };

/**
 * Model-discrimination criterion of a question pair: the expected Kullback–Leibler divergence
 * between the hyperbolic and the exponential model's predictive choice distributions, the
 * discrimination design criterion of Box & Hill (1967, Technometrics 9:57–71), whose upper bound
 * on the expected entropy change for two rival models with equal prior weights is proportional to
 * the symmetric KL divergence of their predictions (as used for delay discounting by Cavagnaro,
 * Myung, Pitt & Kujala 2010, Neural Computation 22:887–905). Here the symmetric (Jeffreys) form is used:
 *   J(p, q) = KL(p‖q) + KL(q‖p) = (p − q)·(logit p − logit q)
 * for Bernoulli choices with P(LL) = p under the hyperbolic and q under the exponential model,
 * each through the design's logistic choice model at the same estimates (kSmall, kLarge). The
 * far view (SS at d, LL at D) and the near view (SS now, LL at D − d) are independent given the
 * rates, so the divergences add. To it the reversal criterion is added with the team's weight w:
 *   value = J_far + J_near + w·P(LL far)·P(SS near)   (design model; w = 0 is pure discrimination).
 * See docs/mathematics.md, "Model discrimination".
 *
 * @throws DesignInputError for a bad model, ratio, delays, rates, choice model or weight
 * @example modelDiscrimination({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 60, kSmall: 0.1, kLarge: 0.05, choice: { sensitivity: 10 } }).divergence // > 0
 */
export function modelDiscrimination(options: DiscriminationOptions): Discrimination {
  checkSetting(options);
  checkChoiceModel(options.choice);
  const { kSmall, kLarge } = options;
  if (!(kSmall > 0 && kSmall < Infinity)) throw new DesignInputError('kSmall', 'a finite rate greater than 0 (per day)', kSmall);
  if (!(kLarge > 0 && kLarge < Infinity)) throw new DesignInputError('kLarge', 'a finite rate greater than 0 (per day)', kLarge);
  const w = options.reversalWeight ?? DEFAULT_REVERSAL_WEIGHT;
  if (!(w >= 0 && w <= 1000)) throw new DesignInputError('reversalWeight', 'a number from 0 to 1000', w);
  return discriminationAt(options.model, options.ratio, options.soonDelay, options.lateDelay, kSmall, kLarge, options.choice.sensitivity, options.choice.lapse ?? 0, w);
}
