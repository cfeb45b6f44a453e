import { Op, type WhereOptions } from 'sequelize';
import { db } from '@/db';
import { DesignVersion, PaymentDetail, Payout, RewardSettings } from '@/db/models';
import type { PayoutStatus } from '@/db/models/payout';
import { DesignInputError, formatMinorUnits, toMinorUnits } from '@/lib/design';
import { toCsv } from '@/lib/shared/csv';
import { REWARD_CAUTION } from '@/lib/shared/rewards';
import type { PayoutsQuery, RewardSettingsInput } from '@/lib/shared/validations/payouts';
import { ConflictError, NotFoundError, ValidationError } from '@/lib/server/errors';
import { recordAudit } from './audit';
import { holdReason } from './payouts-draw';

export { REWARD_CAUTION };

/** One frozen version's real-reward settings, amounts as exact decimal text of minor units. */
export type RewardSettingsDto = {
  designVersionId: number;
  versionNumber: number;
  designName: string;
  enabled: boolean;
  rule: 'random-incentive';
  blocks: 'both' | 'calibration' | 'probe';
  currency: string;
  capMinor: number | null;
  cap: string | null;
  approvalThresholdMinor: number | null;
  approvalThreshold: string | null;
  updatedAt: string | null;
};

const n = (v: number | string | null) => (v === null ? null : Number(v));
const money = (minor: number | null, currency: string) => (minor === null ? null : formatMinorUnits({ minor, currency }));

/** Every frozen version of the study with its real-reward settings (off until an owner turns them on). */
export async function listRewardSettings(studyId: number): Promise<RewardSettingsDto[]> {
  db();
  const versions = await DesignVersion.findAll({ where: { studyId }, order: [['id', 'ASC']] });
  const settings = new Map((await RewardSettings.findAll({ where: { studyId } })).map((s) => [s.designVersionId, s]));
  return versions.map((v) => {
    const s = settings.get(v.id);
    const currency = s?.currency ?? v.content.spec.currency;
    return {
      designVersionId: v.id,
      versionNumber: v.number,
      designName: v.content.spec.name,
      enabled: s?.enabled ?? false,
      rule: 'random-incentive',
      blocks: s?.blocks ?? 'both',
      currency,
      capMinor: n(s?.capMinor ?? null),
      cap: money(n(s?.capMinor ?? null), currency),
      approvalThresholdMinor: n(s?.approvalThresholdMinor ?? null),
      approvalThreshold: money(n(s?.approvalThresholdMinor ?? null), currency),
      updatedAt: s?.updatedAt?.toISOString() ?? null,
    };
  });
}

function minorOf(field: string, amount: number | null, currency: string): number | null {
  if (amount === null) return null;
  try {
    return toMinorUnits({ amount, currency });
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: field, message: `The ${field === 'cap' ? 'cap' : 'approval threshold'} must be a whole number of ${currency} minor units.` }]);
    throw error;
  }
}

/** Sets a frozen version's real-reward settings (owners; audited). The currency is the design's: amounts are never converted. */
export async function saveRewardSettings(actorId: number, studyId: number, versionId: number, input: RewardSettingsInput): Promise<RewardSettingsDto> {
  const sequelize = db();
  await sequelize.transaction(async (transaction) => {
    const version = await DesignVersion.findOne({ where: { id: versionId, studyId }, transaction });
    if (!version) throw new NotFoundError('No frozen version with this id in this study.');
    const currency = version.content.spec.currency;
    const values = { enabled: input.enabled, blocks: input.blocks, currency, capMinor: minorOf('cap', input.cap, currency), approvalThresholdMinor: minorOf('approvalThreshold', input.approvalThreshold, currency), updatedBy: actorId };
    const existing = await RewardSettings.findOne({ where: { designVersionId: versionId }, transaction, lock: transaction.LOCK.UPDATE });
    if (existing) await existing.update(values, { transaction });
    else await RewardSettings.create({ studyId, designVersionId: versionId, ...values }, { transaction });
    await recordAudit({ actorId, studyId, action: 'rewards.settings', details: { designVersionId: versionId, enabled: input.enabled, blocks: input.blocks, currency, capMinor: values.capMinor, approvalThresholdMinor: values.approvalThresholdMinor } }, transaction);
  });
  return (await listRewardSettings(studyId)).find((s) => s.designVersionId === versionId)!;
}

