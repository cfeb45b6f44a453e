import type { CalibrationItem } from '../calibrationItems';
import { optimiseLateDelay } from '../optimiseLateDelay';
import { designChoiceModel } from '../designChoiceModel';
import { estimateRates, type Choice, type EstimateFlag, type RateEstimate, type RateEstimates } from '../estimateRates';
import { extrapolationWarning, type ExtrapolationWarning } from '../extrapolationWarning';
import { createRandom } from '../random';
import { assembleBlock } from './assembleBlock';
import type { ItemBank } from './buildItemBank';
import { ItemBankInputError } from './ItemBankInputError';
import { pairDelays } from './pairDelays';
import { pairItems, type PairRoundingEntry } from './pairItems';
import { fitStageOne, withProbeModel, type AnsweredCalibrationItem } from './stageOneFit';
import type { BankDesign, BankItem, ChosenOption, LocatePoint } from './types';
import { adaptiveStep, posteriorRates, type PosteriorRate } from '../adaptive/adaptiveStep';
import type { AdaptiveAnswer } from '../adaptive/adaptiveCalibration';
import { adaptiveEngine, type AdaptiveBlock } from './adaptiveBlock';

/** Why a participant gets the fallback set instead of personalised items. */
export type ServeFlag = 'all-sooner' | 'all-later' | 'non-monotone' | 'no-zone';

export type RateSummary = {
  rate: number;
  /** standard error of ln k; null when it is not defined (flagged estimates) */
  standardErrorLog: number | null;
  interval: { lower: number; upper: number } | null;
  flags: EstimateFlag[];
};

/** What a participant is served: estimates, flag, warnings and the probe block in presentation order. */
export type ServedItems = {
  participantId: string;
  estimates: {
    kSmall: RateSummary;
    kLarge: RateSummary;
    choiceSensitivity: number;
    /**
     * present when the design's stage 1 estimates delay sensitivity (calibration.fit): the
     * model, its k, K and s (s with standard error of ln s and Wald interval), from which the
     * personal probes were built; kSmall and kLarge above stay the design model's estimates
     */
    stageOne?: { model: string; kSmall: number; kLarge: number; sensitivity: number; standardErrorLog: number | null; interval: { lower: number; upper: number } | null };
  };
  /** null when the items are personalised; else why the fallback set was served */
  flag: ServeFlag | null;
  itemSet: 'personal' | 'fallback' | 'shared';
  extrapolation: ExtrapolationWarning | null;
  attentionCheck: 'passed' | 'failed' | 'not-answered';
  items: BankItem[];
  rounding: PairRoundingEntry[];
};

const FALLBACK_FLAGS: readonly EstimateFlag[] = ['non-monotone', 'all-sooner', 'all-later'];

/**
 * A participant's probe block from their calibration responses (item id → 'sooner' | 'later').
 *
 * 1. Responses are checked: every calibration item answered, no unknown item ids, only
 *    'sooner' or 'later' (the calibration attention check may be answered too); all problems
 *    are reported at once (ItemBankInputError, naming the items).
 * 2. kSmall and kLarge are estimated by maximum likelihood (estimateRates) under the design's one
 *    choice model (designChoiceModel: the design's γ, no lapse).
 * 3. Personalised designs: probe and anchor pairs at the estimates (pairDelays around `locate`'s
 *    point). A design whose stage 1 estimates delay sensitivity (calibration.fit) fits k, K and
 *    s jointly under that model (fitStageOne) and builds the pairs under it: the soon delay
 *    `locate` chooses, the late delay with the largest gap product at (k, K, s). Fallback (documented): a participant whose small or large estimate is flagged
 *    non-monotone, all-sooner or all-later, or whose estimates have no reversal zone within the
 *    limits, gets the bank's design-point set (built at the prior medians) and the flag.
 *    Population designs always serve the shared set.
 * With adaptive calibration (the bank's `adaptive` block) and responses naming its candidates, the
 *    estimates are the grid posterior's instead (posteriorRates: medians, SDs of ln k, 95 % intervals)
 *    after the answered candidates — the posterior does not depend on the order of the answers — and
 *    no fallback flag is raised short of 'no-zone'. Stage 2 is served only once calibration is over
 *    (stop rule met), else ItemBankInputError naming `responses`.
 * 4. The block is counterbalanced and ordered with a seed mixed from the bank's seed and the
 *    participant id, so the same participant and responses always get the same items.
 *
 * @throws ItemBankInputError for bad responses
 */
