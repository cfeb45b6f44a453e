import { DesignInputError } from '../DesignInputError';
import { createRandom } from '../random';
import type { AnsweredItem } from './eligibleChoices';
import { toMinorUnits } from './minorUnits';

/** The outcome of one random-incentive draw: which choice is paid, how much and when. */
export type IncentiveDraw = {
  /** 0-based index of the drawn item among the eligible items */
  index: number;
  eligibleCount: number;
  item: AnsweredItem;
  chosen: 'sooner' | 'later';
  /** the chosen option's amount in minor units, before the cap */
  chosenAmountMinor: number;
  /** what is paid: the chosen amount, or the cap when it is lower */
  amountMinor: number;
  capped: boolean;
  /** the chosen option's delay, days */
  delayDays: number;
  /** completion date + delay, as YYYY-MM-DD (UTC calendar) */
  dueDate: string;
};

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** `YYYY-MM-DD` plus whole days, on the UTC calendar (no daylight-saving shifts). */
export function addDays(date: string, days: number): string {
  const match = DATE.exec(date);
  if (!match) throw new DesignInputError('completedOn', 'a date as YYYY-MM-DD', date);
  const ms = Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3]));
  if (Number.isNaN(ms) || new Date(ms).toISOString().slice(0, 10) !== date) throw new DesignInputError('completedOn', 'a real calendar date as YYYY-MM-DD', date);
  if (!Number.isInteger(days) || days < 0 || days > 36_500) throw new DesignInputError('delayDays', 'a whole number of days from 0 to 36500', days);
  return new Date(ms + days * 86_400_000).toISOString().slice(0, 10);
}

/**
 * The random incentive system: one of the participant's eligible choices is drawn uniformly
 * (index = ⌊u · n⌋ with u the first uniform of `createRandom({ seed })`) and paid as chosen —
 * the chosen option's amount, at most `capMinor`, due on the completion date plus the chosen
 * option's delay (the same day for a sooner option at delay 0). See docs/mathematics.md,
 * "Random incentive draw".
 *
 * @param options.items eligible choices in their fixed order (eligibleChoices)
 * @param options.seed the recorded seed (a whole number; its low 32 bits are used)
 * @param options.completedOn the completion date, YYYY-MM-DD (UTC)
 * @param options.currency ISO 4217 code the amounts are in
 * @param options.capMinor per-participant cap in minor units (null: no cap)
 * @throws DesignInputError for no eligible items, a bad seed, date, currency, amount or cap
 * @example drawIncentive({ items, seed: 7, completedOn: '2026-12-03', currency: 'EUR' }).dueDate
 */
export function drawIncentive(options: { items: readonly AnsweredItem[]; seed: number; completedOn: string; currency: string; capMinor?: number | null }): IncentiveDraw {
  const { items, seed, completedOn, currency } = options;
  const capMinor = options.capMinor ?? null;
  if (!Array.isArray(items) || items.length === 0) throw new DesignInputError('items', 'at least one answered, eligible item', items?.length ?? items);
  if (capMinor !== null && (!Number.isSafeInteger(capMinor) || capMinor < 1)) throw new DesignInputError('capMinor', 'a whole number of minor units, 1 or more, or null', capMinor);
  const random = createRandom({ seed });
  const index = Math.min(items.length - 1, Math.floor(random.uniform() * items.length));
  const item = items[index];
  const sooner = item.chosen === 'sooner';
  const chosenAmountMinor = toMinorUnits({ amount: sooner ? item.soonerAmount : item.laterAmount, currency });
  const delayDays = sooner ? item.soonerDelay : item.laterDelay;
  const amountMinor = capMinor === null ? chosenAmountMinor : Math.min(chosenAmountMinor, capMinor);
  return {
    index,
    eligibleCount: items.length,
    item,
    chosen: item.chosen,
    chosenAmountMinor,
    amountMinor,
    capped: amountMinor < chosenAmountMinor,
    delayDays,
    dueDate: addDays(completedOn, delayDays),
  };
}
