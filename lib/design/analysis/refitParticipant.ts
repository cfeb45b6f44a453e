import type { ChoiceModel } from '../choiceProbability';
import { MODEL_IDS, type ModelId, type ModelSpec } from '../types';
import { choiceLogLikelihood, packChoices, type Theta } from './choiceLikelihood';
import { fitModel, type ModelFit } from './fitModel';
import { participantChoices } from './participantChoices';
import type { ModelParameters, ParticipantData } from './types';

/** One model refitted to one participant. */
export type ModelRefit = {
  model: ModelId;
  /** fit to calibration and stage-2 choices together */
  full: ModelFit;
  /** fit to the calibration choices alone */
  calibrationOnly: ModelFit;
  /** Σ ln P(observed stage-2 choice) under the calibration-only fit (a logarithmic score; higher is better); 0 without stage-2 choices */
  predictiveLogScore: number;
  /** stage-2 choices predicted */
  predictedChoices: number;
};

/** Every model refitted to one participant, and the design's own calibration estimate. */
export type ParticipantRefit = {
  participantId: string;
  models: ModelRefit[];
  /** calibration-only fit under the design's model with its shape held as the design assumed (what serving estimated) */
  design: ModelFit;
};

export type RefitOptions = {
  /** the design's model (its s or β held fixed for the `design` fit) */
  model: ModelSpec;
  /** the logistic choice model, γ and ε held fixed in every fit */
  choice: ChoiceModel;
  /** which models to refit; default all six */
  models?: readonly ModelId[];
  /** confidence of the Wald intervals; default 0.95 */
  confidence?: number;
};

/**
 * Refits one participant under every model (fitModel: k, K, and s or β where the model has
 * them), once on calibration plus stage-2 choices and once on calibration choices alone, and
 * scores how well the calibration-only fit predicts the stage-2 choices (the logarithmic
 * scoring rule, Good 1952, J R Stat Soc B 14:107–114): the out-of-sample check of which model
 * predicted the reversals, not only which fits best. The full fit climbs from the
 * calibration-only estimate and from the best grid start.
 *
 * @throws DesignInputError for bad models, choice model or choices, or a participant without calibration choices
 */
export function refitParticipant(participant: ParticipantData, options: RefitOptions): ParticipantRefit {
  const { calibration, stage2 } = participantChoices(participant);
  const calibrationData = packChoices(calibration);
  const stage2Data = packChoices(stage2);
  const allData = packChoices([...calibration, ...stage2]);
  const base = { choice: options.choice, confidence: options.confidence };
  const models = (options.models ?? MODEL_IDS).map((id): ModelRefit => {
    const calibrationOnly = fitModel(calibrationData, { ...base, model: { id } });
    const full = stage2.length === 0 ? calibrationOnly : fitModel(allData, { ...base, model: { id }, start: calibrationOnly.parameters, gridStarts: 1 });
    const predictiveLogScore = stage2.length === 0 ? 0 : choiceLogLikelihood(id, stage2Data, thetaOf(id, calibrationOnly.parameters), options.choice.sensitivity, options.choice.lapse ?? 0);
    return { model: id, full, calibrationOnly, predictiveLogScore, predictedChoices: stage2.length };
  });
  // a design model without a shape parameter is the same fit as that model's calibration-only one
  const same = options.model.id === 'exponential' || options.model.id === 'hyperbolic' ? models.find((m) => m.model === options.model.id) : undefined;
  const design = same ? same.calibrationOnly : fitModel(calibrationData, { ...base, model: options.model, shape: 'fixed' });
  return { participantId: participant.participantId, models, design };
}

/** Parameters on the likelihood's scale (ln k, ln K, ln s | ln β | 0). */
export function thetaOf(id: ModelId, p: ModelParameters): Theta {
  const shape = id === 'quasi-hyperbolic' ? p.presentBias : id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power' ? p.sensitivity : 1;
  return [Math.log(p.kSmall), Math.log(p.kLarge), Math.log(shape)];
}
