import type { ChoicePattern, ModelSpec } from '@/lib/design';
import type { DesignSpec, PriorValues } from '@/lib/shared/validations/planner';

/** The γ every part of the app assumes when a design does not set one (lib/design/designChoiceModel). */
export { DEFAULT_CHOICE_SENSITIVITY } from '@/lib/design/designChoiceModel';
/** Monte Carlo draws behind the charts and the spread of zone bounds. */
export const PRIOR_DRAWS = 2000;
/** Fixed seed, so the browser and the server draw the same points. */
export const PRIOR_SEED = 20260;

/** What the planner computes from: a design's settings and its prior's values. */
export type PlannerInput = {
  spec: Pick<DesignSpec, 'model' | 'ratio' | 'mode' | 'soonDelay' | 'lateDelayLimit' | 'probePairs' | 'lateAnchors' | 'soonAnchors' | 'criterion' | 'calibration' | 'largeAmount' | 'choiceSensitivity' | 'reversalWeight'>;
  prior: PriorValues;
};

export type PatternShares = Record<ChoicePattern, number>;
export type PairRole = 'late-anchor' | 'probe' | 'soon-anchor';

export type RoleSummary = {
  role: PairRole;
  /** pairs of this role per participant */
  count: number;
  /** late delay of the pair for the typical participant (personalised) or for everyone (population), days */
  lateDelay: number | null;
  /** expected share of each choice pattern over the prior, under the choice model */
  shares: PatternShares | null;
};

export type Quantiles = { p10: number; p50: number; p90: number };

export type PlannerWarning = { kind: 'extrapolation' | 'empty-zone' | 'limit' | 'no-room' | 'model' | 'accuracy'; message: string };

export type DesignSummary = {
  mode: DesignSpec['mode'];
  criterion: DesignSpec['criterion'];
  model: ModelSpec;
  choiceSensitivity: number;
  /** the soon delay used (fixed, or the optimum within bounds), days */
  soonDelay: number;
  /** the prior's median rates (per day) and what they imply */
  typical: {
    kSmall: number;
    kLarge: number;
    zone: { lower: number; upper: number } | null;
    optimum: { lateDelay: number; gapProduct: number } | null;
    lateAnchor: { lateDelay: number; clarity: number; reachesTarget: boolean } | null;
    soonAnchor: { lateDelay: number; clarity: number; reachesTarget: boolean } | null;
  };
  /** the criterion being maximised, at the chosen delays */
  criterionValue: number | null;
  /** E[P(LL far)·P(SS near)] at the probe pairs, under the design's own model */
  expectedReversalRate: number;
  /** share of the prior whose rates allow a reversal at this ratio and soon delay */
  reversibleShare: number;
  /** spread of the zone bounds over the prior's draws that can reverse */
  boundSpread: { draws: number; withZone: number; lower: Quantiles | null; upper: Quantiles | null; beyondLimit: number } | null;
  roles: RoleSummary[];
  valueCurve: ValueCurve | null;
  gapCurve: GapCurve | null;
  warnings: PlannerWarning[];
};

/** Discounted values (in the currency) of both rewards against the standing day, for the typical participant's probe pair. */
export type ValueCurve = { soonDelay: number; lateDelay: number; days: number[]; small: number[]; large: number[]; crossing: number | null };
/** Gap product C(D) of the typical participant against the late delay (days). */
export type GapCurve = { lateDelays: number[]; values: number[]; optimum: { lateDelay: number; gapProduct: number } | null; zone: { lower: number; upper: number } | null };
