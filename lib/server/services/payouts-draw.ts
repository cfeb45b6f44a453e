import { randomInt, randomUUID } from 'node:crypto';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import { db } from '@/db';
import { ApiKey, Participant, ParticipantSession, PaymentDetail, Payout, RewardSettings, Stage2Answer } from '@/db/models';
import type { PayoutStatus } from '@/db/models/payout';
import { DesignInputError, drawIncentive, eligibleChoices, formatMinorUnits, type BankItem, type OfferedItem } from '@/lib/design';
import { formatDate } from '@/lib/shared/format';
import { ValidationError } from '@/lib/server/errors';
import { bankOrInvalid, frozenVersionById } from './item-bank';

/** What a participant is told at completion: the paid choice, the amount and when. */
export type RewardPromise = {
  itemId: string;
  chosen: 'sooner' | 'later';
  amountMinor: number;
  /** the amount as exact decimal text, e.g. "37.50" */
  amount: string;
  currency: string;
  /** YYYY-MM-DD */
  dueDate: string;
  status: PayoutStatus;
  /** held until an e-mail address for the reward link arrives */
  needsDetails: boolean;
  /** a sentence for the participant */
  message: string;
};

/** Why a payout waits: no payment details yet, or an owner's approval (amount above the threshold). */
export function holdReason(input: { hasDetails: boolean; needsApproval: boolean; approved: boolean }): string | null {
  if (!input.hasDetails) return 'held: no payment details yet (an e-mail address for the reward link); it is scheduled once they arrive';
  if (input.needsApproval && !input.approved) return 'held: the amount is above the approval threshold and waits for an owner to approve it';
  return null;
}

const toNumber = (v: number | string | null) => (v === null ? null : Number(v));

function promiseOf(p: Payout): RewardPromise {
  const amountMinor = Number(p.amountMinor);
  const amount = formatMinorUnits({ minor: amountMinor, currency: p.currency });
  const when = p.delayDays === 0 ? `today (${formatDate(p.dueDate)})` : `on ${formatDate(p.dueDate)}`;
  const needsDetails = p.status === 'held' && (p.reason?.includes('payment details') ?? false);
  const wait = needsDetails ? ' Send the address for your reward link to receive it.' : '';
  return {
    itemId: p.itemId,
    chosen: p.chosen,
    amountMinor,
    amount,
    currency: p.currency,
    dueDate: p.dueDate,
    status: p.status,
    needsDetails,
    message: `One of your choices was drawn and is paid as you chose it: ${p.currency} ${amount}, due ${when}.${wait}`,
  };
}

/** The offered items of a participant (calibration block as their key presented it, then their served stage-2 block) and their answers. */
async function answeredItems(participant: Participant, transaction?: Transaction) {
  const version = await frozenVersionById(participant.designVersionId);
  const key = participant.apiKeyId ? await ApiKey.findByPk(participant.apiKeyId, { transaction }) : null;
  const { bank } = bankOrInvalid(version, key ? { seed: key.seed ?? undefined, delayUnit: key.delayUnit, minGap: key.minGap } : {});
  const served = ((participant.result as { items?: BankItem[] }).items ?? []) as BankItem[];
  const offered: OfferedItem[] = [...bank.items.filter((i) => i.block === 'calibration'), ...served].map((i) => ({
    id: i.id,
    block: i.block,
    role: i.role,
    position: i.position,
    soonerAmount: i.soonerAmount,
    soonerDelay: i.soonerDelay,
    laterAmount: i.laterAmount,
    laterDelay: i.laterDelay,
  }));
  const answers: Record<string, string> = { ...participant.responses };
  const stage2 = await Stage2Answer.findAll({ where: { participantRef: participant.id }, transaction });
  for (const a of stage2) answers[a.itemId] = a.chosen === 'SS' ? 'sooner' : 'later';
  return { offered, answers };
}

/**
 * The random-incentive draw of one participant whose session has completed, made once: every
 * writer that completes a session (the session API, the session page) calls this, and so does the
 * payout scheduler for completed sessions that have none yet. Returns null when the version does
 * not pay real rewards or the session is not completed.
 *
 * The seed is drawn from the operating system's generator (a participant cannot foresee which
 * choice counts) and recorded with the ids of the eligible items, so the draw can be re-derived
 * with drawIncentive. UNIQUE (study, participant) makes parallel completions record one payout;
 * the loser reads the winner's row back.
 */
