import { designChoiceModel } from '../designChoiceModel';
import { discountAt } from '../discountFactor';
import { calibrationBlock } from '../item-bank/calibrationBlock';
import { stageOneModel } from '../item-bank/calibrationPlan';
import { amountUnit } from '../item-bank/rounding';
import type { SeededRandom } from '../random';
import { FastRateEstimator } from './fastRateEstimate';
import { SHARED_MAX_ITEMS, SharedEstimates } from './sharedEstimates';
import { LargerChoice } from './largerChoice';
import { probeSet, type ProbeSet } from './probeSet';
import { jointSensitivityEstimate, SensitivityProfile } from './sensitivityProfile';
import type { PowerDesign, PowerScenario } from './types';

export type CalibrationEstimate = {
  rate: number;
  /** any estimation flag (all one way, a boundary estimate, inconsistent choices) */
  flagged: boolean;
  /** a flag for which the participant is served the fallback set (all-sooner, all-later, non-monotone) */
  fallback: boolean;
  /** the magnitude's response vector as a number (a leading 1, then one bit per item, 1 = later); absent from adaptive calibration */
  key?: number;
  /** the profile over delay sensitivity (SensitivityProfile) when stage 1 estimates s; else null or absent */
  profile?: Float64Array | null;
};

type Block = { count: number; soonerShare: Float64Array; laterDelay: Float64Array; estimator: FastRateEstimator; profile: SensitivityProfile | null };

const CACHE_LIMIT = 1_000_000;

/**
 * What the simulated calibration of one design shares between the truths of a run: the block,
 * the estimators and the memo of estimates by response vector. None of it depends
 * on the truth (an estimate is a function of the answers and the design), so the assumed truth and
 * every stress truth reuse it: a response vector met under one truth is estimated once. (Probe sets
 * are not memoised: pairs of response vectors rarely repeat, and a memo of them cost more time in
 * memory than it saved.)
 */
class CalibrationCore {
  readonly longestDelay: number;
  readonly blocks: [Block, Block];
  /** whether both magnitudes' blocks ask about the same later delays, in the same order */
  readonly sameDelays: boolean;
  readonly caches: [Map<number, CalibrationEstimate>, Map<number, CalibrationEstimate>] = [new Map(), new Map()];
  /** the current run's estimates shared with the other threads (null: this thread's caches only) */
  shared: SharedEstimates | null = null;
  private readonly design: PowerDesign;

  constructor(design: PowerDesign, coverDelay: number) {
    this.design = design;
    const choice = designChoiceModel(design.spec);
    const stageOne = stageOneModel(design.spec);
    const unit = amountUnit({ currency: design.spec.currency, largeAmount: design.spec.largeAmount, smallAmount: design.spec.ratio * design.spec.largeAmount });
    const items = calibrationBlock(design, { amountUnit: unit, delayUnit: 'days', coverDelay, soonDelay: design.soonDelay }).items.filter((item) => item.role === 'calibration');
    this.longestDelay = Math.max(...items.map((item) => item.laterDelay));
    const block = (magnitude: 'small' | 'large'): Block => {
      const rows = items.filter((item) => item.magnitude === magnitude);
      return {
        count: rows.length,
        soonerShare: Float64Array.from(rows, (r) => r.soonerAmount / r.laterAmount),
        laterDelay: Float64Array.from(rows, (r) => r.laterDelay),
        estimator: new FastRateEstimator(design.spec.model, rows, choice.sensitivity, choice.lapse),
        profile: stageOne ? new SensitivityProfile(stageOne.id, rows, choice.sensitivity, choice.lapse) : null,
      };
    };
    this.blocks = [block('small'), block('large')];
    const [small, large] = this.blocks;
    this.sameDelays = small.count === large.count && small.laterDelay.every((delay, i) => delay === large.laterDelay[i]);
  }

  /**
   * The probe set of a participant with these two estimates (null: no zone at them): under the
   * design model at (k̂, K̂), or, when stage 1 estimates s, under the stage-1 model at the joint
   * (k̂, K̂, ŝ) with the late delay of the largest gap product at the design's soon delay.
   */
  probeSet(small: CalibrationEstimate, large: CalibrationEstimate): ProbeSet | null {
    const { design } = this;
    if (!small.profile || !large.profile) return probeSet(design, small.rate, large.rate);
    const joint = jointSensitivityEstimate(small.profile, large.profile);
    const model = { id: stageOneModel(design.spec)!.id, sensitivity: joint.sensitivity };
    return probeSet({ ...design, spec: { ...design.spec, model } }, joint.kSmall, joint.kLarge);
  }
}

// Cores of the designs simulated lately, by content: a worker thread receives each scenario of a
// run as its own copy, so identity cannot tell that two truths share a design.
const cores = new Map<string, CalibrationCore>();
const CORE_LIMIT = 4;

function coreFor(design: PowerDesign, coverDelay: number): CalibrationCore {
  const key = JSON.stringify([design.spec, design.prior, design.soonDelay, design.designPoint ?? null, coverDelay]);
  let core = cores.get(key);
  if (core === undefined) {
    core = new CalibrationCore(design, coverDelay);
    if (cores.size >= CORE_LIMIT) cores.delete(cores.keys().next().value!);
    cores.set(key, core);
  }
  return core;
}