/** One ledger line as the page shows it and the export writes it. */
export type PayoutDto = {
  id: number;
  participantId: string;
  designVersionId: number;
  itemId: string;
  itemBlock: 'calibration' | 'probe';
  chosen: 'sooner' | 'later';
  amountMinor: number;
  amount: string;
  chosenAmount: string;
  currency: string;
  delayDays: number;
  completedOn: string;
  dueDate: string;
  status: PayoutStatus;
  reason: string | null;
  providerReference: string | null;
  attempts: number;
  nextAttemptAt: string | null;
  needsApproval: boolean;
  approvedAt: string | null;
  sentAt: string | null;
  cancelledAt: string | null;
  seed: number;
  eligibleCount: number;
  hasPaymentDetails: boolean;
};

function payoutJson(p: Payout, withDetails: Set<string>): PayoutDto {
  const amountMinor = Number(p.amountMinor);
  return {
    id: p.id,
    participantId: p.participantId,
    designVersionId: p.designVersionId,
    itemId: p.itemId,
    itemBlock: p.itemBlock,
    chosen: p.chosen,
    amountMinor,
    amount: formatMinorUnits({ minor: amountMinor, currency: p.currency }),
    chosenAmount: formatMinorUnits({ minor: Number(p.chosenAmountMinor), currency: p.currency }),
    currency: p.currency,
    delayDays: p.delayDays,
    completedOn: p.completedOn,
    dueDate: p.dueDate,
    status: p.status,
    reason: p.reason,
    providerReference: p.providerReference,
    attempts: p.attempts,
    nextAttemptAt: p.nextAttemptAt?.toISOString() ?? null,
    needsApproval: p.needsApproval,
    approvedAt: p.approvedAt?.toISOString() ?? null,
    sentAt: p.sentAt?.toISOString() ?? null,
    cancelledAt: p.cancelledAt?.toISOString() ?? null,
    seed: p.seed,
    eligibleCount: p.eligibleItems.length,
    hasPaymentDetails: withDetails.has(p.participantId),
  };
}

/** The study's payout ledger, filtered, with totals per currency and status (sums of whole minor units). */
export async function listPayouts(studyId: number, filter: Omit<PayoutsQuery, 'format'>) {
  db();
  const where: WhereOptions = { studyId };
  if (filter.status) Object.assign(where, { status: filter.status });
  if (filter.participant) Object.assign(where, { participantId: { [Op.substring]: filter.participant } });
  if (filter.dueFrom || filter.dueTo) Object.assign(where, { dueDate: { ...(filter.dueFrom ? { [Op.gte]: filter.dueFrom } : {}), ...(filter.dueTo ? { [Op.lte]: filter.dueTo } : {}) } });
  const rows = await Payout.findAll({ where, order: [['dueDate', 'ASC'], ['id', 'ASC']], limit: 5000 });
  const details = new Set((await PaymentDetail.findAll({ where: { studyId }, attributes: ['participantId'] })).map((d) => d.participantId));
  const payouts = rows.map((p) => payoutJson(p, details));
  const totals: Record<string, Record<string, { count: number; amountMinor: number; amount: string }>> = {};
  for (const p of payouts) {
    const byStatus = (totals[p.currency] ??= {});
    const t = (byStatus[p.status] ??= { count: 0, amountMinor: 0, amount: '' });
    t.count += 1;
    t.amountMinor += p.amountMinor;
    t.amount = formatMinorUnits({ minor: t.amountMinor, currency: p.currency });
  }
  return { payouts, totals, caution: REWARD_CAUTION };
}

