import { designChoiceModel } from '../designChoiceModel';
import { discountAt } from '../discountFactor';
import { calibrationBlock } from '../item-bank/calibrationBlock';
import { amountUnit } from '../item-bank/rounding';
import type { SeededRandom } from '../random';
import { FastRateEstimator } from './fastRateEstimate';
import { LargerChoice } from './largerChoice';
import type { PowerScenario } from './types';

export type CalibrationEstimate = {
  rate: number;
  /** any estimation flag (all one way, a boundary estimate, inconsistent choices) */
  flagged: boolean;
  /** a flag for which the participant is served the fallback set (all-sooner, all-later, non-monotone) */
  fallback: boolean;
};

type Block = { count: number; soonerShare: Float64Array; laterDelay: Float64Array; estimator: FastRateEstimator };

/**
 * The simulated calibration block of a scenario: the item bank's shared calibration block
 * (calibrationBlock: later amounts x·L and L rounded as exported, delays across the design's
 * calibration range widened to cover the design point's pairs), choices simulated from the
 * truth, and each magnitude's rate re-estimated by maximum likelihood under the design's
 * model with the run's γ and ε (per unit of each item's later amount, as estimateRates uses).
 *
 * Estimates depend only on a magnitude's response vector, so they are memoised by it: an
 * exact cache of a deterministic function, which keeps results identical with or without it.
 */
export class CalibrationModel {
  readonly longestDelay: number;
  private readonly blocks: [Block, Block];
  private readonly caches: [Map<number, CalibrationEstimate>, Map<number, CalibrationEstimate>] = [new Map(), new Map()];
  private readonly bits = new Uint8Array(200);
  private readonly choice: LargerChoice;

  constructor(
    private readonly scenario: PowerScenario,
    coverDelay: number,
  ) {
    const { design } = scenario;
    this.choice = new LargerChoice(scenario.truth.gamma, scenario.truth.lapse);
    const choice = designChoiceModel(design.spec);
    const unit = amountUnit({ currency: design.spec.currency, largeAmount: design.spec.largeAmount, smallAmount: design.spec.ratio * design.spec.largeAmount });
    const items = calibrationBlock(design, { amountUnit: unit, delayUnit: 'days', coverDelay }).items.filter((item) => item.role === 'calibration');
    this.longestDelay = Math.max(...items.map((item) => item.laterDelay));
    const block = (magnitude: 'small' | 'large'): Block => {
      const rows = items.filter((item) => item.magnitude === magnitude);
      return {
        count: rows.length,
        soonerShare: Float64Array.from(rows, (r) => r.soonerAmount / r.laterAmount),
        laterDelay: Float64Array.from(rows, (r) => r.laterDelay),
        estimator: new FastRateEstimator(design.spec.model, rows, choice.sensitivity, choice.lapse),
      };
    };
    this.blocks = [block('small'), block('large')];
  }

  /** Both magnitudes' estimates, small first (answer for each in turn, so the draws keep their order). */
  answerBoth(kTrue: number, KTrue: number, s: number, random: SeededRandom): [CalibrationEstimate, CalibrationEstimate] {
    return [this.answer(0, kTrue, s, random), this.answer(1, KTrue, s, random)];
  }

  /**
   * Simulates one magnitude's answers from a true rate (0 = small, 1 = large) and the
   * participant's true delay sensitivity s, and returns the estimate.
   */
  answer(magnitude: 0 | 1, trueRate: number, s: number, random: SeededRandom): CalibrationEstimate {
    const { truth } = this.scenario;
    const block = this.blocks[magnitude];
    const beta = truth.model.presentBias ?? 1;
    const bias = truth.presentBias ?? 1; // every later delay here is > 0
    let key = 1; // a leading 1 keeps the bits readable
    for (let i = 0; i < block.count; i++) {
      const gap = bias * discountAt(truth.model.id, trueRate, s, beta, block.laterDelay[i]) - block.soonerShare[i];
      const later = this.choice.larger(random.uniform(), gap) ? 1 : 0;
      this.bits[i] = later;
      key = key * 2 + later;
    }
    const cache = this.caches[magnitude];
    let estimate = cache.get(key);
    if (estimate === undefined) {
      const fit = block.estimator.estimate(this.bits);
      estimate = {
        rate: fit.rate,
        flagged: fit.flags.length > 0,
        fallback: fit.flags.some((f) => f === 'all-sooner' || f === 'all-later' || f === 'non-monotone'),
      };
      if (cache.size < 1_000_000) cache.set(key, estimate);
    }
    return estimate;
  }
}
