import type { ModelSpec } from '../types';

/** Which block an item belongs to: the first stage (calibration) or the second (probe). */
export type ItemBlock = 'calibration' | 'probe';
/** What an item is for. Pair roles follow docs/mathematics.md; an attention check has a dominated later option. */
export type ItemRole = 'calibration' | 'reversal-probe' | 'late-anchor' | 'soon-anchor' | 'attention-check';
/** Far view: both rewards in the future; near view: the same rewards seen from the soon delay (sooner = today). */
export type ItemView = 'far' | 'near';
/** `shared`: every participant; `personal`: built from one participant's estimates; `fallback`: the documented set for flagged participants. */
export type ItemSet = 'shared' | 'personal' | 'fallback';
export type Side = 'left' | 'right';
/** The unit delays are rounded to and shown in; a month is 30 days. */
export type DelayUnit = 'days' | 'weeks' | 'months';
/** A chosen option in a response. */
export type ChosenOption = 'sooner' | 'later';

/**
 * One item as exported (CSV / JSON) and as served by the probe-items API: the same fields in
 * both. Amounts in the study's currency (rounded to its unit), delays in whole days.
 */
export type BankItem = {
  id: string;
  block: ItemBlock;
  role: ItemRole;
  set: ItemSet;
  /** null for items that are not half of a question pair (calibration items, attention checks) */
  view: ItemView | null;
  pairId: string | null;
  /** the calibration magnitude; null for pairs and checks */
  magnitude: 'small' | 'large' | null;
  soonerAmount: number;
  soonerDelay: number;
  laterAmount: number;
  laterDelay: number;
  soonerSide: Side;
  /** 1-based position within the block */
  position: number;
  text: string;
};

/** The part of a frozen design the item bank reads (structurally a FrozenDesign's spec and prior). */
export type BankDesign = {
  spec: {
    model: ModelSpec;
    ratio: number;
    largeAmount: number;
    currency: string;
    mode: 'personalised' | 'population';
    soonDelay: { mode: 'fixed'; days: number } | { mode: 'optimised'; min: number; max: number };
    lateDelayLimit: number;
    probePairs: number;
    lateAnchors: number;
    soonAnchors: number;
    /** what the probe delays maximise; 'model-discrimination' may put probes outside the reversal zone (pairDelays) */
    criterion?: 'gap-product' | 'expected-reversal-rate' | 'maximin' | 'model-discrimination';
    /** the model-discrimination criterion's reversal weight; absent: 0 */
    reversalWeight?: number;
    calibration: {
      itemsPerMagnitude: number;
      minDelay: number;
      maxDelay: number;
      /** adaptive calibration (adaptive design optimisation); absent: the fixed block */
      adaptive?: { maxItems: number; targetSd: number };
      /** where the fixed block's later delays go (calibrationPlan); absent: 'range' */
      placement?: 'range' | 'span-probes';
      /** the model stage 1 fits (calibrationPlan); absent: 'design-model' */
      fit?: 'design-model' | 'hyperboloid' | 'power-delay' | 'exponential-power';
    };
    /** choice sensitivity γ per unit of the larger amount (designChoiceModel); default DEFAULT_CHOICE_SENSITIVITY */
    choiceSensitivity?: number;
  };
  prior: { medianSmall: number; medianLarge: number; sdLogSmall: number; sdLogLarge: number; correlation: number };
};

/** Rates of one participant (or of the design point), per day. */
export type RatePair = { kSmall: number; kLarge: number };

/** Soon and main late delay of the probe pairs, days (before rounding). */
export type DesignPoint = { soonDelay: number; lateDelay: number };

/**
 * Finds the soon delay and the main probe late delay for given rates (a participant's
 * estimates or the design point); null when no reversal zone fits within the design's limits.
 * Passed in, so the item bank does not depend on which criterion chose the delays.
 */
export type LocatePoint = (rates: RatePair) => DesignPoint | null;

/** Presentation options of an export: rounding unit for delays, wording, ordering. */
export type PresentationOptions = {
  /** seed of the random order and of the sides */
  seed: number;
  /** default 'days' */
  delayUnit?: DelayUnit;
  /** fewest other items between the two views of a pair; default 2 (lowered when a block is too small) */
  minGap?: number;
};
