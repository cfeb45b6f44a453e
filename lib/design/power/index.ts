// Public face of the power simulation (pure: no I/O; randomness from seeded generators).
export { mcnemarExactTest, signTest, binomialTestHalf, type Alternative } from './binomialTest';
export { wilsonInterval } from './wilsonInterval';
export { signFlipTest, SignFlipDistribution } from './signFlipTest';
export { normalQuantile } from './normalQuantile';
export { replicateSeed } from './replicateSeed';
export { sampleSizeFor, type SampleSizeAnswer } from './sampleSizeFor';
export { createPowerSimulator, type PowerSimulator } from './simulatePower';
export { sharedEstimateBuffer, SharedEstimates } from './sharedEstimates';
export { checkScenario, POWER_LIMITS } from './checkScenario';
export { emptyTally, mergeTallies } from './tally';
export { summarisePower, describeModel, type PowerPoint, type PowerSummary, type PowerWarning, type PatternShares } from './summarisePower';
export { methodText, type MethodTextContext } from './methodText';
export { probeSet, type ProbeSet } from './probeSet';
export { calibrationVariant, calibrationLabel } from './calibrationVariant';
export { applyStress, sensitivityModel, describeStress, stressLegend, stressScenarios, STRESS_DEFAULTS, STRESS_KINDS, type StressKind, type StressTruth } from './stressTruth';
export { PAIR_ROLES, POWER_TEST_KINDS, type PairRole, type PowerDesign, type PowerScenario, type PowerTally, type PowerTestKind, type PowerTruth } from './types';

/** Version of the simulation engine; runs store it so a changed engine is visible in their method text. */
export const POWER_ENGINE_VERSION = '1';