/**
 * The simulated calibration block of a scenario: the item bank's shared calibration block
 * (calibrationBlock: later amounts x·L and L rounded as exported, delays across the design's
 * calibration range widened to cover the design point's pairs, or spanning the probes' late
 * delays), choices simulated from the truth, and each magnitude's rate re-estimated by maximum
 * likelihood under the design's model with the design's γ and ε (per unit of each item's later
 * amount, as estimateRates uses); with a stage-1 fit that estimates delay sensitivity, the
 * profile over s as well (SensitivityProfile).
 *
 * Estimates depend only on a magnitude's response vector, so they are memoised by it, across the
 * truths of a run too (CalibrationCore): an exact cache of a deterministic function, which keeps
 * results identical with or without it. Given a run's shared table (SharedEstimates), the memo is
 * that table while it has room, shared with the run's other threads; otherwise a Map per magnitude.
 */
export class CalibrationModel {
  readonly longestDelay: number;
  private readonly core: CalibrationCore;
  private readonly bits = new Uint8Array(200);
  private readonly choice: LargerChoice;
  // D^s of each block's later delays at the s they were last computed for (power-delay and
  // exponential-power truths): both magnitudes share them when their delays are the same
  private readonly powers: [Float64Array, Float64Array] = [new Float64Array(200), new Float64Array(200)];
  private readonly powersAt = [NaN, NaN];

  constructor(
    private readonly scenario: PowerScenario,
    coverDelay: number,
    sharedEstimates?: SharedArrayBuffer,
  ) {
    this.core = coreFor(scenario.design, coverDelay);
    // the run's shared table, when its keys fit (a leading 1 and one bit per item) and no profile over s is kept
    const fits = Math.max(this.core.blocks[0].count, this.core.blocks[1].count) <= SHARED_MAX_ITEMS;
    if (sharedEstimates && fits && !this.core.blocks[0].profile) this.core.shared = new SharedEstimates(sharedEstimates);
    this.choice = new LargerChoice(scenario.truth.gamma, scenario.truth.lapse);
    this.longestDelay = this.core.longestDelay;
  }

  /**
   * Simulates one magnitude's answers from a true rate (0 = small, 1 = large) and the
   * participant's true delay sensitivity s, and returns the estimate.
   */
  answer(magnitude: 0 | 1, trueRate: number, s: number, random: SeededRandom): CalibrationEstimate {
    const { truth } = this.scenario;
    const block = this.core.blocks[magnitude];
    const beta = truth.model.presentBias ?? 1;
    const bias = truth.presentBias ?? 1; // every later delay here is > 0
    const id = truth.model.id;
    // power-delay and exponential-power: discountAt's forms written out over D^s computed once per s
    // (the same numbers); every other model through discountAt
    const powers = id === 'power-delay' || id === 'exponential-power' ? this.powersOf(magnitude, s) : null;
    let key = 1; // a leading 1 keeps the bits readable
    for (let i = 0; i < block.count; i++) {
      const f =
        powers === null
          ? discountAt(id, trueRate, s, beta, block.laterDelay[i])
          : id === 'power-delay'
            ? 1 / (1 + trueRate * powers[i])
            : Math.exp(-trueRate * powers[i]);
      const later = this.choice.larger(random.uniform(), bias * f - block.soonerShare[i]) ? 1 : 0;
      this.bits[i] = later;
      key = key * 2 + later;
    }
    const shared = this.core.shared;
    if (shared !== null) {
      // the run's shared table is the memo while it has room: flat arrays, a fraction of a Map's memory
      const at = shared.find(magnitude, key);
      if (at >= 0) return { rate: shared.rateAt(at), flagged: shared.flaggedAt(at), fallback: shared.fallbackAt(at), key, profile: null };
      if (!shared.full(magnitude)) {
        const estimate = this.estimate(block, key);
        shared.store(magnitude, key, estimate.rate, estimate.flagged, estimate.fallback);
        return estimate;
      }
    }
    const cache = this.core.caches[magnitude];
    let estimate = cache.get(key);
    if (estimate === undefined) {
      estimate = this.estimate(block, key);
      if (cache.size < CACHE_LIMIT) cache.set(key, estimate);
    }
    return estimate;
  }

  /** The estimate of the response vector in `bits` (its number is `key`). */
  private estimate(block: Block, key: number): CalibrationEstimate {
    const fit = block.estimator.estimate(this.bits);
    return {
      rate: fit.rate,
      flagged: fit.flags.length > 0,
      fallback: fit.flags.some((f) => f === 'all-sooner' || f === 'all-later' || f === 'non-monotone'),
      key,
      profile: block.profile ? block.profile.profile(this.bits) : null,
    };
  }

  /** D^s for the later delays of a magnitude's block, computed again only when s changes. */
  private powersOf(magnitude: 0 | 1, s: number): Float64Array {
    const slot = this.core.sameDelays ? 0 : magnitude;
    const powers = this.powers[slot];
    if (this.powersAt[slot] !== s) {
      const { count, laterDelay } = this.core.blocks[magnitude];
      for (let i = 0; i < count; i++) powers[i] = Math.pow(laterDelay[i], s);
      this.powersAt[slot] = s;
    }
    return powers;
  }

  /** Both magnitudes' estimates, small first (answer for each in turn, so the draws keep their order). */
  answerBoth(kTrue: number, KTrue: number, s: number, random: SeededRandom): [CalibrationEstimate, CalibrationEstimate] {
    return [this.answer(0, kTrue, s, random), this.answer(1, KTrue, s, random)];
  }

  /** The participant's probe set from the two magnitudes' estimates (CalibrationCore.probeSet). */
  probeSet(small: CalibrationEstimate, large: CalibrationEstimate): ProbeSet | null {
    return this.core.probeSet(small, large);
  }
}
