import { calibrationItems } from '../calibrationItems';
import { calibrationPlacement, delayLevels, probeReach } from './calibrationPlan';
import { indifferenceRate } from '../indifferenceRate';
import type { DraftItem } from './pairItems';
import { roundDelay, roundTo } from './rounding';
import type { BankDesign, DelayUnit } from './types';

/** The calibration block's rounding effect: how far rounding delays moved each item's tie rate. */
export type CalibrationRounding = { itemCount: number; largestRelativeRateChange: number; itemId: string | null };

/**
 * The shared calibration block: calibrationItems for the small reward (later amount S = x·L)
 * and the large reward (later amount L), amounts rounded to `amountUnit`, later delays to whole
 * `delayUnit`s. Target rates span the prior's medians ×/÷ exp(2.5 · max(SD, 0.5)) for both
 * magnitudes (clamped to 1e-5 … 5 per day), and later delays span the design's calibration
 * range, widened to `coverDelay` so the block covers the probe delays. With placement
 * 'span-probes' the longest delay is raised further to the late delays the probes will use
 * across the prior (probeReach at `soonDelay`) and the delays are set in delayLevels(n)
 * log-spaced levels, each asking across the whole rate range (calibrationItems' delayLevels).
 * One attention check (the large amount today vs the small amount later) joins the block.
 *
 * @param options.soonDelay the probe pairs' soon delay, days (needed for 'span-probes'; default
 *   the fixed soon delay, or the shortest of an optimised one, at least 1)
 */
export function calibrationBlock(
  design: BankDesign,
  options: { amountUnit: number; delayUnit: DelayUnit; coverDelay: number; soonDelay?: number },
): { items: DraftItem[]; rounding: CalibrationRounding; probeReach: number | null } {
  const { spec, prior } = design;
  const L = roundTo(spec.largeAmount, options.amountUnit);
  const S = roundTo(spec.ratio * spec.largeAmount, options.amountUnit);
  const widen = (sd: number) => Math.exp(2.5 * Math.max(sd, 0.5));
  const rateMin = Math.max(1e-5, Math.min(prior.medianSmall / widen(prior.sdLogSmall), prior.medianLarge / widen(prior.sdLogLarge)));
  const rateMax = Math.min(5, Math.max(prior.medianSmall * widen(prior.sdLogSmall), prior.medianLarge * widen(prior.sdLogLarge)));
  const span = calibrationPlacement(spec) === 'span-probes';
  const soonDelay = options.soonDelay ?? Math.max(1, spec.soonDelay.mode === 'fixed' ? spec.soonDelay.days : spec.soonDelay.min);
  const reach = span ? probeReach(design, { soonDelay }) : null;
  const maxDelay = Math.max(spec.calibration.maxDelay, Math.ceil(options.coverDelay), reach ? Math.ceil(reach.longest) : 0);
  const raw = calibrationItems({
    model: spec.model,
    countPerMagnitude: spec.calibration.itemsPerMagnitude,
    delayRange: { min: spec.calibration.minDelay, max: maxDelay },
    rateRange: { min: rateMin, max: Math.max(rateMax, rateMin) },
    amounts: { small: S, large: L },
    roundTo: options.amountUnit,
    delayLevels: span ? delayLevels(spec.calibration.itemsPerMagnitude) : 'descending',
  });
  const counters = { small: 0, large: 0 };
  let worst: CalibrationRounding = { itemCount: raw.length, largestRelativeRateChange: 0, itemId: null };
  const items: DraftItem[] = raw.map((item) => {
    counters[item.magnitude] += 1;
    const id = `cal-${item.magnitude}-${String(counters[item.magnitude]).padStart(2, '0')}`;
    const laterDelay = roundDelay(item.laterDelay, options.delayUnit);
    const rounded = indifferenceRate(spec.model, { soonerAmount: item.soonerAmount, laterAmount: item.laterAmount, laterDelay });
    const change = Math.abs(rounded / item.targetRate - 1);
    if (change > worst.largestRelativeRateChange) worst = { ...worst, largestRelativeRateChange: change, itemId: id };
    return {
      id,
      block: 'calibration',
      role: 'calibration',
      set: 'shared',
      view: null,
      pairId: null,
      magnitude: item.magnitude,
      soonerAmount: item.soonerAmount,
      soonerDelay: 0,
      laterAmount: item.laterAmount,
      laterDelay,
    };
  });
  items.push({
    id: 'check-calibration',
    block: 'calibration',
    role: 'attention-check',
    set: 'shared',
    view: null,
    pairId: null,
    magnitude: null,
    soonerAmount: L,
    soonerDelay: 0,
    laterAmount: S,
    laterDelay: roundDelay(Math.max(1, Math.round(maxDelay / 2)), options.delayUnit),
  });
  return { items, rounding: worst, probeReach: reach ? reach.longest : null };
}
