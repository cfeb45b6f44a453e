import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { createRandom, type SeededRandom } from '../random';
import { priorPoints } from '../ratePrior';
import { mcnemarExactTest, signTest } from './binomialTest';
import { AdaptiveCalibrationModel } from './adaptiveCalibrationModel';
import { CalibrationModel } from './calibrationModel';
import { checkScenario } from './checkScenario';
import { LargerChoice } from './largerChoice';
import { probeSet, type ProbeSet } from './probeSet';
import { replicateSeed } from './replicateSeed';
import { SignFlipDistribution } from './signFlipTest';
import { emptyTally } from './tally';
import type { PowerScenario, PowerTally } from './types';

/** A prepared simulation: calibration block, fallback set and caches built once, then replicates run in ranges. */
export type PowerSimulator = {
  /** Simulates replicates from (inclusive) to to (exclusive) and returns their tally. */
  run(from: number, to: number): PowerTally;
  /** Longest later delay of the calibration block (days); null when no block is simulated. */
  longestCalibrationDelay: number | null;
};

/**
 * Prepares the power simulation of a two-stage design (docs/mathematics.md, "Power"). Replicate r uses
 * its own generator seeded with replicateSeed(seed, r), so any split of the replicates over
 * worker threads gives the same tallies. Within a replicate the largest sample size is
 * simulated once and each smaller sample size is its first n participants: participants are
 * independent and identically distributed, so a prefix is a valid sample of size n (the
 * sample sizes of one replicate are correlated, which leaves each size's power unbiased).
 *
 * Per participant: true rates from the truth's prior (priorPoints); in a personalised design
 * with a simulated calibration block, calibration choices from the truth and rates
 * re-estimated under the design's model ('adaptive': the design's adaptive calibration simulated,
 * AdaptiveCalibrationModel, posterior medians handed on; with 'known' rates the true rates stand in for the
 * estimates), or, for a design whose stage 1 estimates delay sensitivity, k, K and s under the
 * stage-1 model (CalibrationModel, docs/mathematics.md "Stage 1 with delay sensitivity"); the
 * probe block built from those estimates (probeSet). As the item bank serves
 * them, a population design, a participant flagged all-sooner, all-later or non-monotone, or
 * one with no zone at the estimates gets the fallback set built at the design prior's
 * medians. Every pair's two choices come from the truth: P(LL far) = choice(γ, ε, A) and
 * P(SS near) = choice(γ, ε, B). A stress truth (stressTruth) may draw each participant's delay
 * sensitivity from a range, set K = k, or multiply every delayed value by a present bias β.
 *
 * @param options.sharedEstimates a buffer from sharedEstimateBuffer() given to every thread simulating
 *   this design in one run: calibration estimates are then computed once between the threads
 *   (SharedEstimates); the tallies are the same with or without it
 * @throws DesignInputError for a scenario out of range, or a design whose prior medians have no reversal zone
 */
export function createPowerSimulator(scenario: PowerScenario, options: { sharedEstimates?: SharedArrayBuffer } = {}): PowerSimulator {
  checkScenario(scenario);
  const { design } = scenario;
  const fallback = probeSet(design, design.prior.medianSmall, design.prior.medianLarge, design.designPoint);
  if (fallback === null) {
    throw new DesignInputError('design.prior', 'a prior whose median rates have a reversal zone within the late-delay limit under the design model', design.prior);
  }
  const personal = design.spec.mode === 'personalised';
  const cover = Math.max(...fallback.probe, ...fallback.lateAnchor, ...fallback.soonAnchor);
  const calibration = !personal
    ? null
    : scenario.calibration === 'simulated'
      ? new CalibrationModel(scenario, cover, options.sharedEstimates)
      : scenario.calibration === 'adaptive'
        ? new AdaptiveCalibrationModel(scenario, cover)
        : null;
  const pValues = new Map<number, number>();
  const nMax = scenario.sampleSizes[scenario.sampleSizes.length - 1];
  const signFlip = scenario.test.kind === 'sign-flip' ? new SignFlipDistribution(nMax * Math.max(design.spec.probePairs, fallback.probe.length)) : null;
  const choice = new LargerChoice(scenario.truth.gamma, scenario.truth.lapse);
  return {
    longestCalibrationDelay: calibration ? calibration.longestDelay : null,
    run(from, to) {
      if (!(Number.isSafeInteger(from) && Number.isSafeInteger(to) && 0 <= from && from <= to && to <= scenario.replications)) {
        throw new DesignInputError('to', `replicates within 0 to ${scenario.replications}, from ≤ to`, to);
      }
      const tally = emptyTally(scenario.sampleSizes);
      for (let r = from; r < to; r++) {
        simulateReplicate(scenario, createRandom({ seed: replicateSeed(scenario.seed, r) }), calibration, fallback, pValues, signFlip, choice, tally);
      }
      tally.replicates = to - from;
      return tally;
    },
  };
}

const ROLES = ['probe', 'lateAnchor', 'soonAnchor'] as const;

