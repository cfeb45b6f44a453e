import { QueryTypes } from 'sequelize';
import { db, rawQuery, sqlDate } from '@/db';
import { PaymentDetail, Payout } from '@/db/models';
import { paymentEnv } from '@/lib/server/env';
import { appLink } from '@/lib/server/mail/links';
import { payoutSummaryMessage, type PayoutSummaryLine } from '@/lib/server/mail/templates';
import { sendMail } from '@/lib/server/mail/transport';
import { formatMinorUnits } from '@/lib/design';
import { drawPayoutOnCompletion, holdReason } from './payouts-draw';
import { orderReward, PaymentProviderError } from './payouts-provider';

// The payout scheduler: sends each payout on its due date through the payment provider, retries
// failures with a doubling delay, and never pays twice. A payout is claimed by one conditional
// UPDATE (scheduled → sending, or a stale sending claim taken over), so of any number of
// schedulers — parallel ticks, two server processes — exactly one sends it; the provider sees the
// payout's idempotency key as the order's external id, so even a send repeated after a lost reply
// (a crash between the provider's answer and our write) returns the first order and pays nothing more.

/** How long a claim holds before another scheduler may take the payout over (longer than the SDK's 15 s timeout). */
const CLAIM_MS = 2 * 60_000;
const BATCH = 50;

const utcDay = (d: Date) => d.toISOString().slice(0, 10);

export type SchedulerRun = { drawn: number; sent: number; retrying: number; failed: number; held: number };

/** Draws for completed sessions of real-reward versions that have no payout yet (a completion whose reply was lost, or that came through another writer). */
async function drawMissing(): Promise<number> {
  const rows = await db().query<{ study_id: number; participant_id: string }>(
    `SELECT s.study_id, s.participant_id FROM participant_sessions s
       JOIN reward_settings r ON r.design_version_id = s.design_version_id AND r.enabled = TRUE
       LEFT JOIN payouts p ON p.study_id = s.study_id AND p.participant_id = s.participant_id
      WHERE s.status = 'completed' AND s.source IN ('api', 'page') AND p.id IS NULL
      LIMIT 100`,
    { type: QueryTypes.SELECT },
  );
  let drawn = 0;
  for (const r of rows) {
    try {
      if (await drawPayoutOnCompletion({ studyId: Number(r.study_id), participantId: r.participant_id })) drawn += 1;
    } catch (error) {
      console.error(`[switchback] could not draw the paid choice of participant ${r.participant_id} (study ${r.study_id}):`, error instanceof Error ? error.message : error);
    }
  }
  return drawn;
}

/** Takes one payout for this scheduler; false when another one has it or it is no longer due. */
async function claim(id: number, now: Date): Promise<boolean> {
  const at = sqlDate(now);
  const result = await rawQuery(
    `UPDATE payouts SET status = 'sending', claimed_until = ?, attempts = attempts + 1, updated_at = ?
      WHERE id = ? AND (
        (status = 'scheduled' AND due_date <= ? AND (next_attempt_at IS NULL OR next_attempt_at <= ?) AND (needs_approval = FALSE OR approved_at IS NOT NULL))
        OR (status = 'sending' AND claimed_until < ?))`,
    [sqlDate(new Date(now.getTime() + CLAIM_MS)), at, id, utcDay(now), at, at],
  );
  return Number(result.affectedRows ?? 0) === 1;
}

/** Backoff after the n-th failed attempt: base · 2^(n − 1) minutes (15, 30, 60, … by default). */
export function retryDelayMs(attempt: number, baseMinutes: number): number {
  return baseMinutes * 60_000 * 2 ** Math.max(0, attempt - 1);
}

/**
 * Sends every payout due by `now` (the clock is injectable for tests): claims it, orders the
 * reward through the provider, and records the outcome — sent with the provider's reference;
 * scheduled again with the reason and the next attempt time after a retryable failure; failed with
 * the reason after a refusal or the last allowed attempt; held when the payment details vanished.
 */
export async function sendDuePayouts(options: { now?: Date } = {}): Promise<SchedulerRun> {
  const now = options.now ?? new Date();
  const env = paymentEnv();
  const run: SchedulerRun = { drawn: await drawMissing(), sent: 0, retrying: 0, failed: 0, held: 0 };
  const due = await db().query<{ id: number }>(
    `SELECT id FROM payouts
      WHERE (status = 'scheduled' AND due_date <= :today AND (next_attempt_at IS NULL OR next_attempt_at <= :now) AND (needs_approval = FALSE OR approved_at IS NOT NULL))
         OR (status = 'sending' AND claimed_until < :now)
      ORDER BY due_date, id LIMIT ${BATCH}`,
    { replacements: { now, today: utcDay(now) }, type: QueryTypes.SELECT },
  );
  for (const { id } of due) {
    if (!(await claim(Number(id), now))) continue;
    const payout = (await Payout.findByPk(Number(id)))!;
    const details = await PaymentDetail.findOne({ where: { studyId: payout.studyId, participantId: payout.participantId } });
    if (!details) {
      // attempts count sends tried, so the claim's increment is taken back
      await payout.update({ status: 'held', reason: holdReason({ hasDetails: false, needsApproval: false, approved: true }), attempts: payout.attempts - 1, claimedUntil: null });
      run.held += 1;
      continue;
    }
    try {
      const order = await orderReward({ idempotencyKey: payout.idempotencyKey, amountMinor: Number(payout.amountMinor), currency: payout.currency, email: details.email, dueDate: payout.dueDate });
      const note = order.replayed ? 'the provider already had this order (same idempotency key): recorded once, paid once' : null;
      await payout.update({ status: 'sent', providerReference: order.reference, sentAt: now, claimedUntil: null, nextAttemptAt: null, reason: note ?? (payout.attempts > 1 ? `sent on attempt ${payout.attempts}; last failure: ${payout.reason ?? 'none'}`.slice(0, 500) : null) });
      run.sent += 1;
    } catch (error) {
      const failure = error instanceof PaymentProviderError ? error : new PaymentProviderError(error instanceof Error ? error.message : String(error), { retryable: true, status: null });
      const last = !failure.retryable || payout.attempts >= env.PAYOUT_MAX_ATTEMPTS;
      const next = new Date(now.getTime() + retryDelayMs(payout.attempts, env.PAYOUT_RETRY_MINUTES));
      const reason = last
        ? `attempt ${payout.attempts} failed${failure.retryable ? ' (the last allowed)' : ' and is not retried'}: ${failure.message}`
        : `attempt ${payout.attempts} failed, retried at ${next.toISOString()}: ${failure.message}`;
      await payout.update({ status: last ? 'failed' : 'scheduled', reason: reason.slice(0, 500), nextAttemptAt: last ? null : next, claimedUntil: null });
      if (last) run.failed += 1;
      else run.retrying += 1;
    }
  }
  return run;
}

