// Public face of the item bank: items built from a frozen design, ordered, counterbalanced,
// rounded, worded; and a participant's personalised probe block.
export type { BankDesign, BankItem, ChosenOption, DelayUnit, DesignPoint, ItemBlock, ItemRole, ItemSet, ItemView, LocatePoint, PresentationOptions, RatePair, Side } from './types';
export { ItemBankInputError } from './ItemBankInputError';
export { amountUnit, minorUnit, roundDelay, roundTo, unitDays } from './rounding';
export { amountText, delayText, itemText } from './wording';
export { orderBlock, meetsGap, maxFeasibleGap, shuffle, type Orderable } from './orderBlock';
export { counterbalancedSides, assembleBlock } from './assembleBlock';
export { pairDelays, pairDelaysAround, type PairDelays, type PairDelaysDesign } from './pairDelays';
export { pairItems, type DraftItem, type PairRoundingEntry } from './pairItems';
export { calibrationBlock, type CalibrationRounding } from './calibrationBlock';
export {
  calibrationPlacement,
  delayLevels,
  describeCalibration,
  REACH_SENSITIVITY,
  probeReach,
  stageOneFit,
  stageOneModel,
  CALIBRATION_PLACEMENTS,
  PROBE_REACH_POINTS,
  PROBE_REACH_QUANTILE,
  STAGE_ONE_FITS,
  type CalibrationPlacement,
  type StageOneFit,
} from './calibrationPlan';
export { fitStageOne, withProbeModel, type AnsweredCalibrationItem, type StageOneSensitivityFit } from './stageOneFit';
export { buildItemBank, DEFAULT_MIN_GAP, type ItemBank, type RoundingReport } from './buildItemBank';
export { serveParticipant, participantSeed, type RateSummary, type ServeFlag, type ServedItems } from './serveParticipant';
export { adaptiveBlock, adaptiveEngine, type AdaptiveBlock } from './adaptiveBlock';
export { nextCalibrationItem, type CalibrationAnswer, type CalibrationStep } from './nextCalibrationItem';
