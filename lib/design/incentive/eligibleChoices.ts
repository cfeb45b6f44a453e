import { DesignInputError } from '../DesignInputError';
import type { ItemBlock, ItemRole } from '../item-bank/types';

/** Which blocks the random incentive system draws from: both (the default), or one of them. */
export type IncentiveBlocks = 'both' | 'calibration' | 'probe';
export const INCENTIVE_BLOCKS: readonly IncentiveBlocks[] = ['both', 'calibration', 'probe'];

/** One answered item as the draw sees it: its two options (amounts in major units, delays in days) and the option chosen. */
export type AnsweredItem = {
  id: string;
  block: ItemBlock;
  role: ItemRole;
  position: number;
  soonerAmount: number;
  soonerDelay: number;
  laterAmount: number;
  laterDelay: number;
  chosen: 'sooner' | 'later';
};

/** An item with its options, before the participant's answer is attached. */
export type OfferedItem = Omit<AnsweredItem, 'chosen'>;

/**
 * The items a participant's payment can be drawn from: every answered item of the chosen blocks,
 * attention checks excluded (their later option is dominated, so paying one would reward the
 * check rather than a preference). Order is fixed — calibration block first, then the probe
 * block, each by position, ties by id — so a recorded seed picks the same item again.
 *
 * @param options.items every item offered (both blocks)
 * @param options.answers item id → 'sooner' | 'later'; unanswered items are not eligible
 * @param options.blocks default 'both'
 * @throws DesignInputError for an unknown `blocks` value or an answer other than sooner/later
 * @example eligibleChoices({ items: [], answers: {} }).length === 0
 */
export function eligibleChoices(options: { items: readonly OfferedItem[]; answers: Readonly<Record<string, string>>; blocks?: IncentiveBlocks }): AnsweredItem[] {
  const blocks = options.blocks ?? 'both';
  if (!INCENTIVE_BLOCKS.includes(blocks)) throw new DesignInputError('blocks', 'both, calibration or probe', blocks);
  const chosen: AnsweredItem[] = [];
  for (const item of options.items) {
    if (item.role === 'attention-check') continue;
    if (blocks !== 'both' && item.block !== blocks) continue;
    const answer = options.answers[item.id];
    if (answer === undefined) continue;
    if (answer !== 'sooner' && answer !== 'later') throw new DesignInputError(`answers.${item.id}`, 'sooner or later', answer);
    chosen.push({ ...item, chosen: answer });
  }
  const blockOrder = (b: ItemBlock) => (b === 'calibration' ? 0 : 1);
  return chosen.sort((a, b) => blockOrder(a.block) - blockOrder(b.block) || a.position - b.position || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}
