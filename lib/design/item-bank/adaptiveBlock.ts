import { AdaptiveCalibration } from '../adaptive/adaptiveCalibration';
import type { AdaptiveCandidate } from '../adaptive/calibrationCandidates';
import { adaptiveCandidates, adaptiveGrid } from '../adaptive/designAdaptive';
import { designChoiceModel } from '../designChoiceModel';
import { createRandom } from '../random';
import { counterbalancedSides } from './assembleBlock';
import { roundDelay } from './rounding';
import type { BankDesign, BankItem, DelayUnit } from './types';
import { itemText } from './wording';

/** A bank's adaptive calibration: the design's stop rule and every item it may ask, as served. */
export type AdaptiveBlock = {
  maxItems: number;
  /** stop once the posterior SD of ln k and of ln K is at most this */
  targetSd: number;
  /** the candidate set, in a fixed order (magnitude, delay, amount), worded with counterbalanced sides */
  candidates: BankItem[];
};

/** Offset of the candidates' side generator from the bank's seed, so the fixed blocks' draws are untouched. */
const SIDE_SEED_OFFSET = 0x5a17;

/**
 * The candidate set of a design with adaptive calibration, as the bank presents it: adaptiveCandidates
 * (16 delays × 20 sooner amounts per magnitude over the calibration range widened to `coverDelay`),
 * later delays rounded to whole `delayUnit`s (candidates that then coincide are dropped), sides
 * counterbalanced with a generator of their own (seed + 0x5a17), worded like every other item.
 * Null for a design without `calibration.adaptive`.
 */
export function adaptiveBlock(
  design: BankDesign,
  options: { seed: number; delayUnit: DelayUnit; coverDelay: number },
): AdaptiveBlock | null {
  const rule = design.spec.calibration.adaptive;
  if (!rule) return null;
  const seen = new Set<string>();
  const raw = adaptiveCandidates(design, { coverDelay: options.coverDelay })
    .map((c) => Object.assign({}, c, { laterDelay: roundDelay(c.laterDelay, options.delayUnit) }))
    .filter((c) => {
      const key = `${c.magnitude}:${c.soonerAmount}:${c.laterDelay}`;
      if (seen.has(key)) return false;
      seen.add(key);
      return true;
    });
  const sides = counterbalancedSides(raw.length, createRandom({ seed: (options.seed + SIDE_SEED_OFFSET) | 0 }));
  const candidates = raw.map((c, i): BankItem => {
    const { soonerAmount, soonerDelay, laterAmount, laterDelay } = c;
    const soonerSide = sides[i];
    return {
      id: c.id,
      block: 'calibration',
      role: 'calibration',
      set: 'shared',
      view: null,
      pairId: null,
      magnitude: c.magnitude,
      soonerAmount,
      soonerDelay,
      laterAmount,
      laterDelay,
      soonerSide,
      position: i + 1,
      text: itemText({ soonerAmount, soonerDelay, laterAmount, laterDelay, soonerSide, currency: design.spec.currency, delayUnit: options.delayUnit }),
    };
  });
  return { maxItems: rule.maxItems, targetSd: rule.targetSd, candidates };
}

const engines = new WeakMap<AdaptiveBlock, AdaptiveCalibration>();

/**
 * The adaptive calibration engine of a bank's block (its grid, its candidates, the design's one choice
 * model), built once per block and kept while the block is: building tabulates every candidate's
 * choice probability over the grid, which costs tens of milliseconds, and a step then costs about one.
 */
export function adaptiveEngine(design: BankDesign, block: AdaptiveBlock): AdaptiveCalibration {
  let engine = engines.get(block);
  if (!engine) {
    const candidates = block.candidates.map((c): AdaptiveCandidate => ({ id: c.id, magnitude: c.magnitude!, soonerAmount: c.soonerAmount, soonerDelay: 0, laterAmount: c.laterAmount, laterDelay: c.laterDelay }));
    engine = new AdaptiveCalibration({ grid: adaptiveGrid(design), candidates, choice: designChoiceModel(design.spec) });
    engines.set(block, engine);
  }
  return engine;
}
