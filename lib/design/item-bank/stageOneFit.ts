import { fitModel, type ParameterEstimate } from '../analysis/fitModel';
import type { FitChoice } from '../analysis/choiceLikelihood';
import type { ChoiceModel } from '../choiceProbability';
import type { ModelSpec } from '../types';
import { stageOneModel } from './calibrationPlan';
import type { BankDesign, RatePair } from './types';

/** One answered calibration item: sooner amount today against a later amount after laterDelay days. */
export type AnsweredCalibrationItem = { magnitude: 'small' | 'large'; soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number; later: boolean };

/** Stage 1 under a model with a delay sensitivity: k, K and s, and the model the probes are built under. */
export type StageOneSensitivityFit = {
  rates: RatePair;
  /** the stage-1 model with the estimated s: the probes' model */
  model: ModelSpec;
  sensitivity: ParameterEstimate;
  /** the maximised log-likelihood */
  logLikelihood: number;
  converged: boolean;
};

/**
 * The stage-1 fit of a design whose calibration.fit names a model with a delay sensitivity s
 * (calibrationPlan's stageOneModel): maximum likelihood of (ln k, ln K, ln s) jointly over both
 * magnitudes' calibration choices, one s shared by both, under the design's one choice model
 * (fitModel: Newton's method on the analytic observed information; docs/mathematics.md,
 * "Stage 1 with delay sensitivity"). Null when the design fits its own model with s fixed.
 *
 * @throws DesignInputError for a bad design fit, choice model or choice
 */
export function fitStageOne(design: BankDesign, answers: readonly AnsweredCalibrationItem[], choice: ChoiceModel): StageOneSensitivityFit | null {
  const model = stageOneModel(design.spec);
  if (model === null) return null;
  const choices: FitChoice[] = answers.map((a) => ({
    soonerAmount: a.soonerAmount,
    soonerDelay: a.soonerDelay,
    soonerMagnitude: a.magnitude,
    laterAmount: a.laterAmount,
    laterDelay: a.laterDelay,
    laterMagnitude: a.magnitude,
    later: a.later,
  }));
  const fit = fitModel(choices, { model, shape: 'free', choice });
  return {
    rates: { kSmall: fit.parameters.kSmall, kLarge: fit.parameters.kLarge },
    model: { id: model.id, sensitivity: fit.parameters.sensitivity },
    sensitivity: fit.shape!,
    logLikelihood: fit.logLikelihood,
    converged: fit.converged,
  };
}

/** The design as seen by the probe builder once stage 1 has estimated the participant's model. */
export function withProbeModel<T extends BankDesign>(design: T, model: ModelSpec): T {
  return { ...design, spec: { ...design.spec, model } };
}
