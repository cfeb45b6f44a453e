// Public face of the numerical core for discount models, reversal zones and item design.
export type { ModelId, ModelSpec, PairInput, QuestionPair, ChoicePattern } from './types';
export { MODEL_IDS } from './types';
export { DesignInputError } from './DesignInputError';
export { discountFactor, discountAt } from './discountFactor';
export { preferenceGaps, type PreferenceGaps } from './preferenceGaps';
export { predictPattern } from './predictPattern';
export { reversalZone, type ReversalZone } from './reversalZone';
export { optimiseLateDelay, type LateDelayOptimum } from './optimiseLateDelay';
export { anchorDelays, type AnchorOptions, type AnchorPair, type Anchors } from './anchorDelays';
export { findRoot, type RootOptions, type RootResult } from './findRoot';
export { maximiseBrent, type MaximiseOptions, type MaximiseResult } from './maximiseBrent';
export { createRandom, type SeededRandom } from './random';
export { erfc, normalCdf } from './normalCdf';
export { gaussHermite, type QuadratureRule } from './gaussHermite';
export { priorPoints, checkPrior, type RatePrior, type RatePoints, type PriorPointsOptions } from './ratePrior';
export { fitPrior } from './fitPrior';
export { reversibleShare } from './reversibleShare';
export { choiceProbability, checkChoiceModel, probabilityLarger, type ChoiceModel } from './choiceProbability';
export { designChoiceModel, DEFAULT_CHOICE_SENSITIVITY, CHOICE_SENSITIVITY_UNIT } from './designChoiceModel';
export { indifferenceRate, type ChoiceItem } from './indifferenceRate';
export { calibrationItems, type CalibrationItem, type CalibrationOptions, type Magnitude } from './calibrationItems';
export { extrapolationWarning, type ExtrapolationWarning } from './extrapolationWarning';
export { estimateRates, type Choice, type EstimateFlag, type EstimateOptions, type RateEstimate, type RateEstimates } from './estimateRates';
// Argument checks shared with lib/criteria, so both halves of the core refuse bad input with the same words.
export { checkDelay, checkInteger, checkLateDelay, checkModel, checkRatio } from './validate';
export * from './power';
export * from './item-bank';
export * from './analysis';