export function serveParticipant(
  design: BankDesign,
  bank: ItemBank,
  request: { participantId: string; responses: Record<string, string>; locate: LocatePoint },
): ServedItems {
  const adaptive = bank.adaptive && isAdaptive(bank.adaptive, request.responses) ? bank.adaptive : null;
  let estimates: ServedItems['estimates'];
  let calibrationDelays: number[];
  let flag: ServeFlag | null;
  // the fixed block's answers, for a stage 1 that estimates delay sensitivity (fitStageOne)
  let answers: AnsweredCalibrationItem[] = [];
  if (adaptive) {
    const answered = readAdaptiveResponses(adaptive, request.responses);
    const step = adaptiveStep(adaptiveEngine(design, adaptive), { answers: answered.answers, seed: 0, stop: { maxItems: adaptive.maxItems, targetSd: adaptive.targetSd } });
    if (!step.done) {
      throw new ItemBankInputError([{ path: 'responses', message: `Adaptive calibration is not finished after ${step.answered} answers: ask the next calibration item first.` }]);
    }
    const posterior = posteriorRates(step.summary);
    const summary = (r: PosteriorRate): RateSummary => ({ rate: r.rate, standardErrorLog: r.standardErrorLog, interval: r.interval, flags: [] });
    estimates = { kSmall: summary(posterior.kSmall), kLarge: summary(posterior.kLarge), choiceSensitivity: designChoiceModel(design.spec).sensitivity };
    calibrationDelays = answered.delays;
    flag = null;
  } else {
    const calibration = bank.items.filter((i) => i.role === 'calibration');
    const choices = readResponses(bank, request.responses);
    const fitItems: CalibrationItem[] = calibration.map((i) => ({
      magnitude: i.magnitude!,
      soonerAmount: i.soonerAmount,
      soonerDelay: i.soonerDelay,
      laterAmount: i.laterAmount,
      laterDelay: i.laterDelay,
      targetRate: Number.NaN, // not read by estimateRates, which computes each tie rate itself
    }));
    const fit = calibrationFit(bank, design, calibration.map((i) => choices.get(i.id)!), fitItems);
    estimates = { kSmall: summary(fit.small), kLarge: summary(fit.large), choiceSensitivity: fit.sensitivity };
    calibrationDelays = calibration.map((i) => i.laterDelay);
    answers = fitItems.map((item, k) => ({ ...item, later: choices.get(calibration[k].id) === 'LL' }));
    flag = (FALLBACK_FLAGS.find((f) => fit.small.flags.includes(f) || fit.large.flags.includes(f)) as ServeFlag | undefined) ?? null;
  }
  let rates = { kSmall: estimates.kSmall.rate, kLarge: estimates.kLarge.rate };
  let delays = null;
  let probeDesign = design;
  let stageOne: ServedItems['estimates']['stageOne'];
  if (design.spec.mode === 'personalised' && flag === null) {
    const joint = answers.length ? fitStageOne(design, answers, designChoiceModel(design.spec)) : null;
    let point = request.locate(rates);
    if (joint) {
      probeDesign = withProbeModel(design, joint.model);
      rates = joint.rates;
      stageOne = { model: joint.model.id, ...rates, sensitivity: joint.sensitivity.value, standardErrorLog: joint.sensitivity.standardErrorLog, interval: joint.sensitivity.interval };
      const d = point?.soonDelay ?? bank.designPoint.soonDelay;
      const optimum = optimiseLateDelay({ model: joint.model, ratio: design.spec.ratio, soonDelay: d, ...rates });
      point = optimum && { soonDelay: d, lateDelay: optimum.lateDelay };
    }
    delays = point && pairDelays(probeDesign, point, rates);
    if (!delays) flag = 'no-zone';
  }
  const itemSet = design.spec.mode === 'population' ? 'shared' : delays ? 'personal' : 'fallback';
  const pairs = delays
    ? pairItems(probeDesign, delays, rates, { set: 'personal', amountUnit: bank.amountUnit, delayUnit: bank.delayUnit })
    : pairItems(design, bank.delays, bank.designPoint, { set: itemSet, amountUnit: bank.amountUnit, delayUnit: bank.delayUnit });
  const random = createRandom({ seed: participantSeed(bank.seed, request.participantId) });
  const block = assembleBlock(pairs.items, { random, minGap: bank.minGap, currency: design.spec.currency, delayUnit: bank.delayUnit });
  const check = request.responses['check-calibration'];
  return {
    participantId: request.participantId,
    estimates: { ...estimates, ...(stageOne ? { stageOne } : {}) },
    flag,
    itemSet,
    extrapolation: extrapolationWarning({
      calibrationDelays,
      probeDelays: pairs.items.filter((i) => i.view === 'far').map((i) => i.laterDelay),
    }),
    attentionCheck: check === undefined ? 'not-answered' : check === 'sooner' ? 'passed' : 'failed',
    items: block.items,
    rounding: pairs.rounding,
  };
}

