import { DesignInputError } from '../DesignInputError';
import { createRandom } from '../random';
import { extrapolationWarning, type ExtrapolationWarning } from '../extrapolationWarning';
import { adaptiveBlock, type AdaptiveBlock } from './adaptiveBlock';
import { assembleBlock } from './assembleBlock';
import { calibrationBlock, type CalibrationRounding } from './calibrationBlock';
import { delayLevels, PROBE_REACH_QUANTILE } from './calibrationPlan';
import { pairDelays, type PairDelays } from './pairDelays';
import { pairItems, type PairRoundingEntry } from './pairItems';
import { amountUnit } from './rounding';
import type { BankDesign, BankItem, DelayUnit, LocatePoint, PresentationOptions, RatePair } from './types';

/** The rounding's effect on the predicted patterns (pairs) and on the calibration tie rates. */
export type RoundingReport = {
  amountUnit: number;
  delayUnit: DelayUnit;
  pairs: PairRoundingEntry[];
  calibration: CalibrationRounding;
  /** true when every rounded pair shows the same predicted pattern as its exact numbers */
  patternsPreserved: boolean;
};

/** A complete item bank for one frozen design: shared calibration block, probe block (or fallback set), report. */
export type ItemBank = {
  mode: 'personalised' | 'population';
  seed: number;
  delayUnit: DelayUnit;
  amountUnit: number;
  minGap: number;
  /** the rates (prior medians) and delays the concrete probe block was built for */
  designPoint: RatePair & { soonDelay: number; lateDelay: number };
  delays: PairDelays;
  /** calibration block, then the probe block (population: shared; personalised: the fallback set) */
  items: BankItem[];
  /** gap actually required between the views of a pair in the probe block */
  probeGap: number;
  rounding: RoundingReport;
  extrapolation: ExtrapolationWarning | null;
  notes: string[];
  /** the adaptive calibration's stop rule and candidate set; null when the design uses the fixed block alone */
  adaptive: AdaptiveBlock | null;
};

/** Default fewest other items between the two views of a pair (ours: enough that the second view is not read as a repeat). */
export const DEFAULT_MIN_GAP = 2;

/**
 * Builds the item bank of a frozen design. The concrete probe block is built at the design
 * point: the prior medians, with the soon and main late delay from `locate`. For a population
 * design that block is what every participant gets; for a personalised design it is the
 * documented fallback set for flagged participants, and the API fills the rule per participant.
 * The calibration block's delays are widened to cover the design point's probe delays.
 *
 * @throws DesignInputError ('prior') when the prior medians have no reversal zone within the
 *   design's limits, or for bad presentation options
 */
export function buildItemBank(design: BankDesign, options: PresentationOptions & { locate: LocatePoint }): ItemBank {
  const seed = options.seed;
  if (!Number.isSafeInteger(seed) || seed < 0) throw new DesignInputError('seed', 'a whole number, 0 or more', seed);
  const delayUnit = options.delayUnit ?? 'days';
  const minGap = options.minGap ?? DEFAULT_MIN_GAP;
  if (!Number.isInteger(minGap) || minGap < 1 || minGap > 20) throw new DesignInputError('minGap', 'a whole number from 1 to 20', minGap);
  const { spec, prior } = design;
  const rates = { kSmall: prior.medianSmall, kLarge: prior.medianLarge };
  const point = options.locate(rates);
  const delays = point && pairDelays(design, point, rates);
  if (!point || !delays) throw new DesignInputError('prior', 'a prior whose medians have a reversal zone within the late-delay limit', 'no zone');
  const unit = amountUnit({ currency: spec.currency, largeAmount: spec.largeAmount, smallAmount: spec.ratio * spec.largeAmount });
  const set = spec.mode === 'population' ? 'shared' : 'fallback';
  const pairs = pairItems(design, delays, rates, { set, amountUnit: unit, delayUnit });
  const cover = Math.max(...pairs.items.filter((i) => i.view === 'far').map((i) => i.laterDelay));
  const calibration = calibrationBlock(design, { amountUnit: unit, delayUnit, coverDelay: cover, soonDelay: point.soonDelay });
  const random = createRandom({ seed });
  const common = { random, minGap, currency: spec.currency, delayUnit };
  const calBlock = assembleBlock(calibration.items, common);
  const probeBlock = assembleBlock(pairs.items, common);
  const adaptive = adaptiveBlock(design, { seed, delayUnit, coverDelay: cover });
  const notes: string[] = [];
  if (adaptive) {
    notes.push(
      `Calibration is adaptive: each participant is asked up to ${adaptive.maxItems} items chosen one at a time from the ${adaptive.candidates.length} candidates by expected information (adaptive design optimisation), ` +
        `stopping early once the posterior SD of ln k and ln K is at most ${adaptive.targetSd}. The fixed calibration block stays in the bank for software that cannot ask the next-item step.`,
    );
  }
  if (spec.criterion === 'model-discrimination') {
    notes.push(
      `Probe delays chosen by model discrimination: the late delays (and a free soon delay) maximise the symmetric Kullback–Leibler divergence between the hyperbolic and the exponential model's predicted choices ` +
        `at the participant's estimates (Box & Hill 1967), plus ${spec.reversalWeight ?? 0} × the probability of a preference reversal under the design model; probes may lie outside the reversal zone.`,
    );
  }
  if (delays.omitted.lateAnchors || delays.omitted.soonAnchors) {
    notes.push(
      `${delays.omitted.lateAnchors} late and ${delays.omitted.soonAnchors} soon anchor(s) did not fit (no room below the zone, or beyond the ${spec.lateDelayLimit}-day limit).`,
    );
  }
  if (calibration.probeReach !== null) {
    notes.push(
      `Calibration delays span the probes: later delays in ${delayLevels(spec.calibration.itemsPerMagnitude)} log-spaced levels up to ${Math.ceil(calibration.probeReach)} days, ` +
        `the longest probe late delay of ${Math.round(PROBE_REACH_QUANTILE * 100)} % of participants drawn from the prior.`,
    );
  }
  if (probeBlock.gap < minGap) notes.push(`The probe block is too small for a gap of ${minGap}; the two views of each pair are at least ${probeBlock.gap} item(s) apart.`);
  return {
    mode: spec.mode,
    seed,
    delayUnit,
    amountUnit: unit,
    minGap,
    designPoint: { ...rates, soonDelay: point.soonDelay, lateDelay: point.lateDelay },
    delays,
    items: [...calBlock.items, ...probeBlock.items],
    probeGap: probeBlock.gap,
    rounding: {
      amountUnit: unit,
      delayUnit,
      pairs: pairs.rounding,
      calibration: calibration.rounding,
      patternsPreserved: pairs.rounding.every((p) => !p.changed),
    },
    extrapolation: extrapolationWarning({
      calibrationDelays: calibration.items.filter((i) => i.role === 'calibration').map((i) => i.laterDelay),
      probeDelays: pairs.items.filter((i) => i.view === 'far').map((i) => i.laterDelay),
    }),
    notes,
    adaptive,
  };
}
