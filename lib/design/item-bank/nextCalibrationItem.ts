import { adaptiveStep, posteriorRates, type AdaptiveStep } from '../adaptive/adaptiveStep';
import type { AdaptiveAnswer } from '../adaptive/adaptiveCalibration';
import { adaptiveEngine } from './adaptiveBlock';
import type { ItemBank } from './buildItemBank';
import { ItemBankInputError } from './ItemBankInputError';
import { participantSeed } from './serveParticipant';
import type { BankDesign, BankItem, ChosenOption } from './types';

/** One answered adaptive calibration item, as the session API stores it. */
export type CalibrationAnswer = { itemId: string; chosen: ChosenOption };

/** A participant's adaptive calibration after their answers so far: the next item, or the end with the estimates. */
export type CalibrationStep = {
  /** answers so far (the step number) */
  answered: number;
  done: boolean;
  reason: AdaptiveStep['reason'];
  /** the next item to ask (null when done), as the bank words it */
  item: BankItem | null;
  /** expected information gain of that item, nats */
  information: number | null;
  /** the posterior's estimates: median rate, SD of ln k and 95 % interval per reward size */
  estimates: ReturnType<typeof posteriorRates>;
  /** the answers as calibration responses (item id → sooner | later): what probe-items takes once done */
  responses: Record<string, ChosenOption>;
};

/**
 * The next adaptive calibration item for a participant of a bank whose design calibrates adaptively
 * (adaptiveStep over the bank's candidate set and stop rule). The tie-break seed mixes the bank's
 * seed with "adaptive:" and the participant id (participantSeed), so the same participant and
 * answers always get the same item: a step is idempotent and can be recomputed from the stored
 * answers alone.
 *
 * @throws ItemBankInputError naming `calibration` (the design is not adaptive) or `answers[i].itemId` / `.chosen`
 */
export function nextCalibrationItem(design: BankDesign, bank: ItemBank, request: { participantId: string; answers: readonly CalibrationAnswer[] }): CalibrationStep {
  const block = bank.adaptive;
  if (!block) throw new ItemBankInputError([{ path: 'calibration', message: 'This design version uses the fixed calibration block; fetch it from the calibration endpoint instead.' }]);
  const index = new Map(block.candidates.map((c, i) => [c.id, i]));
  const issues: Array<{ path: string; message: string }> = [];
  const answers: AdaptiveAnswer[] = [];
  const seen = new Set<string>();
  request.answers.forEach((a, i) => {
    const at = index.get(a.itemId);
    if (at === undefined) issues.push({ path: `answers.${i}.itemId`, message: `${a.itemId} is not a candidate of this design's adaptive calibration.` });
    else if (seen.has(a.itemId)) issues.push({ path: `answers.${i}.itemId`, message: `${a.itemId} was answered before.` });
    else if (a.chosen !== 'sooner' && a.chosen !== 'later') issues.push({ path: `answers.${i}.chosen`, message: "Choose 'sooner' or 'later'." });
    else answers.push({ index: at, choice: a.chosen === 'later' ? 'LL' : 'SS' });
    seen.add(a.itemId);
  });
  if (answers.length > block.maxItems) issues.push({ path: 'answers', message: `Adaptive calibration asks at most ${block.maxItems} items.` });
  if (issues.length) throw new ItemBankInputError(issues);
  const step = adaptiveStep(adaptiveEngine(design, block), {
    answers,
    seed: participantSeed(bank.seed, `adaptive:${request.participantId}`),
    stop: { maxItems: block.maxItems, targetSd: block.targetSd },
  });
  return {
    answered: step.answered,
    done: step.done,
    reason: step.reason,
    item: step.next ? block.candidates[step.next.index] : null,
    information: step.next ? step.next.information : null,
    estimates: posteriorRates(step.summary),
    responses: Object.fromEntries(request.answers.map((a) => [a.itemId, a.chosen])),
  };
}
