import type { ChoiceModel } from '../choiceProbability';
import type { ModelId, ModelSpec } from '../types';

/** The option a participant chose on one item; null when the item was served but not answered. */
export type ObservedOption = 'sooner' | 'later' | null;

/** One answered (or unanswered) item: sooner amount after soonerDelay days, or later amount after laterDelay days. */
export type ObservedChoice = {
  itemId: string;
  soonerAmount: number;
  /** days; 0 = today */
  soonerDelay: number;
  laterAmount: number;
  /** days */
  laterDelay: number;
  choice: ObservedOption;
  /** response time in milliseconds, when the lab's software recorded it */
  responseTimeMs?: number | null;
};

/** A calibration item: both amounts are of one magnitude, so one rate values both options. */
export type CalibrationChoice = ObservedChoice & { magnitude: 'small' | 'large' };

/** Pair roles as the item bank names them. */
export type AnalysisPairRole = 'late-anchor' | 'reversal-probe' | 'soon-anchor';
export const ANALYSIS_PAIR_ROLES: readonly AnalysisPairRole[] = ['late-anchor', 'reversal-probe', 'soon-anchor'];

/**
 * A question pair as served: the far view (S after d days or L after D days) and the near view
 * (S today or L after D − d days). The sooner option is the small reward (valued with k), the
 * later option the large reward (valued with K).
 */
export type ObservedPair = { pairId: string; role: AnalysisPairRole; far: ObservedChoice; near: ObservedChoice };

/** One participant's data: calibration choices, stage-2 pairs, the attention check and the serving flag. */
export type ParticipantData = {
  participantId: string;
  calibration: CalibrationChoice[];
  pairs: ObservedPair[];
  attentionCheck: 'passed' | 'failed' | 'not-answered';
  /** why the participant was served the fallback set (flagged estimates or no zone at them); null when not */
  estimateFlag: string | null;
};

/** Parameters of a fitted discount model. */
export type ModelParameters = {
  kSmall: number;
  kLarge: number;
  /** delay sensitivity s (hyperboloid, power-delay, exponential-power); 1 otherwise */
  sensitivity: number;
  /** present bias β (quasi-hyperbolic); 1 otherwise */
  presentBias: number;
};

/** What every analysis function shares: the design's discount model and choice model. */
export type AnalysisModels = {
  /** the frozen design's model (its s or β, when given, are fixed as the design assumed) */
  model: ModelSpec;
  /** the logistic choice model the design assumed (γ per unit of each item's later amount, lapse ε) */
  choice: ChoiceModel;
};

export type { ModelId };
