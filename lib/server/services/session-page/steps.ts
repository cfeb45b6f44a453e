import { amountText, delayText, type BankItem, type DelayUnit } from '@/lib/design';
import type { PageChoice, PageStep } from '@/lib/shared/session-page';
import { calibrationLength, nextCalibrationItem, type CalibrationAnswers, type CalibrationSource } from './calibration-step';
import { completionFor, type CompletionLink } from './completion';

/** What the session page knows of one participant (stored for a real session, sent along in a preview). */
export type PageProgress = {
  consented: boolean;
  instructionsRead: boolean;
  calibration: CalibrationAnswers;
  /** the stage-2 block as served (presentation order); null before serving */
  served: readonly BankItem[] | null;
  /** stage-2 answers on record, item id → option */
  stage2: ReadonlyMap<string, 'sooner' | 'later'>;
};

/** The frozen version's items as the link presents them. */
export type PageItems = {
  /** the fixed calibration block, or the adaptive candidates when `adaptive` is set */
  calibration: readonly BankItem[];
  /** adaptive calibration: the design and bank the next-item choice needs; null for the fixed block */
  adaptive: CalibrationSource['adaptive'];
  /** the length of the bank's stage-2 block, for the progress shown before serving */
  probeLength: number;
  currency: string;
  delayUnit: DelayUnit;
};

/** An item as a choice: its two options on the sides the bank chose. */
export function choiceOf(item: BankItem, items: Pick<PageItems, 'currency' | 'delayUnit'>): PageChoice {
  const sooner = { option: 'sooner' as const, amount: amountText(item.soonerAmount, items.currency), when: delayText(item.soonerDelay, items.delayUnit) };
  const later = { option: 'later' as const, amount: amountText(item.laterAmount, items.currency), when: delayText(item.laterDelay, items.delayUnit) };
  const [left, right] = item.soonerSide === 'left' ? [sooner, later] : [later, sooner];
  return {
    itemId: item.id,
    block: item.block,
    question: 'Which would you rather have?',
    options: [
      { side: 'left', ...left },
      { side: 'right', ...right },
    ],
  };
}

/** The served stage-2 item a participant answers next, or null when every one is answered. */
export function nextProbeItem(served: readonly BankItem[], answers: ReadonlyMap<string, string>): BankItem | null {
  return served.find((item) => !answers.has(item.id)) ?? null;
}

/**
 * The step a participant is on: consent, instructions, the next calibration item, then (with no
 * break) the next served stage-2 item, then completion. Once the calibration block is complete the
 * caller must have served the stage-2 items (`served` not null).
 */
export function currentStep(link: CompletionLink, participantId: string, items: PageItems, progress: PageProgress): PageStep {
  if (!progress.consented) return { kind: 'consent' };
  if (!progress.instructionsRead) return { kind: 'instructions' };
  const calibrationTotal = calibrationLength(items);
  const next = nextCalibrationItem(items, progress.calibration, participantId);
  if (next) {
    const answered = Object.keys(progress.calibration).length;
    return { kind: 'choice', choice: choiceOf(next, items), number: answered + 1, total: calibrationTotal + items.probeLength };
  }
  if (!progress.served) throw new Error('The calibration block is complete: serve the stage-2 items before asking for the step.');
  const probe = nextProbeItem(progress.served, progress.stage2);
  if (!probe) return { kind: 'complete', completion: completionFor(link, participantId) };
  // adaptive calibration may stop before its most items: count what was asked
  const asked = items.adaptive ? Object.keys(progress.calibration).length : calibrationTotal;
  return { kind: 'choice', choice: choiceOf(probe, items), number: asked + progress.stage2.size + 1, total: asked + progress.served.length };
}
