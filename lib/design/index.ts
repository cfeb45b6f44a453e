// Public face of the numerical core for discount models, reversal zones and item design.
export type { ModelId, ModelSpec, PairInput, QuestionPair, ChoicePattern } from './types';
export { MODEL_IDS } from './types';
export { DesignInputError } from './DesignInputError';
export { discountFactor } from './discountFactor';
export { preferenceGaps, type PreferenceGaps } from './preferenceGaps';
export { predictPattern } from './predictPattern';
export { reversalZone, type ReversalZone } from './reversalZone';
export { optimiseLateDelay, type LateDelayOptimum } from './optimiseLateDelay';
export { anchorDelays, type AnchorOptions, type AnchorPair, type Anchors } from './anchorDelays';
export { findRoot, type RootOptions, type RootResult } from './findRoot';
export { maximiseBrent, type MaximiseOptions, type MaximiseResult } from './maximiseBrent';
export { createRandom, type SeededRandom } from './random';