function simulateReplicate(
  scenario: PowerScenario,
  random: SeededRandom,
  calibration: CalibrationModel | AdaptiveCalibrationModel | null,
  fallback: ProbeSet,
  pValues: Map<number, number>,
  signFlip: SignFlipDistribution | null,
  choice: LargerChoice,
  tally: PowerTally,
): void {
  signFlip?.reset();
  const { design, truth, test } = scenario;
  const sizes = scenario.sampleSizes;
  const nMax = sizes[sizes.length - 1];
  const rates = priorPoints(truth.prior, { method: 'monte-carlo', count: nMax, random });
  const id = truth.model.id;
  const modelS = truth.model.sensitivity ?? 1;
  const beta = truth.model.presentBias ?? 1;
  const bias = truth.presentBias ?? 1;
  const range = truth.sensitivityRange;
  const sameRates = truth.magnitudeEffect === false;
  const x = design.spec.ratio;
  const personal = design.spec.mode === 'personalised';
  // running totals over the participants so far: patterns [role*4 + pattern], then counters
  const patterns = new Float64Array(12);
  let flagged = 0;
  let fallbacks = 0;
  let inZone = 0;
  let positive = 0;
  let negative = 0;
  let checkpoint = 0;
  for (let i = 0; i < nMax; i++) {
    const kTrue = rates.kSmall[i];
    const KTrue = sameRates ? kTrue : rates.kLarge[i];
    const s = range ? range.low + (range.high - range.low) * random.uniform() : modelS;
    let probes = fallback;
    if (personal) {
      let own: ProbeSet | null;
      if (calibration) {
        const [small, large] = calibration.answerBoth(kTrue, KTrue, s, random);
        if (small.flagged || large.flagged) flagged++;
        // adaptive calibration hands on posterior medians under the design model
        own = small.fallback || large.fallback ? null : calibration instanceof CalibrationModel ? calibration.probeSet(small, large) : probeSet(design, small.rate, large.rate);
      } else own = probeSet(design, kTrue, KTrue); // 'known': the true rates stand in for the estimates
      if (own) probes = own;
      else fallbacks++;
    }
    // the fallback set may use the design point's soon delay
    const d = probes === fallback && design.designPoint ? design.designPoint.soonDelay : design.soonDelay;
    // the truth's value of a reward after D days (as a share of its amount); present bias spares D = 0 only
    const farSoon = x * bias * discountAt(id, kTrue, s, beta, d);
    let probeLS = 0;
    let probeSL = 0;
    let anchorLS = 0;
    let anchorPairs = 0;
    for (let role = 0; role < 3; role++) {
      const delays = probes[ROLES[role]];
      for (let j = 0; j < delays.length; j++) {
        const D = delays[j];
        const far = bias * discountAt(id, KTrue, s, beta, D) - farSoon;
        const near = x - bias * discountAt(id, KTrue, s, beta, D - d);
        const farSooner = !choice.larger(random.uniform(), far);
        const nearSooner = choice.larger(random.uniform(), near);
        const pattern = (farSooner ? 2 : 0) + (nearSooner ? 1 : 0); // LL, LS, SL, SS
        patterns[role * 4 + pattern]++;
        if (role === 0) {
          if (D > tally.longestProbeDelay) tally.longestProbeDelay = D;
          if (far > 0 && near > 0) inZone++;
          if (pattern === 1) probeLS++;
          else if (pattern === 2) probeSL++;
        } else {
          anchorPairs++;
          if (pattern === 1) anchorLS++;
        }
      }
    }
    if (signFlip) signFlip.add(probeLS - probeSL);
    else if (test.kind === 'sign') {
      if (probeLS > probeSL) positive++;
      else if (probeLS < probeSL) negative++;
    } else if (test.kind === 'probes-vs-anchors' && anchorPairs > 0) {
      const difference = probeLS / probes.probe.length - anchorLS / anchorPairs;
      if (difference > 0) positive++;
      else if (difference < 0) negative++;
    }
    if (i + 1 === sizes[checkpoint]) {
      const b = test.kind === 'mcnemar' ? patterns[1] : positive;
      const c = test.kind === 'mcnemar' ? patterns[2] : negative;
      const p = signFlip ? signFlip.pValue(test.alternative) : pValue(b, c, test.kind, test.alternative, pValues);
      if (p < test.alpha) tally.rejections[checkpoint]++;
      tally.probeReversals[checkpoint] += patterns[1];
      tally.flagged[checkpoint] += flagged;
      tally.fallback[checkpoint] += fallbacks;
      tally.probesInTrueZone[checkpoint] += inZone;
      for (let role = 0; role < 3; role++) {
        const row = tally.patterns[ROLES[role]][checkpoint];
        for (let p = 0; p < 4; p++) row[p] += patterns[role * 4 + p];
      }
      checkpoint++;
    }
  }
}

function pValue(b: number, c: number, kind: string, alternative: 'greater' | 'two-sided', memo: Map<number, number>): number {
  const key = (b * 4194304 + c) * 2 + (alternative === 'greater' ? 1 : 0);
  let p = memo.get(key);
  if (p === undefined) {
    p = kind === 'mcnemar' ? mcnemarExactTest(b, c, alternative).pValue : signTest(b, c, alternative).pValue;
    if (memo.size < 1_000_000) memo.set(key, p);
  }
  return p;
}
