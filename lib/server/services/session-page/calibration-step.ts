import { nextCalibrationItem as nextAdaptiveItem, type BankDesign, type BankItem, type ItemBank } from '@/lib/design';

/** A calibration answer as the session page keeps it before serving (item id → option). */
export type CalibrationAnswers = Readonly<Record<string, 'sooner' | 'later'>>;

/**
 * The calibration a link runs: the bank's fixed block (`calibration`, in the bank's order), or, when
 * the version calibrates adaptively (`adaptive` set), the candidates (`calibration`) with the design
 * and bank the next-item choice needs.
 */
export type CalibrationSource = { calibration: readonly BankItem[]; adaptive: { design: BankDesign; bank: ItemBank } | null };

/**
 * The next calibration item a participant is shown, or null when calibration is over. The fixed
 * block runs in the bank's order (as exported, attention check included). Adaptive calibration asks
 * the item nextCalibrationItem of the core chooses — the same choice, seed and stop rule as the
 * session API's next-item step — from the answers kept so far, in the order they were given.
 */
export function nextCalibrationItem(source: CalibrationSource, answers: CalibrationAnswers, participantId: string): BankItem | null {
  if (source.adaptive) {
    const given = Object.entries(answers).map(([itemId, chosen]) => ({ itemId, chosen }));
    return nextAdaptiveItem(source.adaptive.design, source.adaptive.bank, { participantId, answers: given }).item;
  }
  return source.calibration.find((item) => answers[item.id] === undefined) ?? null;
}

/** How many calibration items the participant will answer at most (for the progress shown). */
export function calibrationLength(source: CalibrationSource): number {
  return source.adaptive?.bank.adaptive ? source.adaptive.bank.adaptive.maxItems : source.calibration.length;
}
