import { calibrationItems, type CalibrationItem } from '../calibrationItems';
import { probabilityLarger } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import { estimateRates, type Choice } from '../estimateRates';
import type { RatePrior } from '../ratePrior';
import type { SeededRandom } from '../random';
import type { PowerScenario } from './types';

/** Rates per day the calibration items span: the design prior's medians ± 2.5 SD of ln k, within [1e-6, 10]. */
export function calibrationRateRange(prior: RatePrior): { min: number; max: number } {
  const lows = [Math.log(prior.medianSmall) - 2.5 * prior.sdLogSmall, Math.log(prior.medianLarge) - 2.5 * prior.sdLogLarge];
  const highs = [Math.log(prior.medianSmall) + 2.5 * prior.sdLogSmall, Math.log(prior.medianLarge) + 2.5 * prior.sdLogLarge];
  // at least a factor e either side, so a prior with no spread still gets a graded block
  const min = Math.max(1e-6, Math.exp(Math.min(...lows, Math.log(Math.min(prior.medianSmall, prior.medianLarge)) - 1)));
  const max = Math.min(10, Math.exp(Math.max(...highs, Math.log(Math.max(prior.medianSmall, prior.medianLarge)) + 1)));
  return { min, max };
}

/** One magnitude's share of the calibration block, flattened for the inner loop. */
type Block = { count: number; soonerShare: Float64Array; laterDelay: Float64Array; gamma: number };

export type CalibrationEstimate = { rate: number; flagged: boolean };

/**
 * The simulated calibration block of a scenario: items built under the design's model
 * (calibrationItems: later amounts x·L and L, delays across the design's calibration range,
 * tie rates across calibrationRateRange), choices simulated from the truth, and rates
 * re-estimated by maximum likelihood under the design's model (estimateRates) with the true
 * γ and ε. γ is per unit of the large amount, so a small-magnitude item (later amount x·L)
 * is answered with sensitivity γ·x; estimation uses the same per-item sensitivity.
 *
 * Estimates depend only on a magnitude's response vector, so they are memoised by it: an
 * exact cache of a deterministic function, which keeps results identical with or without it.
 */
export class CalibrationModel {
  readonly items: CalibrationItem[];
  private readonly blocks: [Block, Block];
  private readonly caches: [Map<number, CalibrationEstimate>, Map<number, CalibrationEstimate>] = [new Map(), new Map()];
  private readonly responses: Choice[];

  constructor(private readonly scenario: PowerScenario) {
    const { design, truth } = scenario;
    this.items = calibrationItems({
      model: design.model,
      countPerMagnitude: design.calibration.itemsPerMagnitude,
      delayRange: { min: design.calibration.minDelay, max: design.calibration.maxDelay },
      rateRange: calibrationRateRange(design.prior),
      amounts: { small: design.ratio * design.largeAmount, large: design.largeAmount },
    });
    const block = (magnitude: 'small' | 'large'): Block => {
      const rows = this.items.filter((item) => item.magnitude === magnitude);
      return {
        count: rows.length,
        soonerShare: Float64Array.from(rows, (r) => r.soonerAmount / r.laterAmount),
        laterDelay: Float64Array.from(rows, (r) => r.laterDelay),
        gamma: truth.gamma * (rows[0].laterAmount / design.largeAmount),
      };
    };
    this.blocks = [block('small'), block('large')];
    this.responses = this.items.map(() => 'SS');
  }

  /** Longest later delay of the calibration block, days. */
  get longestDelay(): number {
    return Math.max(...this.items.map((item) => item.laterDelay));
  }

  /** Simulates one magnitude's answers from a true rate (0 = small, 1 = large) and returns the estimate. */
  answer(magnitude: 0 | 1, trueRate: number, random: SeededRandom): CalibrationEstimate {
    const { truth } = this.scenario;
    const block = this.blocks[magnitude];
    const s = truth.model.sensitivity ?? 1;
    const beta = truth.model.presentBias ?? 1;
    let key = 1; // leading 1 keeps vectors of different lengths apart
    for (let i = 0; i < block.count; i++) {
      const gap = discountAt(truth.model.id, trueRate, s, beta, block.laterDelay[i]) - block.soonerShare[i];
      const later = random.uniform() < probabilityLarger(block.gamma, truth.lapse, gap);
      key = key * 2 + (later ? 1 : 0);
    }
    const cache = this.caches[magnitude];
    let estimate = cache.get(key);
    if (estimate === undefined) {
      estimate = this.estimate(magnitude, key);
      if (cache.size < 1_000_000) cache.set(key, estimate);
    }
    return estimate;
  }

  private estimate(magnitude: 0 | 1, key: number): CalibrationEstimate {
    const block = this.blocks[magnitude];
    const name = magnitude === 0 ? 'small' : 'large';
    let bit = block.count - 1;
    for (let i = 0; i < this.items.length; i++) {
      if (this.items[i].magnitude !== name) {
        this.responses[i] = 'SS';
        continue;
      }
      // items of one magnitude are stored in order, so bits are read from the most significant down
      this.responses[i] = Math.floor(key / 2 ** bit) % 2 === 1 ? 'LL' : 'SS';
      bit--;
    }
    const fit = estimateRates(this.responses, this.items, this.scenario.design.model, { sensitivity: block.gamma, lapse: this.scenario.truth.lapse });
    const one = magnitude === 0 ? fit.small : fit.large;
    return { rate: one.rate, flagged: one.flags.length > 0 };
  }
}
