import type { ChoiceModel } from './choiceProbability';
import { DesignInputError } from './DesignInputError';

/**
 * Choice sensitivity γ a design assumes when it does not set one: 10 per unit of the larger
 * amount, so a value difference of a tenth of the larger amount is chosen with probability
 * σ(1) ≈ 0.73. A planning assumption (to be replaced by a pilot estimate), shared by the
 * planner, the item bank's rate estimates and the power simulation's defaults.
 */
export const DEFAULT_CHOICE_SENSITIVITY = 10;

/** The unit γ is stated in, wherever it is shown or exported. */
export const CHOICE_SENSITIVITY_UNIT = 'per unit of the larger amount';

/**
 * The one choice model of a frozen design: logistic choice on the value difference in units of
 * the larger amount, P(LL) = σ(γ·(V_LL − V_SS)/L), with the design's γ (or
 * DEFAULT_CHOICE_SENSITIVITY) and no lapse. The planner's expected shares, the item bank's
 * expected-reversal-rate criterion, the probe-items API's rate estimates and the power
 * simulation's re-estimation of rates all read γ here, so one frozen version means one γ.
 *
 * @throws DesignInputError when the design's γ is not a finite number above 0
 * @example designChoiceModel({ choiceSensitivity: 14 }) // { sensitivity: 14, lapse: 0 }
 */
export function designChoiceModel(spec: { choiceSensitivity?: number }): Required<ChoiceModel> {
  const sensitivity = spec.choiceSensitivity ?? DEFAULT_CHOICE_SENSITIVITY;
  if (!(sensitivity > 0 && sensitivity < Infinity)) throw new DesignInputError('design.choiceSensitivity', 'a finite number greater than 0', sensitivity);
  return { sensitivity, lapse: 0 };
}
