import type { ModelId } from '../types';
import type { ParticipantRefit } from './refitParticipant';

/** Study-level comparison of one model. */
export type ModelSummary = {
  model: ModelId;
  /** Σ over participants */
  logLikelihood: number;
  aic: number;
  bic: number;
  /** differences from the best (smallest) summed AIC and BIC */
  deltaAic: number;
  deltaBic: number;
  /** participants for whom this model has the smallest AIC / BIC / the highest predictive log score (ties go to the earlier model) */
  bestByAic: number;
  bestByBic: number;
  bestByPrediction: number;
  /** Σ predictive log score of stage-2 choices from calibration-only fits, and per choice */
  predictiveLogScore: number;
  predictiveLogScorePerChoice: number | null;
  /** fits that did not report convergence (full or calibration-only) */
  notConverged: number;
};

export type ModelComparison = {
  models: ModelSummary[];
  /** the model with the smallest summed AIC / BIC / the highest summed predictive log score; null without participants */
  bestByAic: ModelId | null;
  bestByBic: ModelId | null;
  bestByPrediction: ModelId | null;
};

/**
 * Sums each model's log-likelihood, AIC and BIC over participants (independent participants:
 * summed information criteria compare models fitted person by person), counts for how many
 * participants each model wins, and sums the out-of-sample log scores. Fit is judged by AIC
 * (Akaike 1974) and BIC (Schwarz 1978); prediction by the logarithmic score of stage-2 choices
 * from calibration-only fits (Good 1952).
 *
 * @example compareModels([]).models.length // 0
 */
export function compareModels(refits: readonly ParticipantRefit[]): ModelComparison {
  const ids = refits[0]?.models.map((m) => m.model) ?? [];
  const summaries = new Map<ModelId, ModelSummary>(
    ids.map((model) => [model, { model, logLikelihood: 0, aic: 0, bic: 0, deltaAic: 0, deltaBic: 0, bestByAic: 0, bestByBic: 0, bestByPrediction: 0, predictiveLogScore: 0, predictiveLogScorePerChoice: null, notConverged: 0 }]),
  );
  let predicted = 0;
  for (const refit of refits) {
    let aic: ModelId | null = null;
    let bic: ModelId | null = null;
    let prediction: ModelId | null = null;
    const at = (id: ModelId) => refit.models.find((m) => m.model === id)!;
    for (const m of refit.models) {
      const s = summaries.get(m.model);
      if (!s) continue;
      s.logLikelihood += m.full.logLikelihood;
      s.aic += m.full.aic;
      s.bic += m.full.bic;
      s.predictiveLogScore += m.predictiveLogScore;
      if (!m.full.converged || !m.calibrationOnly.converged) s.notConverged++;
      if (aic === null || m.full.aic < at(aic).full.aic) aic = m.model;
      if (bic === null || m.full.bic < at(bic).full.bic) bic = m.model;
      if (m.predictedChoices > 0 && (prediction === null || m.predictiveLogScore > at(prediction).predictiveLogScore)) prediction = m.model;
    }
    predicted += refit.models[0]?.predictedChoices ?? 0;
    if (aic) summaries.get(aic)!.bestByAic++;
    if (bic) summaries.get(bic)!.bestByBic++;
    if (prediction) summaries.get(prediction)!.bestByPrediction++;
  }
  const models = [...summaries.values()];
  const minAic = Math.min(...models.map((m) => m.aic));
  const minBic = Math.min(...models.map((m) => m.bic));
  for (const m of models) {
    m.deltaAic = m.aic - minAic;
    m.deltaBic = m.bic - minBic;
    m.predictiveLogScorePerChoice = predicted > 0 ? m.predictiveLogScore / predicted : null;
  }
  const pick = (better: (a: ModelSummary, b: ModelSummary) => boolean) => models.reduce<ModelSummary | null>((best, m) => (best === null || better(m, best) ? m : best), null)?.model;
  return {
    models,
    bestByAic: pick((a, b) => a.aic < b.aic) ?? null,
    bestByBic: pick((a, b) => a.bic < b.bic) ?? null,
    bestByPrediction: predicted > 0 ? (pick((a, b) => a.predictiveLogScore > b.predictiveLogScore) ?? null) : null,
  };
}
