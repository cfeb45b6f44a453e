import { AdaptiveCalibrationAnswer } from '@/db/models';
import { db } from '@/db';
import { ConflictError, ValidationError } from '@/lib/server/errors';
import { ItemBankInputError, nextCalibrationItem, type CalibrationAnswer, type CalibrationStep } from '@/lib/design';
import type { CalibrationNextRequest } from '@/lib/shared/validations/session';
import { bankOrInvalid, type FrozenVersionRef } from './item-bank';
import type { Presentation } from './item-bank-id';

/** Who records an adaptive answer: a key of the session API, or Switchback's session page. */
export type AdaptiveSource = { source: 'api'; apiKeyId: number } | { source: 'page' };

function stepOf(version: FrozenVersionRef, presentation: Partial<Presentation>, participantId: string, answers: CalibrationAnswer[]): CalibrationStep {
  const { bank } = bankOrInvalid(version, presentation);
  try {
    return nextCalibrationItem(version.content, bank, { participantId, answers });
  } catch (error) {
    if (error instanceof ItemBankInputError) throw new ValidationError(error.issues, 'This adaptive calibration step cannot be taken.');
    throw error;
  }
}

async function storedAnswers(studyId: number, participantId: string): Promise<Array<CalibrationAnswer & { designVersionId: number }>> {
  db();
  const rows = await AdaptiveCalibrationAnswer.findAll({ where: { studyId, participantId }, order: [['step', 'ASC']] });
  return rows.map((r) => ({ itemId: r.itemId, chosen: r.chosen, designVersionId: r.designVersionId }));
}

/**
 * Step n of a participant's adaptive calibration (docs/mathematics.md, "Adaptive calibration").
 * Answers are stored one row per step (UNIQUE study, participant, step); each reply is recomputed
 * from the stored answers, so the same step sent again gives the same reply and writes nothing.
 * - step 0: the first item (nothing stored);
 * - step n ≥ 1 with the answer to the item step n − 1 returned: stored when it is the next one
 *   (the item must be the one the server chose, 422 `answer.itemId` otherwise), compared when
 *   already stored (a different answer → 409, the first one is kept);
 * - a step beyond the answers stored + 1 → 422 `step`; an answer once calibration is over → 422 `answer`.
 */
export async function calibrationNextStep(
  version: FrozenVersionRef,
  presentation: Partial<Presentation>,
  request: CalibrationNextRequest,
  by: AdaptiveSource,
): Promise<CalibrationStep & { step: number }> {
  const { participantId, step, answer } = request;
  const stored = await storedAnswers(version.studyId, participantId);
  if (stored.some((a) => a.designVersionId !== version.id)) throw new ConflictError(`Participant ${participantId} is being calibrated with another design version.`);
  if (step > stored.length + 1) {
    throw new ValidationError([{ path: 'step', message: `Participant ${participantId} has answered ${stored.length} adaptive item(s): send step ${stored.length + 1} at most.` }]);
  }
  if (answer && step <= stored.length) {
    const kept = stored[step - 1];
    if (kept.itemId !== answer.itemId || kept.chosen !== answer.chosen) {
      throw new ConflictError(`Step ${step} of participant ${participantId} was already answered (${kept.itemId}: ${kept.chosen}); the first answer is kept.`);
    }
  } else if (answer) {
    const before = stepOf(version, presentation, participantId, stored);
    if (before.done) throw new ValidationError([{ path: 'answer', message: `Adaptive calibration of ${participantId} is over after ${stored.length} answers; ask for the probe items.` }]);
    if (before.item?.id !== answer.itemId) {
      throw new ValidationError([{ path: 'answer.itemId', message: `Step ${step} answers the item step ${step - 1} returned (${before.item?.id}), not ${answer.itemId}.` }]);
    }
    const [row, created] = await AdaptiveCalibrationAnswer.findOrCreate({
      where: { studyId: version.studyId, participantId, step: step - 1 },
      defaults: {
        studyId: version.studyId,
        designVersionId: version.id,
        participantId,
        step: step - 1,
        itemId: answer.itemId,
        chosen: answer.chosen,
        source: by.source,
        apiKeyId: by.source === 'api' ? by.apiKeyId : null,
        createdAt: new Date(),
      },
    });
    if (!created && (row.itemId !== answer.itemId || row.chosen !== answer.chosen)) {
      throw new ConflictError(`Step ${step} of participant ${participantId} was answered differently at the same time; the first answer is kept.`);
    }
    stored.push({ itemId: answer.itemId, chosen: answer.chosen, designVersionId: version.id });
  }
  return { step, ...stepOf(version, presentation, participantId, stored.slice(0, step)) };
}