/** The ledger as CSV through the one writer (formula guard on every cell), with the caution as a comment line. */
export function payoutsCsv(payouts: readonly PayoutDto[]): string {
  const columns = ['participantId', 'status', 'amount', 'currency', 'amountMinor', 'chosenAmount', 'dueDate', 'completedOn', 'delayDays', 'itemId', 'itemBlock', 'chosen', 'designVersionId', 'seed', 'eligibleCount', 'attempts', 'reason', 'providerReference', 'sentAt', 'cancelledAt'];
  return toCsv({
    comments: [REWARD_CAUTION, 'Amounts are exact: amountMinor is the whole number of minor units (cent, yen) paid.'],
    columns,
    rows: payouts.map((p) => columns.map((c) => p[c as keyof PayoutDto])),
  });
}

async function lockedPayouts(studyId: number, ids: readonly number[], transaction: import('sequelize').Transaction) {
  const rows = await Payout.findAll({ where: { studyId, id: [...new Set(ids)] }, order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE });
  const found = new Set(rows.map((r) => r.id));
  const missing = ids.filter((id) => !found.has(id));
  if (missing.length) throw new ValidationError([{ path: 'ids', message: `No payout ${missing.join(', ')} in this study.` }]);
  return rows;
}

/**
 * Owners approve a batch of payouts held above the approval threshold: each is scheduled (or stays
 * held while payment details are missing). One audit event names the batch and its total.
 */
export async function approvePayouts(actorId: number, studyId: number, ids: readonly number[]) {
  const sequelize = db();
  return sequelize.transaction(async (transaction) => {
    const rows = await lockedPayouts(studyId, ids, transaction);
    const wrong = rows.filter((r) => !r.needsApproval || r.approvedAt !== null || r.status !== 'held');
    if (wrong.length) throw new ConflictError(`Only held payouts above the approval threshold wait for approval: ${wrong.map((r) => `${r.participantId} (${r.status}${r.approvedAt ? ', approved' : ''})`).join(', ')}.`);
    const details = new Set((await PaymentDetail.findAll({ where: { studyId, participantId: rows.map((r) => r.participantId) }, transaction })).map((d) => d.participantId));
    const now = new Date();
    for (const r of rows) {
      const reason = holdReason({ hasDetails: details.has(r.participantId), needsApproval: true, approved: true });
      await r.update({ approvedBy: actorId, approvedAt: now, status: reason ? 'held' : 'scheduled', reason }, { transaction });
    }
    await recordAudit({ actorId, studyId, action: 'payouts.approve', details: { ids: rows.map((r) => r.id), participants: rows.map((r) => r.participantId), totals: totalsOf(rows) } }, transaction);
    return { approved: rows.length };
  });
}

function totalsOf(rows: readonly Payout[]): Record<string, string> {
  const sums: Record<string, number> = {};
  for (const r of rows) sums[r.currency] = (sums[r.currency] ?? 0) + Number(r.amountMinor);
  return Object.fromEntries(Object.entries(sums).map(([c, m]) => [c, formatMinorUnits({ minor: m, currency: c })]));
}

/** Owners cancel payouts that are not sent or being sent, with the reason (audited). Sent money cannot be cancelled here. */
export async function cancelPayouts(actorId: number, studyId: number, ids: readonly number[], reason: string) {
  const sequelize = db();
  return sequelize.transaction(async (transaction) => {
    const rows = await lockedPayouts(studyId, ids, transaction);
    const wrong = rows.filter((r) => !['scheduled', 'held', 'failed'].includes(r.status));
    if (wrong.length) throw new ConflictError(`Only scheduled, held or failed payouts can be cancelled: ${wrong.map((r) => `${r.participantId} is ${r.status}`).join(', ')}.`);
    const now = new Date();
    for (const r of rows) await r.update({ status: 'cancelled', cancelledBy: actorId, cancelledAt: now, reason: `cancelled: ${reason}`.slice(0, 500), nextAttemptAt: null }, { transaction });
    await recordAudit({ actorId, studyId, action: 'payouts.cancel', details: { ids: rows.map((r) => r.id), participants: rows.map((r) => r.participantId), reason, totals: totalsOf(rows) } }, transaction);
    return { cancelled: rows.length };
  });
}
