import { probabilityLarger } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { createRandom, type SeededRandom } from '../random';
import { priorPoints } from '../ratePrior';
import { mcnemarExactTest, signTest } from './binomialTest';
import { CalibrationModel } from './calibrationModel';
import { checkScenario } from './checkScenario';
import { probeSet, type ProbeSet } from './probeSet';
import { replicateSeed } from './replicateSeed';
import { emptyTally } from './tally';
import type { PairRole, PowerScenario, PowerTally } from './types';

/** A prepared simulation: calibration block, fallback probes and caches built once, then replicates run in ranges. */
export type PowerSimulator = {
  /** Simulates replicates from (inclusive) to to (exclusive) and returns their tally. */
  run(from: number, to: number): PowerTally;
  /** Longest later delay of the calibration block (days); null when no block is simulated. */
  longestCalibrationDelay: number | null;
};

/**
 * Prepares the power simulation of a two-stage design (DESIGN.md, "Power"). Replicate r uses
 * its own generator seeded with replicateSeed(seed, r), so any split of the replicates over
 * worker threads gives the same tallies. Within a replicate the largest sample size is
 * simulated once and each smaller sample size is its first n participants: participants are
 * independent and identically distributed, so a prefix is a valid sample of size n (the
 * sample sizes of one replicate are correlated, which leaves each size's power unbiased).
 *
 * Per participant: true rates from the truth's prior; in a personalised design with a
 * simulated calibration block, calibration choices from the truth and rates re-estimated under
 * the design's model (with 'known' rates the true rates stand in for the estimates); the probe
 * block built from those rates (probeSet); a population design, or a participant with no zone
 * at the estimates, gets the probe block of the design prior's medians. Every pair's two
 * choices come from the truth: P(LL far) = choice(γ, ε, A), P(SS near) = choice(γ, ε, B).
 *
 * @throws DesignInputError for a scenario out of range, or a design whose prior medians have no reversal zone
 */
export function createPowerSimulator(scenario: PowerScenario): PowerSimulator {
  checkScenario(scenario);
  const { design } = scenario;
  const fallback = probeSet(design.model, design.ratio, design.soonDelay, design.lateDelayLimit, design.prior.medianSmall, design.prior.medianLarge);
  if (fallback === null) {
    throw new DesignInputError('design.prior', 'a prior whose median rates have a reversal zone under the design model', design.prior);
  }
  const personal = design.mode === 'personalised';
  const calibration = personal && scenario.calibration === 'simulated' ? new CalibrationModel(scenario) : null;
  const pValues = new Map<number, number>();
  return {
    longestCalibrationDelay: calibration ? calibration.longestDelay : null,
    run(from, to) {
      if (!(Number.isSafeInteger(from) && Number.isSafeInteger(to) && 0 <= from && from <= to && to <= scenario.replications)) {
        throw new DesignInputError('to', `replicates within 0 to ${scenario.replications}, from ≤ to`, to);
      }
      const tally = emptyTally(scenario.sampleSizes);
      for (let r = from; r < to; r++) {
        simulateReplicate(scenario, createRandom({ seed: replicateSeed(scenario.seed, r) }), calibration, fallback, pValues, tally);
      }
      tally.replicates = to - from;
      return tally;
    },
  };
}

const ROLE_INDEX: Record<PairRole, number> = { probe: 0, lateAnchor: 1, soonAnchor: 2 };

function simulateReplicate(
  scenario: PowerScenario,
  random: SeededRandom,
  calibration: CalibrationModel | null,
  fallback: ProbeSet,
  pValues: Map<number, number>,
  tally: PowerTally,
): void {
  const { design, truth, test } = scenario;
  const sizes = scenario.sampleSizes;
  const nMax = sizes[sizes.length - 1];
  const rates = priorPoints(truth.prior, { method: 'monte-carlo', count: nMax, random });
  const id = truth.model.id;
  const s = truth.model.sensitivity ?? 1;
  const beta = truth.model.presentBias ?? 1;
  const x = design.ratio;
  const d = design.soonDelay;
  const counts = [design.probePairs, design.lateAnchors, design.soonAnchors];
  // running totals over the participants so far: patterns [role*4 + pattern], then counters
  const patterns = new Float64Array(12);
  let flagged = 0;
  let noZone = 0;
  let inZone = 0;
  let positive = 0;
  let negative = 0;
  let checkpoint = 0;
  for (let i = 0; i < nMax; i++) {
    const kTrue = rates.kSmall[i];
    const KTrue = rates.kLarge[i];
    let probes = fallback;
    if (design.mode === 'personalised') {
      let kHat = kTrue;
      let KHat = KTrue;
      if (calibration) {
        const small = calibration.answer(0, kTrue, random);
        const large = calibration.answer(1, KTrue, random);
        kHat = small.rate;
        KHat = large.rate;
        if (small.flagged || large.flagged) flagged++;
      }
      const own = probeSet(design.model, x, d, design.lateDelayLimit, kHat, KHat);
      if (own) probes = own;
      else noZone++;
    }
    if (probes.probe > tally.longestProbeDelay) tally.longestProbeDelay = probes.probe;
    const farSoon = x * discountAt(id, kTrue, s, beta, d);
    let probeLS = 0;
    let probeSL = 0;
    let anchorLS = 0;
    let anchorPairs = 0;
    for (let role = 0; role < 3; role++) {
      const D = role === 0 ? probes.probe : role === 1 ? probes.lateAnchor : probes.soonAnchor;
      if (Number.isNaN(D)) continue;
      const far = discountAt(id, KTrue, s, beta, D) - farSoon;
      const near = x - discountAt(id, KTrue, s, beta, D - d);
      const pFarLater = probabilityLarger(truth.gamma, truth.lapse, far);
      const pNearSooner = probabilityLarger(truth.gamma, truth.lapse, near);
      if (role === 0 && far > 0 && near > 0) inZone += counts[0];
      for (let j = 0; j < counts[role]; j++) {
        const farSooner = random.uniform() >= pFarLater;
        const nearSooner = random.uniform() < pNearSooner;
        const pattern = (farSooner ? 2 : 0) + (nearSooner ? 1 : 0); // LL, LS, SL, SS
        patterns[role * 4 + pattern]++;
        if (role === 0) {
          if (pattern === 1) probeLS++;
          else if (pattern === 2) probeSL++;
        } else {
          anchorPairs++;
          if (pattern === 1) anchorLS++;
        }
      }
    }
    if (test.kind === 'sign') {
      if (probeLS > probeSL) positive++;
      else if (probeLS < probeSL) negative++;
    } else if (test.kind === 'probes-vs-anchors' && anchorPairs > 0) {
      const difference = probeLS / counts[0] - anchorLS / anchorPairs;
      if (difference > 0) positive++;
      else if (difference < 0) negative++;
    }
    if (i + 1 === sizes[checkpoint]) {
      const b = test.kind === 'mcnemar' ? patterns[1] : positive;
      const c = test.kind === 'mcnemar' ? patterns[2] : negative;
      if (pValue(b, c, test.kind, test.alternative, pValues) < test.alpha) tally.rejections[checkpoint]++;
      tally.probeReversals[checkpoint] += patterns[1];
      tally.flagged[checkpoint] += flagged;
      tally.noZone[checkpoint] += noZone;
      tally.probesInTrueZone[checkpoint] += inZone;
      for (const role of ['probe', 'lateAnchor', 'soonAnchor'] as const) {
        const row = tally.patterns[role][checkpoint];
        const at = ROLE_INDEX[role] * 4;
        for (let p = 0; p < 4; p++) row[p] += patterns[at + p];
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
