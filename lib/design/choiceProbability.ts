import { DesignInputError } from './DesignInputError';

/** Logistic choice on the value difference, with an optional lapse ("trembling hand") rate. */
export type ChoiceModel = {
  /** sensitivity γ > 0, per unit of the large amount */
  sensitivity: number;
  /** lapse rate ε, 0 ≤ ε < 1, default 0: with probability ε the choice is a coin flip */
  lapse?: number;
};

/**
 * Checks a choice model: sensitivity γ finite and > 0, lapse ε in [0, 1).
 *
 * @throws DesignInputError naming `choice.sensitivity` or `choice.lapse`
 * @example checkChoiceModel({ sensitivity: 0 }) // throws, field 'choice.sensitivity'
 */
export function checkChoiceModel(choice: ChoiceModel, field = 'choice'): void {
  if (choice === null || typeof choice !== 'object') throw new DesignInputError(field, 'an object { sensitivity, lapse? }', choice);
  const g = choice.sensitivity;
  if (!(g > 0 && g < Infinity)) throw new DesignInputError(`${field}.sensitivity`, 'a finite number greater than 0', g);
  const e = choice.lapse;
  if (e !== undefined && !(e >= 0 && e < 1)) throw new DesignInputError(`${field}.lapse`, 'a number from 0 up to (not including) 1', e);
}

/**
 * Probability of choosing the larger-later reward:
 *   P(LL) = ε/2 + (1 − ε) / (1 + exp(−γ·Δ)),  Δ = (V_LL − V_SS)/L,
 * logistic choice (Luce 1959, Individual Choice Behavior) with a lapse rate ε. The logistic is
 * evaluated as e^z/(1 + e^z) for z < 0 so it neither overflows nor loses the small tail.
 * In the near view of a pair Δ = −B, so P(SS at near view) = choiceProbability(choice, B).
 *
 * @param valueGap Δ in units of the large amount (−Infinity and Infinity allowed)
 * @throws DesignInputError for γ ≤ 0 or non-finite, ε outside [0, 1), or a NaN gap
 * @example choiceProbability({ sensitivity: 10, lapse: 0.1 }, 0) // 0.5
 */
export function choiceProbability(choice: ChoiceModel, valueGap: number): number {
  checkChoiceModel(choice);
  if (Number.isNaN(valueGap)) throw new DesignInputError('valueGap', 'a number (value difference in units of the large amount)', valueGap);
  return probabilityLarger(choice.sensitivity, choice.lapse ?? 0, valueGap);
}

/** Unchecked P(LL) for the hot paths. */
export function probabilityLarger(gamma: number, lapse: number, gap: number): number {
  const z = gamma * gap;
  let p: number;
  if (z >= 0) p = 1 / (1 + Math.exp(-z));
  else {
    const e = Math.exp(z);
    p = e / (1 + e);
  }
  return lapse === 0 ? p : 0.5 * lapse + (1 - lapse) * p;
}

/**
 * Unchecked ln P(choice) for a chooser who picked LL (`later` true) or SS, without underflow:
 * ln σ(z) = −ln(1 + e^(−z)) for z ≥ 0 and z − ln(1 + e^z) otherwise.
 */
export function logChoiceProbability(gamma: number, lapse: number, gap: number, later: boolean): number {
  const z = later ? gamma * gap : -gamma * gap;
  const logSigma = z >= 0 ? -Math.log1p(Math.exp(-z)) : z - Math.log1p(Math.exp(z));
  if (lapse === 0) return logSigma;
  return Math.log(0.5 * lapse + (1 - lapse) * Math.exp(logSigma));
}
