// Adaptive calibration: adaptive design optimisation of the calibration block (docs/mathematics.md, "Adaptive calibration").
export { rateGrid, summariseMarginal, MIN_GRID_SD, MAX_GRID_CORRELATION, type RateGrid, type RateGridOptions, type LogSummary } from './ratePosterior';
export { calibrationCandidates, type AdaptiveCandidate, type CandidateOptions } from './calibrationCandidates';
export { AdaptiveCalibration, binaryEntropy, type AdaptiveAnswer, type AdaptiveChoice, type PosteriorSummary } from './adaptiveCalibration';
export { adaptiveStep, checkStopRule, posteriorRates, type AdaptiveStep, type AdaptiveStopRule, type PosteriorRate } from './adaptiveStep';
export { adaptiveGrid, adaptiveCandidates, designAdaptiveCalibration, DEFAULT_ADAPTIVE_STOP } from './designAdaptive';
export { compareCalibration, type CalibrationAccuracy, type CalibrationComparison } from './compareCalibration';