function summary(e: RateEstimate): RateSummary {
  return { rate: e.rate, standardErrorLog: e.standardErrorLog, interval: e.interval, flags: [...e.flags] };
}

// Fits of calibration answers already seen, per item bank: a fit is a function of the bank's
// calibration items, the design's model and choice model, and the answers alone, so the same answer
// pattern is fitted once per bank and process. Patterns repeat: a consistent chooser of n items per
// magnitude gives one of (n + 1)² of them. Up to FITS_PER_BANK patterns per bank are kept.
const fits = new WeakMap<ItemBank, Map<string, RateEstimates>>();
const FITS_PER_BANK = 4096;

function calibrationFit(bank: ItemBank, design: BankDesign, answers: Choice[], items: CalibrationItem[]): RateEstimates {
  const choiceModel = designChoiceModel(design.spec);
  const key = `${JSON.stringify(design.spec.model)} ${choiceModel.sensitivity} ${choiceModel.lapse} ${answers.join('')}`;
  let memo = fits.get(bank);
  if (memo === undefined) fits.set(bank, (memo = new Map()));
  let fit = memo.get(key);
  if (fit === undefined) {
    fit = estimateRates(answers, items, design.spec.model, choiceModel);
    if (memo.size >= FITS_PER_BANK) memo.delete(memo.keys().next().value!);
    memo.set(key, fit);
  }
  return fit;
}

function readResponses(bank: ItemBank, responses: Record<string, string>): Map<string, Choice> {
  const issues: Array<{ path: string; message: string }> = [];
  const known = new Map(bank.items.filter((i) => i.block === 'calibration').map((i) => [i.id, i]));
  const choices = new Map<string, Choice>();
  for (const [id, value] of Object.entries(responses ?? {})) {
    if (!known.has(id)) issues.push({ path: `responses.${id}`, message: `${id} is not a calibration item of this design.` });
    else if (value !== 'sooner' && value !== 'later') issues.push({ path: `responses.${id}`, message: `Choose 'sooner' or 'later' for ${id}.` });
    else choices.set(id, (value as ChosenOption) === 'later' ? 'LL' : 'SS');
  }
  for (const item of known.values()) {
    if (item.role === 'calibration' && !(item.id in (responses ?? {}))) issues.push({ path: `responses.${item.id}`, message: `The response to ${item.id} is missing.` });
  }
  if (issues.length) throw new ItemBankInputError(issues);
  return choices;
}

/**
 * A per-participant seed: FNV-1a (32-bit; Fowler, Noll & Vo) of "seed:participantId", so
 * each participant has their own reproducible order and sides.
 *
 * @example participantSeed(7, 'P-001') === participantSeed(7, 'P-001') // true
 */
export function participantSeed(seed: number, participantId: string): number {
  let h = 0x811c9dc5;
  const text = `${seed}:${participantId}`;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/** True when the responses answer the adaptive candidate set (any key is a candidate id) rather than the fixed block. */
function isAdaptive(block: AdaptiveBlock, responses: Record<string, string>): boolean {
  const ids = new Set(block.candidates.map((c) => c.id));
  return Object.keys(responses ?? {}).some((id) => ids.has(id));
}

function readAdaptiveResponses(block: AdaptiveBlock, responses: Record<string, string>): { answers: AdaptiveAnswer[]; delays: number[] } {
  const issues: Array<{ path: string; message: string }> = [];
  const index = new Map(block.candidates.map((c, i) => [c.id, i]));
  const answers: AdaptiveAnswer[] = [];
  const delays: number[] = [];
  for (const [id, value] of Object.entries(responses)) {
    const at = index.get(id);
    if (id === 'check-calibration') continue;
    if (at === undefined) issues.push({ path: `responses.${id}`, message: `${id} is not a candidate of this design's adaptive calibration (answers to adaptive and fixed calibration items cannot be mixed).` });
    else if (value !== 'sooner' && value !== 'later') issues.push({ path: `responses.${id}`, message: `Choose 'sooner' or 'later' for ${id}.` });
    else {
      answers.push({ index: at, choice: value === 'later' ? 'LL' : 'SS' });
      delays.push(block.candidates[at].laterDelay);
    }
  }
  if (answers.length > block.maxItems) issues.push({ path: 'responses', message: `Adaptive calibration asks at most ${block.maxItems} items; ${answers.length} were answered.` });
  if (issues.length) throw new ItemBankInputError(issues);
  return { answers, delays };
}
