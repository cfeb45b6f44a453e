import { probabilityLarger } from '../choiceProbability';
import { designChoiceModel } from '../designChoiceModel';
import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { calibrationBlock } from '../item-bank/calibrationBlock';
import { amountUnit } from '../item-bank/rounding';
import { probeSet } from '../power/probeSet';
import type { PowerDesign } from '../power/types';
import { createRandom } from '../random';
import { priorPoints } from '../ratePrior';
import { checkInteger } from '../validate';
import { AdaptiveCalibration } from './adaptiveCalibration';
import { adaptiveCandidates, adaptiveGrid } from './designAdaptive';
import type { AdaptiveCandidate } from './calibrationCandidates';
import type { PosteriorSummary } from './adaptiveCalibration';

/** Accuracy of one calibration scheme at one item count, over the simulated participants. */
export type CalibrationAccuracy = {
  /** total calibration items (both magnitudes) */
  items: number;
  /** root mean squared error of the estimate of ln k (small reward) against the truth: its empirical standard error */
  rmseLogSmall: number;
  /** the same for ln K (large reward) */
  rmseLogLarge: number;
  /** share of the probe pairs built from the estimates whose late delay lies inside the true reversal zone */
  probesInTrueZone: number;
};

export type CalibrationComparison = {
  participants: number;
  /** the fixed block (calibrationBlock) at each even item count asked, rates by posterior median on the same grid */
  fixed: CalibrationAccuracy[];
  /** adaptive calibration after 1, 2, …, maxItems answers */
  adaptive: CalibrationAccuracy[];
  /** the design's fixed block (its itemsPerMagnitude) */
  reference: CalibrationAccuracy;
  /** fewest adaptive items whose RMSE of ln k is at or below the reference block's; null if none up to maxItems */
  itemsToMatch: number | null;
};

/**
 * Seeded simulation of the gain of adaptive calibration over the fixed block (docs/mathematics.md,
 * "Adaptive calibration", check): `participants` true rate pairs from the design's prior, answers
 * simulated from the truth under the design's model and choice model; the fixed block of n items
 * (calibrationBlock with n/2 per magnitude, as exported) and adaptive calibration (adaptiveStep's
 * choices, no early stop) are scored by the same estimator — the grid posterior's median — so the
 * difference is the choice of items alone. Probes are placed as the item bank places them
 * (probeSet at the estimates; the fallback set where the estimates have no zone) and counted inside
 * the truth's zone when both preference gaps are positive at the truth.
 *
 * @throws DesignInputError naming participants (1 to 100,000), fixedCounts (even, 4 to 400) or seed
 */
