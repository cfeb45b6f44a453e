// Public face of the design criteria and the population design optimiser.
export { gapProduct } from './gapProduct';
export { expectedReversalRate } from './expectedReversalRate';
export { maximinGap } from './maximinGap';
export { priorScenarios } from './priorScenarios';
export { optimisePopulationDesign, type PopulationCriterion, type PopulationDesign, type PopulationDesignOptions } from './optimisePopulationDesign';
export type { PairSetting } from './pairSetting';
export { expectedRateNodes, EXPECTED_RATE_TARGET } from './expectedRateNodes';
export { modelDiscrimination, DEFAULT_REVERSAL_WEIGHT, RIVAL_MODELS, type Discrimination, type DiscriminationOptions } from './modelDiscrimination';
export { modelRecovery, type ModelRecovery, type ModelRecoveryOptions, type ProbePlacement } from './modelRecovery';
