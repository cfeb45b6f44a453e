import { DesignInputError } from '../DesignInputError';
import { optimiseLateDelay } from '../optimiseLateDelay';
import { createRandom } from '../random';
import { priorPoints } from '../ratePrior';
import type { ModelId, ModelSpec } from '../types';
import { pairDelays } from './pairDelays';
import type { BankDesign } from './types';

/**
 * Where the calibration block puts its later delays: 'range' between the design's shortest and
 * longest calibration delay (widened to the design point's pairs); 'span-probes' in log-spaced
 * delay levels from the shortest calibration delay up to the late delays the probes will use
 * (probeReach), each level asking across the whole range of rates.
 */
export type CalibrationPlacement = 'range' | 'span-probes';
export const CALIBRATION_PLACEMENTS: readonly CalibrationPlacement[] = ['range', 'span-probes'];

/**
 * The model stage 1 fits: 'design-model' estimates k and K with the design model's delay
 * sensitivity held fixed; a model with a delay sensitivity s (hyperboloid, power-delay,
 * exponential-power) estimates k, K and one s shared by both magnitudes, and the probes are
 * then built under that model at the estimates.
 */
export type StageOneFit = 'design-model' | 'hyperboloid' | 'power-delay' | 'exponential-power';
export const STAGE_ONE_FITS: readonly StageOneFit[] = ['design-model', 'hyperboloid', 'power-delay', 'exponential-power'];

/** Share of the prior's participants whose probe late delays the 'span-probes' block reaches. */
export const PROBE_REACH_QUANTILE = 0.95;
/** Prior points probeReach places probes for (seeded, so a design always gets the same block). */
export const PROBE_REACH_POINTS = 400;
const REACH_SEED = 20261203;
/**
 * Delay sensitivities probeReach assumes when stage 1 estimates s: uniform from 0.4 (the low end
 * of the delay-sensitivity stress truth's default, recalled from memory as an ordinary value) to 1.
 */
export const REACH_SENSITIVITY = { low: 0.4, high: 1 } as const;

/** The stage-1 fit a design asks for (absent: the design model). */
export function stageOneFit(spec: BankDesign['spec']): StageOneFit {
  return spec.calibration.fit ?? 'design-model';
}

/**
 * The model whose delay sensitivity stage 1 estimates, or null when stage 1 holds the design
 * model's s fixed. Its s field is the starting value 1.
 */
export function stageOneModel(spec: BankDesign['spec']): ModelSpec | null {
  const fit = stageOneFit(spec);
  if (fit === 'design-model') return null;
  if (!STAGE_ONE_FITS.includes(fit)) throw new DesignInputError('design.calibration.fit', STAGE_ONE_FITS.map((f) => `'${f}'`).join(', '), fit);
  return { id: fit as ModelId, sensitivity: 1 };
}

/** The placement a design asks for (absent: 'range'). */
export function calibrationPlacement(spec: BankDesign['spec']): CalibrationPlacement {
  const placement = spec.calibration.placement ?? 'range';
  if (!CALIBRATION_PLACEMENTS.includes(placement)) throw new DesignInputError('design.calibration.placement', "'range' or 'span-probes'", placement);
  return placement;
}

/**
 * The late delays (days) the design's probe pairs will use across its prior: PROBE_REACH_POINTS
 * rate pairs drawn from the prior (seeded), each person's probes placed as a personalised design
 * places them at those rates (gap-product optimum at soon delay d, pairDelays around it), and the
 * PROBE_REACH_QUANTILE quantile of each person's longest probe late delay. When stage 1 estimates
 * delay sensitivity, each person's probes are placed under the stage-1 model with s drawn from
 * REACH_SENSITIVITY (the probes then follow the person's estimated s). `shortest` is the
 * 5 % quantile of their shortest one. Null when no prior point has a zone within the limit.
 *
 * @throws DesignInputError for a soon delay that is not a finite number of days of at least 0
 */
export function probeReach(design: BankDesign, options: { soonDelay: number }): { shortest: number; longest: number; participants: number } | null {
  const d = options.soonDelay;
  if (!(d >= 0 && d < Infinity)) throw new DesignInputError('soonDelay', 'a finite number of days, 0 or more', d);
  const { spec, prior } = design;
  const random = createRandom({ seed: REACH_SEED });
  const points = priorPoints(prior, { method: 'monte-carlo', count: PROBE_REACH_POINTS, random });
  const estimated = stageOneModel(spec);
  const longest: number[] = [];
  const shortest: number[] = [];
  for (let i = 0; i < PROBE_REACH_POINTS; i++) {
    const rates = { kSmall: points.kSmall[i], kLarge: points.kLarge[i] };
    // with s estimated, the probes follow each person's s: drawn over the range stress truths use, up to 1
    const model: ModelSpec = estimated ? { id: estimated.id, sensitivity: REACH_SENSITIVITY.low + (REACH_SENSITIVITY.high - REACH_SENSITIVITY.low) * random.uniform() } : spec.model;
    const optimum = optimiseLateDelay({ model, ratio: spec.ratio, soonDelay: d, ...rates });
    const delays = optimum && pairDelays(estimated ? { ...design, spec: { ...spec, model } } : design, { soonDelay: d, lateDelay: optimum.lateDelay }, rates);
    if (!delays) continue;
    longest.push(Math.max(...delays.probes));
    shortest.push(Math.min(...delays.probes));
  }
  if (longest.length === 0) return null;
  return { shortest: quantile(shortest, 0.05), longest: quantile(longest, PROBE_REACH_QUANTILE), participants: longest.length };
}

/** The q quantile of values (type 7: linear between order statistics, as R's default). */
function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * Number of delay levels of a 'span-probes' block with n items per magnitude: 3 from 9 items on,
 * else 2 (rule of ours: each level keeps at least 3 items, so each has a switch point of its own).
 */
export function delayLevels(itemsPerMagnitude: number): number {
  return itemsPerMagnitude >= 9 ? 3 : 2;
}

const FIT_NAMES: Record<Exclude<StageOneFit, 'design-model'>, string> = {
  hyperboloid: 'hyperboloid (Myerson & Green 1995)',
  'power-delay': 'power-delay hyperbola (Rachlin 2006)',
  'exponential-power': 'exponential with delay sensitivity (Ebert & Prelec 2007)',
};

/**
 * The calibration options of a design in words, for method paragraphs and export headers: where
 * the later delays go and which model stage 1 fits.
 *
 * @example describeCalibration({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365 } }) // 'later delays from 1 to 365 days (widened to the design point's pairs); stage 1 fits the design model with its delay sensitivity fixed'
 */
export function describeCalibration(spec: { calibration: BankDesign['spec']['calibration'] }): string {
  const c = spec.calibration;
  const placement =
    (c.placement ?? 'range') === 'span-probes'
      ? `later delays from ${c.minDelay} days up to the late delays the probes will use (the longest probe late delay of ${Math.round(PROBE_REACH_QUANTILE * 100)} % of participants drawn from the prior, at least ${c.maxDelay} days), in ${delayLevels(c.itemsPerMagnitude)} log-spaced levels each asking across the rates`
      : `later delays from ${c.minDelay} to ${c.maxDelay} days (widened to the design point's pairs)`;
  const fit = c.fit ?? 'design-model';
  const stage =
    fit === 'design-model'
      ? 'stage 1 fits the design model with its delay sensitivity fixed'
      : `stage 1 fits the ${FIT_NAMES[fit]} by maximum likelihood, estimating one delay sensitivity s with both rates, and the probes are built under that model at the estimates`;
  return `${placement}; ${stage}`;
}