export function compareCalibration(
  design: PowerDesign,
  options: { participants: number; seed: number; fixedCounts?: number[]; maxItems?: number },
): CalibrationComparison {
  checkInteger('participants', options.participants, 1, 100_000);
  if (!Number.isSafeInteger(options.seed)) throw new DesignInputError('seed', 'a whole number', options.seed);
  const referenceCount = 2 * design.spec.calibration.itemsPerMagnitude;
  const fixedCounts = options.fixedCounts ?? [referenceCount];
  for (const [i, n] of fixedCounts.entries()) {
    if (!(Number.isInteger(n) && n % 2 === 0 && n >= 4 && n <= 400)) throw new DesignInputError(`fixedCounts[${i}]`, 'an even whole number from 4 to 400', n);
  }
  const maxItems = options.maxItems ?? referenceCount;
  checkInteger('maxItems', maxItems, 1, 200);
  const { spec } = design;
  const choice = designChoiceModel(spec);
  const fallback = probeSet(design, design.prior.medianSmall, design.prior.medianLarge, design.designPoint);
  if (fallback === null) throw new DesignInputError('design.prior', 'a prior whose median rates have a reversal zone within the late-delay limit', design.prior);
  const cover = Math.max(...fallback.probe, ...fallback.lateAnchor, ...fallback.soonAnchor);
  const grid = adaptiveGrid(design);
  const engine = new AdaptiveCalibration({ grid, candidates: adaptiveCandidates(design, { coverDelay: cover }), choice });
  const unit = amountUnit({ currency: spec.currency, largeAmount: spec.largeAmount, smallAmount: spec.ratio * spec.largeAmount });
  const blocks = [...new Set([...fixedCounts, referenceCount])].map((n) => {
    const items = calibrationBlock({ ...design, spec: { ...spec, calibration: { ...spec.calibration, itemsPerMagnitude: n / 2 } } }, { amountUnit: unit, delayUnit: 'days', coverDelay: cover })
      .items.filter((i) => i.role === 'calibration')
      .map((i): AdaptiveCandidate => ({ id: i.id, magnitude: i.magnitude!, soonerAmount: i.soonerAmount, soonerDelay: 0, laterAmount: i.laterAmount, laterDelay: i.laterDelay }));
    return { n, engine: new AdaptiveCalibration({ grid, candidates: items, choice }), totals: emptyTotals() };
  });
  const adaptive = Array.from({ length: maxItems }, emptyTotals);

  const random = createRandom({ seed: options.seed });
  const truths = priorPoints(design.prior, { method: 'monte-carlo', count: options.participants, random });
  const s = spec.model.sensitivity ?? 1;
  const beta = spec.model.presentBias ?? 1;
  const answerOf = (c: AdaptiveCandidate, k: number, K: number): 'SS' | 'LL' => {
    const rate = c.magnitude === 'small' ? k : K;
    const gap = discountAt(spec.model.id, rate, s, beta, c.laterDelay) - c.soonerAmount / c.laterAmount;
    return random.uniform() < probabilityLarger(choice.sensitivity, choice.lapse, gap) ? 'LL' : 'SS';
  };
  const score = (totals: Totals, summary: PosteriorSummary, k: number, K: number) => {
    totals.squaredSmall += (summary.small.median - Math.log(k)) ** 2;
    totals.squaredLarge += (summary.large.median - Math.log(K)) ** 2;
    const probes = probeSet(design, Math.exp(summary.small.median), Math.exp(summary.large.median)) ?? fallback;
    const d = probes === fallback && design.designPoint ? design.designPoint.soonDelay : design.soonDelay;
    for (const D of probes.probe) {
      totals.probes++;
      if (insideZone(design, k, K, d, D)) totals.inZone++;
    }
  };

  for (let p = 0; p < options.participants; p++) {
    const k = truths.kSmall[p];
    const K = truths.kLarge[p];
    for (const block of blocks) {
      block.engine.reset();
      block.engine.candidates.forEach((c, index) => block.engine.answer({ index, choice: answerOf(c, k, K) }));
      score(block.totals, block.engine.summary(), k, K);
    }
    engine.reset();
    const seed = (options.seed * 31 + p) | 0;
    for (let n = 0; n < maxItems; n++) {
      const next = engine.choose({ seed });
      if (next === null) break;
      engine.answer({ index: next.index, choice: answerOf(next.candidate, k, K) });
      score(adaptive[n], engine.summary(), k, K);
    }
  }
  const N = options.participants;
  const adaptiveAccuracy = adaptive.map((t, i) => accuracy(i + 1, t, N));
  const reference = accuracy(referenceCount, blocks.find((b) => b.n === referenceCount)!.totals, N);
  const match = adaptiveAccuracy.find((a) => a.rmseLogSmall <= reference.rmseLogSmall);
  return {
    participants: N,
    fixed: fixedCounts.map((n) => accuracy(n, blocks.find((b) => b.n === n)!.totals, N)),
    adaptive: adaptiveAccuracy,
    reference,
    itemsToMatch: match ? match.items : null,
  };
}

type Totals = { squaredSmall: number; squaredLarge: number; probes: number; inZone: number };

function emptyTotals(): Totals {
  return { squaredSmall: 0, squaredLarge: 0, probes: 0, inZone: 0 };
}

function accuracy(items: number, t: Totals, n: number): CalibrationAccuracy {
  return { items, rmseLogSmall: Math.sqrt(t.squaredSmall / n), rmseLogLarge: Math.sqrt(t.squaredLarge / n), probesInTrueZone: t.probes ? t.inZone / t.probes : 0 };
}

/** Both preference gaps positive at the truth: the far view prefers LL and the near view SS. */
function insideZone(design: PowerDesign, k: number, K: number, d: number, D: number): boolean {
  const { model, ratio: x } = design.spec;
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const far = discountAt(model.id, K, s, beta, D) - x * discountAt(model.id, k, s, beta, d);
  const near = x - discountAt(model.id, K, s, beta, D - d);
  return far > 0 && near > 0;
}