export async function drawPayoutOnCompletion(input: { studyId: number; participantId: string; designVersionId?: number; rewardsEnabled?: boolean }): Promise<RewardPromise | null> {
  db();
  // A caller that knows the version (the stage-2 answers path) spares studies without real rewards every other
  // query; one that has just read the version's setting (rewardsEnabled) spares this one too.
  if (input.rewardsEnabled === false) return null;
  if (input.rewardsEnabled === undefined && input.designVersionId !== undefined && !(await RewardSettings.findOne({ where: { designVersionId: input.designVersionId, enabled: true }, attributes: ['id'] }))) return null;
  const session = await ParticipantSession.findOne({ where: { studyId: input.studyId, participantId: input.participantId } });
  if (!session || session.status !== 'completed' || !session.completedAt) return null;
  const existing = await Payout.findOne({ where: { studyId: input.studyId, participantId: input.participantId } });
  if (existing) return promiseOf(existing);
  const settings = await RewardSettings.findOne({ where: { designVersionId: session.designVersionId } });
  if (!settings?.enabled) return null;
  const participant = await Participant.findOne({ where: { studyId: input.studyId, participantId: input.participantId } });
  if (!participant) return null;

  const { offered, answers } = await answeredItems(participant);
  const items = eligibleChoices({ items: offered, answers, blocks: settings.blocks });
  if (items.length === 0) return null;
  const seed = randomInt(0, 2 ** 32 - 1);
  const completedOn = session.completedAt.toISOString().slice(0, 10);
  let draw;
  try {
    draw = drawIncentive({ items, seed, completedOn, currency: settings.currency, capMinor: toNumber(settings.capMinor) });
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: error.field, message: error.message }], 'The paid choice could not be drawn.');
    throw error;
  }
  const hasDetails = (await PaymentDetail.count({ where: { studyId: input.studyId, participantId: input.participantId } })) > 0;
  const threshold = toNumber(settings.approvalThresholdMinor);
  const needsApproval = threshold !== null && draw.amountMinor > threshold;
  const reason = holdReason({ hasDetails, needsApproval, approved: false });
  try {
    const payout = await Payout.create({
      studyId: input.studyId,
      designVersionId: session.designVersionId,
      participantId: input.participantId,
      itemId: draw.item.id,
      itemBlock: draw.item.block,
      chosen: draw.chosen,
      chosenAmountMinor: draw.chosenAmountMinor,
      amountMinor: draw.amountMinor,
      currency: settings.currency,
      delayDays: draw.delayDays,
      completedOn,
      dueDate: draw.dueDate,
      seed,
      eligibleItems: items.map((i) => i.id),
      status: reason ? 'held' : 'scheduled',
      reason,
      providerReference: null,
      idempotencyKey: randomUUID(),
      nextAttemptAt: null,
      needsApproval,
    });
    return promiseOf(payout);
  } catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error;
    const winner = await Payout.findOne({ where: { studyId: input.studyId, participantId: input.participantId } });
    if (!winner) throw error;
    return promiseOf(winner);
  }
}

/** The draw of a participant as recorded, if any (the session API's reply to a replayed completion). */
export async function rewardPromise(studyId: number, participantId: string): Promise<RewardPromise | null> {
  db();
  const payout = await Payout.findOne({ where: { studyId, participantId } });
  return payout ? promiseOf(payout) : null;
}

/**
 * Stores where a participant's reward link goes (one e-mail address; a second call replaces it)
 * and schedules their payout if it was held only for want of details.
 */
export async function savePaymentDetails(input: { studyId: number; participantId: string; email: string }): Promise<{ participantId: string; reward: RewardPromise | null }> {
  const sequelize = db();
  await sequelize.transaction(async (transaction) => {
    const existing = await PaymentDetail.findOne({ where: { studyId: input.studyId, participantId: input.participantId }, transaction, lock: transaction.LOCK.UPDATE });
    if (existing) await existing.update({ email: input.email }, { transaction });
    else await PaymentDetail.create({ studyId: input.studyId, participantId: input.participantId, email: input.email }, { transaction });
    const payout = await Payout.findOne({ where: { studyId: input.studyId, participantId: input.participantId }, transaction, lock: transaction.LOCK.UPDATE });
    if (payout && payout.status === 'held') {
      const reason = holdReason({ hasDetails: true, needsApproval: payout.needsApproval, approved: payout.approvedAt !== null });
      await payout.update({ status: reason ? 'held' : 'scheduled', reason }, { transaction });
    }
  });
  return { participantId: input.participantId, reward: await rewardPromise(input.studyId, input.participantId) };
}
