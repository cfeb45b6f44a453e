// Public face of the results analysis: observed against expected choice patterns, participant-level
// tests, model refits and comparison, and the zone diagnosis (pure: no I/O, seeded randomness).
export type { AnalysisModels, AnalysisPairRole, CalibrationChoice, ModelParameters, ObservedChoice, ObservedOption, ObservedPair, ParticipantData } from './types';
export { ANALYSIS_PAIR_ROLES } from './types';
export { packChoices, choiceLogLikelihood, type FitChoice, type PackedChoices } from './choiceLikelihood';
export { fitModel, FIT_BOUNDS, type FitOptions, type ModelFit, type ParameterEstimate } from './fitModel';
export { participantChoices, pairPattern, type ParticipantChoices } from './participantChoices';
export { refitParticipant, type ModelRefit, type ParticipantRefit, type RefitOptions } from './refitParticipant';
export { pairPatternProbabilities, type PatternCounts } from './patternProbabilities';
export { comparePatterns, type ExpectationSource, type RolePatterns } from './comparePatterns';
export { reversalTests, type ReversalTests, type SignTestResult } from './participantTests';
export { compareModels, type ModelComparison, type ModelSummary } from './compareModels';
export { diagnoseZones, type ParticipantZone, type ZoneDiagnosis, type ZonePosition } from './diagnoseZones';
export { applyExclusions, EXCLUSION_RULES, type ExclusionReport, type ExclusionRuleName, type ExclusionRules } from './applyExclusions';
export { analyseStudy, participantsToAnalyse, type AnalysisOptions, type StudyAnalysis } from './analyseStudy';
export { resultsParagraph, type ResultsContext } from './resultsParagraph';
export { simulateStudy, type SimulatedParticipant, type SimulationOptions } from './simulateStudy';

/** Version of the analysis engine; saved analyses store it so a changed engine is visible. */
export const ANALYSIS_ENGINE_VERSION = '1';