type SummaryRow = { participant_id: string; amount_minor: string | number; currency: string; status: string; reason: string | null; provider_reference: string | null; due_date: string };

/**
 * E-mails each study's operators (operators, editors and owners) a summary of the previous UTC day:
 * what was sent and what failed (for good, or waiting for its retry), with what is still held. Sent once per study and day (the day is claimed in
 * payout_summaries first); studies with nothing to report get no mail.
 */
export async function sendDailySummaries(options: { now?: Date } = {}): Promise<number> {
  const now = options.now ?? new Date();
  const today = new Date(`${utcDay(now)}T00:00:00.000Z`);
  const yesterday = new Date(today.getTime() - 86_400_000);
  const day = utcDay(yesterday);
  const sequelize = db();
  const studies = await sequelize.query<{ study_id: number; name: string }>(
    `SELECT DISTINCT p.study_id, s.name FROM payouts p JOIN studies s ON s.id = p.study_id
      WHERE (p.status = 'sent' AND p.sent_at >= :from AND p.sent_at < :to)
         OR (p.status IN ('failed', 'held') AND p.updated_at < :to)`,
    { replacements: { from: yesterday, to: today }, type: QueryTypes.SELECT },
  );
  let mailed = 0;
  for (const study of studies) {
    const claimed = await rawQuery('INSERT IGNORE INTO payout_summaries (study_id, summary_date, created_at) VALUES (?, ?, ?)', [study.study_id, day, sqlDate(now)]);
    if (Number(claimed.affectedRows ?? 0) !== 1) continue;
    const rows = await sequelize.query<SummaryRow>(
      `SELECT participant_id, amount_minor, currency, status, reason, provider_reference, due_date FROM payouts
        WHERE study_id = :studyId AND (
          (status = 'sent' AND sent_at >= :from AND sent_at < :to)
          OR ((status = 'failed' OR (status = 'scheduled' AND attempts > 0)) AND updated_at >= :from AND updated_at < :to)
          OR status = 'held')
        ORDER BY status, due_date, participant_id`,
      { replacements: { studyId: study.study_id, from: yesterday, to: today }, type: QueryTypes.SELECT },
    );
    const line = (r: SummaryRow): PayoutSummaryLine => ({
      participantId: r.participant_id,
      amount: `${r.currency} ${formatMinorUnits({ minor: Number(r.amount_minor), currency: r.currency })}`,
      dueDate: String(r.due_date),
      note: r.status === 'sent' ? `reference ${r.provider_reference}` : (r.reason ?? ''),
    });
    const recipients = await sequelize.query<{ email: string }>(
      `SELECT u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.study_id = :studyId AND m.role IN ('operator', 'editor', 'owner') ORDER BY u.id`,
      { replacements: { studyId: study.study_id }, type: QueryTypes.SELECT },
    );
    for (const { email } of recipients) {
      try {
        await sendMail(
          payoutSummaryMessage({
            to: email,
            studyName: study.name,
            day,
            sent: rows.filter((r) => r.status === 'sent').map(line),
            failed: rows.filter((r) => r.status === 'failed' || r.status === 'scheduled').map(line),
            held: rows.filter((r) => r.status === 'held').map(line),
            link: appLink(`/studies/${study.study_id}/payouts`),
          }),
        );
        mailed += 1;
      } catch (error) {
        console.error(`[switchback] could not send the payout summary of study ${study.study_id} to ${email}:`, error instanceof Error ? error.message : error);
      }
    }
  }
  return mailed;
}

const holder = globalThis as unknown as { switchbackPayoutTimer?: ReturnType<typeof setInterval> };

/** One scheduler tick: draws missed completions, sends due payouts, and after PAYOUT_SUMMARY_HOUR (UTC) the previous day's summaries. */
export async function payoutTick(now = new Date()): Promise<void> {
  try {
    await sendDuePayouts({ now });
    if (now.getUTCHours() >= paymentEnv().PAYOUT_SUMMARY_HOUR) await sendDailySummaries({ now });
  } catch (error) {
    console.error('[switchback] payout scheduler tick failed:', error instanceof Error ? error.message : error);
  }
}

/** Starts the scheduler in this server process (once; on globalThis so a dev reload does not start a second). */
export function startPayoutScheduler(): void {
  if (holder.switchbackPayoutTimer) return;
  let running = false;
  holder.switchbackPayoutTimer = setInterval(() => {
    if (running) return;
    running = true;
    void payoutTick().finally(() => {
      running = false;
    });
  }, paymentEnv().PAYOUT_SCHEDULER_SECONDS * 1000);
  holder.switchbackPayoutTimer.unref?.();
}
