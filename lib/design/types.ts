/** Published discount functions the core knows (see docs/mathematics.md, "Discount models"). */
export type ModelId =
  | 'exponential'
  | 'hyperbolic'
  | 'hyperboloid'
  | 'power-delay'
  | 'exponential-power'
  | 'quasi-hyperbolic';

/** A discount model with its shape parameters. */
export type ModelSpec = {
  id: ModelId;
  /** delay sensitivity s (hyperboloid, power-delay, exponential-power); default 1 */
  sensitivity?: number;
  /** present bias beta (quasi-hyperbolic); 0 < beta <= 1, default 1 */
  presentBias?: number;
};

/** One person (or one prior point) facing question pairs with a given ratio and soon delay. */
export type PairInput = {
  model: ModelSpec;
  /** magnitude ratio x = S / L, 0 < x < 1 */
  ratio: number;
  /** soon delay d, days */
  soonDelay: number;
  /** discount rate for the small reward, per day */
  kSmall: number;
  /** discount rate for the large reward, per day */
  kLarge: number;
};

/** A question pair: the PairInput plus its late delay D (days, D > d). */
export type QuestionPair = PairInput & { lateDelay: number };

/** A choice pattern: far view first, near view second. */
export type ChoicePattern = 'LL' | 'LS' | 'SL' | 'SS';

export const MODEL_IDS: readonly ModelId[] = [
  'exponential',
  'hyperbolic',
  'hyperboloid',
  'power-delay',
  'exponential-power',
  'quasi-hyperbolic',
];

/** The reversal zone and the late delay (days) inside it with the largest gap product A·B. */
export type LateDelayOptimum = { lower: number; upper: number; lateDelay: number; gapProduct: number };
