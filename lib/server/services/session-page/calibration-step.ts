import type { BankItem } from '@/lib/design';

/** A calibration answer as the session page keeps it before serving (item id → option). */
export type CalibrationAnswers = Readonly<Record<string, 'sooner' | 'later'>>;

/**
 * The next calibration item a participant is shown, or null when the block is done. Today the
 * block runs in the bank's order (as exported, attention check included); this is the one
 * place that decides, so an adaptive choice of the next item replaces this function only.
 */
export function nextCalibrationItem(items: readonly BankItem[], answers: CalibrationAnswers): BankItem | null {
  return items.find((item) => answers[item.id] === undefined) ?? null;
}

/** How many calibration items the participant will answer in all (for the progress shown). */
export function calibrationLength(items: readonly BankItem[]): number {
  return items.length;
}
