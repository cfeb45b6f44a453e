import { checkChoiceModel } from '../choiceProbability';
import { DesignInputError } from '../DesignInputError';
import { checkModel } from '../validate';
import { MODEL_IDS, type ModelId } from '../types';
import { applyExclusions, type ExclusionReport, type ExclusionRules } from './applyExclusions';
import { compareModels, type ModelComparison } from './compareModels';
import { comparePatterns, type RolePatterns } from './comparePatterns';
import { diagnoseZones, type ZoneDiagnosis } from './diagnoseZones';
import { reversalTests, type ReversalTests } from './participantTests';
import { refitParticipant, type ParticipantRefit } from './refitParticipant';
import type { AnalysisModels, ParticipantData } from './types';

export type AnalysisOptions = AnalysisModels & {
  exclusions: ExclusionRules;
  /** alternative of every test; 'greater' = more LS than SL */
  alternative: 'two-sided' | 'greater';
  /** significance level the paragraph reads p-values against; default 0.05 */
  alpha?: number;
  /** the model whose refitted zones are diagnosed: a model id, or the best by summed 'aic' / 'bic'; default 'bic' */
  zoneModel?: ModelId | 'aic' | 'bic';
  /** confidence of the parameter intervals; default 0.95 */
  confidence?: number;
  /** precomputed refits of the kept participants (e.g. from worker threads), in their order */
  refits?: readonly ParticipantRefit[];
};

export type StudyAnalysis = {
  participantsTotal: number;
  participantsAnalysed: number;
  exclusions: Omit<ExclusionReport, 'kept'>;
  patterns: RolePatterns[];
  tests: ReversalTests;
  alpha: number;
  refits: ParticipantRefit[];
  comparison: ModelComparison;
  zones: ZoneDiagnosis | null;
  options: { model: AnalysisModels['model']; choice: AnalysisModels['choice']; alternative: 'two-sided' | 'greater'; zoneModel: ModelId | null; confidence: number };
};

const madeCalibrationChoice = (p: ParticipantData) => p.calibration.some((c) => c.choice !== null);

/**
 * The participants an analysis refits and tests, in their order: those the exclusion rules keep
 * who made at least one calibration choice. Whoever refits them elsewhere (on worker processes)
 * passes the refits back as `options.refits`.
 *
 * @example participantsToAnalyse([], rules) // → [] (no participants)
 */
export function participantsToAnalyse(participants: readonly ParticipantData[], exclusions: AnalysisOptions['exclusions']): ParticipantData[] {
  return applyExclusions(participants, exclusions).kept.filter(madeCalibrationChoice);
}

/**
 * The whole analysis of a completed study, in the order a results section reports it:
 * exclusions (applyExclusions), observed against expected patterns per pair role
 * (comparePatterns), the participant-level tests with the pooled McNemar test as secondary
 * (reversalTests), every participant refitted under every model with AIC, BIC and
 * out-of-sample log scores (refitParticipant, compareModels), and the zone diagnosis under the
 * chosen model (diagnoseZones). Estimates describe hypothetical choices, not a clinical
 * assessment of anyone.
 *
 * @throws DesignInputError for bad options (fields `model`, `choice`, `alternative`, `alpha`, `zoneModel`, `rules.…`) or bad participant data
 */
export function analyseStudy(participants: readonly ParticipantData[], options: AnalysisOptions): StudyAnalysis {
  checkModel(options.model);
  checkChoiceModel(options.choice);
  const alpha = options.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1)) throw new DesignInputError('alpha', 'a number strictly between 0 and 1', alpha);
  const zoneChoice = options.zoneModel ?? 'bic';
  if (zoneChoice !== 'aic' && zoneChoice !== 'bic' && !MODEL_IDS.includes(zoneChoice)) throw new DesignInputError('zoneModel', `'aic', 'bic' or one of ${MODEL_IDS.join(', ')}`, zoneChoice);
  const confidence = options.confidence ?? 0.95;
  const exclusion = applyExclusions(participants, options.exclusions);
  const kept = exclusion.kept.filter(madeCalibrationChoice);
  const refits = options.refits ? [...options.refits] : kept.map((p) => refitParticipant(p, { model: options.model, choice: options.choice, confidence }));
  const tests = reversalTests(kept, { alternative: options.alternative });
  const comparison = compareModels(refits);
  const zoneModel = zoneChoice === 'aic' ? comparison.bestByAic : zoneChoice === 'bic' ? comparison.bestByBic : zoneChoice;
  const { kept: _omit, ...exclusions } = exclusion;
  void _omit;
  return {
    participantsTotal: participants.length,
    participantsAnalysed: kept.length,
    exclusions,
    patterns: comparePatterns(kept, refits, options.choice),
    tests,
    alpha,
    refits,
    comparison,
    zones: zoneModel === null ? null : diagnoseZones(kept, refits, { model: zoneModel }),
    options: { model: options.model, choice: options.choice, alternative: options.alternative, zoneModel, confidence },
  };
}
