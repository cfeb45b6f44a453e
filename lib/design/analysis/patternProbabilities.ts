import type { ChoiceModel } from '../choiceProbability';
import type { ModelId } from '../types';
import { choiceLogLikelihood, packChoices } from './choiceLikelihood';
import { pairChoice } from './participantChoices';
import { thetaOf } from './refitParticipant';
import type { ModelParameters, ObservedPair } from './types';

/** Probabilities (or counts) of the four choice patterns, far view first. */
export type PatternCounts = { LL: number; LS: number; SL: number; SS: number };

/**
 * The probabilities of the four patterns of one question pair for a chooser with the given
 * model and parameters: the two views are independent logistic choices (docs/mathematics.md, "Choice
 * model"), P(LL at far view) = p_far and P(SS at near view) = q_near, so
 * P(LS) = p_far·q_near, P(LL) = p_far·(1 − q_near), P(SS) = (1 − p_far)·q_near,
 * P(SL) = (1 − p_far)·(1 − q_near).
 *
 * @example pairPatternProbabilities('hyperbolic', { kSmall: 0.1, kLarge: 0.05, sensitivity: 1, presentBias: 1 }, pair, { sensitivity: 10 }).LS // p_far·q_near
 */
export function pairPatternProbabilities(id: ModelId, parameters: ModelParameters, pair: ObservedPair, choice: ChoiceModel): PatternCounts {
  const theta = thetaOf(id, parameters);
  const lapse = choice.lapse ?? 0;
  const farLater = Math.exp(choiceLogLikelihood(id, packChoices([pairChoice(pair.far, true)]), theta, choice.sensitivity, lapse));
  const nearSooner = Math.exp(choiceLogLikelihood(id, packChoices([pairChoice(pair.near, false)]), theta, choice.sensitivity, lapse));
  return {
    LL: farLater * (1 - nearSooner),
    LS: farLater * nearSooner,
    SL: (1 - farLater) * (1 - nearSooner),
    SS: (1 - farLater) * nearSooner,
  };
}
