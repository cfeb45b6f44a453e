import { designChoiceModel } from '../designChoiceModel';
import { amountUnit, roundTo } from '../item-bank/rounding';
import type { BankDesign } from '../item-bank/types';
import { AdaptiveCalibration } from './adaptiveCalibration';
import { calibrationCandidates, type AdaptiveCandidate } from './calibrationCandidates';
import { rateGrid, type RateGrid } from './ratePosterior';
import type { AdaptiveStopRule } from './adaptiveStep';

/** Default stop rule of a design's adaptive calibration: 12 items, or posterior SD of ln k and ln K at most 0.3. */
export const DEFAULT_ADAPTIVE_STOP: AdaptiveStopRule = { maxItems: 12, targetSd: 0.3 };

/**
 * The grid of a design's adaptive calibration: rateGrid over the design's prior with 40 nodes per
 * rate axis (±4 prior SDs) and, for models with a delay sensitivity, 10 nodes of ln s around the
 * model's s (SD 0.25 of ln s).
 */
export function adaptiveGrid(design: BankDesign): RateGrid {
  return rateGrid({ model: design.spec.model, prior: design.prior });
}

/**
 * The candidate set of a design's adaptive calibration: calibrationCandidates with the block's
 * later amounts (x·L and L, rounded to the bank's amount unit as the fixed block rounds them),
 * later delays over the design's calibration range widened to `coverDelay` (as the fixed block
 * is), 16 delays × 20 sooner amounts per magnitude.
 */
export function adaptiveCandidates(design: BankDesign, options: { coverDelay: number }): AdaptiveCandidate[] {
  const { spec } = design;
  const unit = amountUnit({ currency: spec.currency, largeAmount: spec.largeAmount, smallAmount: spec.ratio * spec.largeAmount });
  return calibrationCandidates({
    smallAmount: roundTo(spec.ratio * spec.largeAmount, unit),
    largeAmount: roundTo(spec.largeAmount, unit),
    minDelay: spec.calibration.minDelay,
    maxDelay: Math.max(spec.calibration.maxDelay, Math.ceil(options.coverDelay)),
    amountUnit: unit,
  });
}

/** A design's adaptive calibration engine: its grid, candidates and one choice model (designChoiceModel). */
export function designAdaptiveCalibration(design: BankDesign, options: { coverDelay: number }): AdaptiveCalibration {
  return new AdaptiveCalibration({ grid: adaptiveGrid(design), candidates: adaptiveCandidates(design, options), choice: designChoiceModel(design.spec) });
}
