import type { BankDesign } from '../item-bank/types';
import type { RatePrior } from '../ratePrior';
import type { ModelSpec } from '../types';
import type { Alternative } from './binomialTest';

/**
 * The test a replicate runs on its simulated choices. 'sign', 'sign-flip' and
 * 'probes-vs-anchors' take the participant as the unit; 'mcnemar' pools every probe pair of
 * every participant and so assumes the pairs are independent (stored runs keep this name).
 */
export type PowerTestKind = 'mcnemar' | 'sign' | 'sign-flip' | 'probes-vs-anchors';
export const POWER_TEST_KINDS: readonly PowerTestKind[] = ['sign', 'sign-flip', 'probes-vs-anchors', 'mcnemar'];

/** Pair roles in the probe block. */
export type PairRole = 'probe' | 'lateAnchor' | 'soonAnchor';
export const PAIR_ROLES: readonly PairRole[] = ['probe', 'lateAnchor', 'soonAnchor'];

/**
 * The frozen design as the simulation sees it: the item bank's view of a frozen design (spec
 * and prior, structurally a FrozenDesign) and the soon delay the probe pairs use.
 */
export type PowerDesign = BankDesign & {
  /** soon delay d of the probe pairs, days (> 0): the fixed one, or the one chosen for the prior medians */
  soonDelay: number;
  /**
   * The design point of the fallback set (population designs: the shared set), as the item bank
   * locates it; default the late delay with the largest gap product at the prior medians.
   */
  designPoint?: { soonDelay: number; lateDelay: number };
};

/** The simulated truth: how the simulated participants really choose. */
export type PowerTruth = {
  model: ModelSpec;
  prior: RatePrior;
  /** logistic choice sensitivity γ per unit of the large amount */
  gamma: number;
  /** lapse rate ε */
  lapse: number;
  /** stress: each participant's delay sensitivity s drawn uniformly from [low, high] instead of the model's s */
  sensitivityRange?: { low: number; high: number };
  /** stress: false makes each participant discount the large reward at their small-reward rate (K = k) */
  magnitudeEffect?: boolean;
  /** stress: present bias β (0 < β < 1) multiplying every delayed value of the model, on top of it */
  presentBias?: number;
};

/** Everything one power simulation needs (pure data; the app stores it with the run). */
export type PowerScenario = {
  design: PowerDesign;
  truth: PowerTruth;
  /**
   * 'simulated': the fixed calibration block's choices are simulated and rates re-estimated;
   * 'adaptive': adaptive calibration is simulated (the design's stop rule, else 12 items / SD 0.3);
   * 'known': probes use the true rates
   */
  calibration: 'simulated' | 'adaptive' | 'known';
  test: { kind: PowerTestKind; alpha: number; alternative: Extract<Alternative, 'two-sided' | 'greater'> };
  /** participants per simulated study, ascending, distinct */
  sampleSizes: number[];
  replications: number;
  seed: number;
};

/**
 * Integer counts per sample size, summed over replicates. Counts add up exactly, so tallies of
 * chunks merge to the same totals in any order: the result does not depend on how the
 * replicates were split between worker threads.
 */
export type PowerTally = {
  sampleSizes: number[];
  replicates: number;
  /** per sample size: replicates with p < α */
  rejections: number[];
  /** per sample size: LS patterns among probe pairs, summed over participants and replicates */
  probeReversals: number[];
  /** per sample size and role: counts of LL, LS, SL, SS (index 0–3) */
  patterns: Record<PairRole, number[][]>;
  /** per sample size: participants whose rate estimates carried a flag */
  flagged: number[];
  /** per sample size: participants served the fallback set (flagged estimates or no zone at them) */
  fallback: number[];
  /** per sample size: probe pairs whose late delay lies inside the participant's true reversal zone */
  probesInTrueZone: number[];
  /** longest probe late delay in any replicate, days */
  longestProbeDelay: number;
};
