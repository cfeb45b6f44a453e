// Real rewards end to end on the real MariaDB, through the Next routes and the payment SDK against
// the local fake of the provider's API (scripts/fake-payments.mjs, started in-process on a free
// port): a participant completes a session and is told what they will be paid and when; the draw
// re-derives from its recorded seed; the scheduler pays on the due date (clock set by the test),
// retries a provider failure once and records it, never pays twice (a lost reply, parallel
// schedulers, parallel completions); a participant without payment details is held; owners alone
// approve and cancel, audited; the ledger's CSV goes through the formula guard with the caution.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Payout } from '@/db/models';
import { GET as calibrationRoute } from '@/app/api/v1/studies/[id]/calibration/route';
import { POST as probeRoute } from '@/app/api/v1/studies/[id]/probe-items/route';
import { POST as answersRoute } from '@/app/api/v1/studies/[id]/stage2-answers/route';
import { POST as detailsRoute } from '@/app/api/v1/studies/[id]/payment-details/route';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { GET as rewardsRoute } from '@/app/api/studies/[id]/rewards/route';
import { PUT as rewardSettingsRoute } from '@/app/api/studies/[id]/rewards/[versionId]/route';
import { GET as ledgerRoute } from '@/app/api/studies/[id]/payouts/route';
import { POST as approveRoute } from '@/app/api/studies/[id]/payouts/approve/route';
import { POST as cancelRoute } from '@/app/api/studies/[id]/payouts/cancel/route';
import { GET as pageGet, POST as pagePost } from '@/app/api/session-page/[slug]/route';
import { POST as linksPost } from '@/app/api/studies/[id]/session-links/route';
import { pageRateLimiter } from '@/lib/server/http/session-page-route';
import type { PageState } from '@/lib/shared/session-page';
import { addDays, drawIncentive, eligibleChoices, toMinorUnits } from '@/lib/design';
import { sendDailySummaries, sendDuePayouts } from '@/lib/server/services/payouts-scheduler';
import { startFakePayments, type FakePayments } from '@/scripts/fake-payments.mjs';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { startTestMailbox, type TestMailbox } from '../support/mail';
import { answersOf, makeFrozenVersion } from './item-bank-support';

type Json = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
type Item = { id: string; block: 'calibration' | 'probe'; role: 'calibration' | 'reversal-probe' | 'late-anchor' | 'soon-anchor' | 'attention-check'; magnitude: string | null; soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number; position: number };

let fake: FakePayments;
let mailbox: TestMailbox;
const saved = { url: process.env.PAYMENT_API_URL, token: process.env.PAYMENT_API_TOKEN };

beforeAll(async () => {
  await migrateUp();
  fake = await startFakePayments({ port: 0 });
  process.env.PAYMENT_API_URL = fake.basePath;
  process.env.PAYMENT_API_TOKEN = fake.token;
  mailbox = await startTestMailbox();
});

afterAll(async () => {
  await fake.stop();
  await mailbox.stop();
  process.env.PAYMENT_API_URL = saved.url;
  process.env.PAYMENT_API_TOKEN = saved.token;
});

async function call(handler: (r: never, c: never) => Promise<Response>, user: TestUser | null, method: string, path: string, params: Record<string, string>, options: { json?: unknown; headers?: Record<string, string> } = {}) {
  const response = await handler((await requestAs(user, method, path, options)) as never, ctx(params) as never);
  const text = await response.text();
  let body: Json = {};
  try {
    body = text ? (JSON.parse(text) as Json) : {};
  } catch {
    body = { text };
  }
  return { status: response.status, body, text };
}

async function setUp(name: string, settings: Json = {}) {
  const { study, team } = await makeStudyWithTeam(name);
  const version = await makeFrozenVersion(study.id);
  const id = String(study.id);
  const keyReply = await call(createKey as never, team.operator, 'POST', `/api/studies/${id}/api-keys`, { id }, { json: { name: 'Lab software', designVersionId: version.id } });
  expect(keyReply.status).toBe(201);
  const secret = keyReply.body.secret as string;
  const itemBankId = keyReply.body.key.itemBankId as string;
  const put = await call(rewardSettingsRoute as never, team.owner, 'PUT', `/api/studies/${id}/rewards/${version.id}`, { id, versionId: String(version.id) }, { json: { enabled: true, blocks: 'both', cap: null, approvalThreshold: null, ...settings } });
  expect(put.status, JSON.stringify(put.body)).toBe(200);
  const auth = { authorization: `Bearer ${secret}` };

  /** Runs one participant through both blocks; returns the last stage-2 reply and what was offered. */
  async function complete(participantId: string, options: { lastInParallel?: number } = {}) {
    const block = await call(calibrationRoute as never, null, 'GET', `/api/v1/studies/${id}/calibration?participantId=${participantId}`, { id }, { headers: auth });
    expect(block.status).toBe(200);
    const calibrationItems = block.body.items as Item[];
    const responses = answersOf(calibrationItems, { kSmall: 0.05, kLarge: 0.01 });
    const served = await call(probeRoute as never, null, 'POST', `/api/v1/studies/${id}/probe-items`, { id }, { headers: auth, json: { participantId, responses, itemBankId } });
    expect(served.status, JSON.stringify(served.body)).toBe(200);
    const stage2 = served.body.items as Item[];
    const answers = stage2.map((item, i) => ({ itemId: item.id, chosen: i % 3 === 0 ? 'sooner' : 'later' }));
    const first = await call(answersRoute as never, null, 'POST', `/api/v1/studies/${id}/stage2-answers`, { id }, { headers: auth, json: { participantId, answers: answers.slice(0, -1) } });
    expect(first.body.status).toBe('served');
    expect(first.body.reward).toBeUndefined();
    const last = () => call(answersRoute as never, null, 'POST', `/api/v1/studies/${id}/stage2-answers`, { id }, { headers: auth, json: { participantId, answers: answers.slice(-1) } });
    const replies = await Promise.all(Array.from({ length: options.lastInParallel ?? 1 }, last));
    for (const r of replies) expect(r.status, JSON.stringify(r.body)).toBe(200);
    return { replies, calibrationItems, stage2, responses, answers };
  }
  const details = (participantId: string, email: string) => call(detailsRoute as never, null, 'POST', `/api/v1/studies/${id}/payment-details`, { id }, { headers: auth, json: { participantId, email } });
  const ledger = async (query = '', user: TestUser = team.operator) => call(ledgerRoute as never, user, 'GET', `/api/studies/${id}/payouts${query}`, { id });
  return { study, team, version, id, complete, details, ledger };
}

/** Noon UTC of a YYYY-MM-DD day. */
const noon = (day: string) => new Date(`${day}T12:00:00.000Z`);
const ordersFor = (key: string) => fake.orders().filter((o) => o.external_id === key);

describe('the draw at completion', () => {
  it('tells the participant what they will be paid and when, and the recorded seed re-derives the draw', async () => {
    const s = await setUp('Payouts: draw');
    const { replies, calibrationItems, stage2, responses, answers } = await s.complete('P-draw');
    const reward = replies[0].body.reward as Json;
    expect(reward).toMatchObject({ currency: 'EUR', status: 'held' });
    expect(reward.message).toMatch(/^One of your choices was drawn and is paid as you chose it: EUR \d+\.\d{2}, due /);
    expect(reward.message).toContain('Send the address for your reward link');

    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-draw' } }))!;
    // Re-derive: the same eligible items (attention check excluded) in the recorded order, the recorded seed.
    const all: Record<string, string> = { ...responses, ...Object.fromEntries(answers.map((a) => [a.itemId, a.chosen])) };
    const items = eligibleChoices({ items: [...calibrationItems, ...stage2], answers: all });
    expect(items.map((i) => i.id)).toEqual(payout.eligibleItems);
    expect(items.some((i) => i.role === 'attention-check')).toBe(false);
    expect(payout.eligibleItems.length).toBe(calibrationItems.filter((i) => i.role === 'calibration').length + stage2.filter((i) => i.role !== 'attention-check').length);
    const again = drawIncentive({ items, seed: payout.seed, completedOn: payout.completedOn, currency: 'EUR' });
    expect(again.item.id).toBe(payout.itemId);
    expect(again.amountMinor).toBe(Number(payout.amountMinor));
    expect(again.dueDate).toBe(payout.dueDate);
    // The amount is the chosen option's, in cent; the due date is completion + that option's delay.
    const drawn = [...calibrationItems, ...stage2].find((i) => i.id === payout.itemId)!;
    const option = all[payout.itemId] === 'sooner' ? { amount: drawn.soonerAmount, delay: drawn.soonerDelay } : { amount: drawn.laterAmount, delay: drawn.laterDelay };
    expect(Number(payout.amountMinor)).toBe(toMinorUnits({ amount: option.amount, currency: 'EUR' }));
    expect(payout.dueDate).toBe(addDays(payout.completedOn, option.delay));
    expect(reward).toMatchObject({ itemId: payout.itemId, amountMinor: Number(payout.amountMinor), dueDate: payout.dueDate });
  });

  it('draws once when the last answer arrives several times at once, and a replay reads the same draw back', async () => {
    const s = await setUp('Payouts: parallel completions');
    const { replies } = await s.complete('P-par', { lastInParallel: 6 });
    const rewards = replies.map((r) => r.body.reward as Json);
    expect(rewards.every((r) => r && r.itemId === rewards[0].itemId && r.amountMinor === rewards[0].amountMinor)).toBe(true);
    expect(await Payout.count({ where: { studyId: s.study.id } })).toBe(1);
  });

  it('pays at most the cap, and nothing is drawn while real rewards are off', async () => {
    const s = await setUp('Payouts: cap', { cap: 0.5 });
    const { replies } = await s.complete('P-cap');
    expect(replies[0].body.reward.amountMinor).toBe(50);
    const off = await setUp('Payouts: off', { enabled: false });
    const offReply = await off.complete('P-off');
    expect(offReply.replies[0].body.reward).toBeUndefined();
    expect(await Payout.count({ where: { studyId: off.study.id } })).toBe(0);
  });

  it('follows the real-rewards setting as an owner changes it: the next completion through the API draws, or does not', async () => {
    const s = await setUp('Payouts: setting changes', { enabled: false });
    const put = (enabled: boolean) =>
      call(rewardSettingsRoute as never, s.team.owner, 'PUT', `/api/studies/${s.id}/rewards/${s.version.id}`, { id: s.id, versionId: String(s.version.id) }, { json: { enabled, blocks: 'both', cap: null, approvalThreshold: null } });
    expect((await s.complete('P-before')).replies[0].body.reward).toBeUndefined();
    expect((await put(true)).status).toBe(200);
    expect((await s.complete('P-on')).replies[0].body.reward).toMatchObject({ currency: 'EUR', status: 'held' });
    expect((await put(false)).status).toBe(200);
    expect((await s.complete('P-off-again')).replies[0].body.reward).toBeUndefined();
    expect((await Payout.findAll({ where: { studyId: s.study.id } })).map((p) => p.participantId)).toEqual(['P-on']);
  });
});

describe('the scheduler', () => {
  it('holds a participant without payment details, and pays on the due date once they arrive, through the SDK to the fake provider', async () => {
    const s = await setUp('Payouts: due date');
    await s.complete('P-due');
    let payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-due' } }))!;
    expect(payout.status).toBe('held');
    expect(payout.reason).toContain('no payment details');
    expect((await sendDuePayouts({ now: noon(addDays(payout.dueDate, 1)) })).sent).toBe(0);

    const saved = await s.details('P-due', 'p-due@example.test');
    expect(saved.status).toBe(200);
    expect(saved.body.reward.status).toBe('scheduled');
    // The day before the due date nothing is sent; on the due date it is.
    const dayBefore = new Date(new Date(`${payout.dueDate}T00:00:00.000Z`).getTime() - 1000);
    await sendDuePayouts({ now: dayBefore });
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(0);
    const run = await sendDuePayouts({ now: new Date(`${payout.dueDate}T00:00:01.000Z`) });
    expect(run.sent).toBeGreaterThanOrEqual(1);
    payout = (await payout.reload())!;
    expect(payout.status).toBe('sent');
    const orders = ordersFor(payout.idempotencyKey);
    expect(orders).toHaveLength(1);
    expect(payout.providerReference).toBe(orders[0].id);
    expect(orders[0].rewards[0].value).toEqual({ denomination: Number(payout.amountMinor) / 100, currency_code: 'EUR' });
    expect(orders[0].rewards[0].recipient.email).toBe('p-due@example.test');
    // A later tick sends nothing more.
    await sendDuePayouts({ now: noon(addDays(payout.dueDate, 3)) });
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
  });

  it('retries a provider failure once with back-off and records it', async () => {
    const s = await setUp('Payouts: retry');
    await s.details('P-retry', 'p-retry@example.test');
    await s.complete('P-retry');
    let payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-retry' } }))!;
    expect(payout.status).toBe('scheduled');
    const due = noon(payout.dueDate);
    fake.failNext({ count: 1, status: 503 });
    await sendDuePayouts({ now: due });
    payout = (await payout.reload())!;
    expect(payout.status).toBe('scheduled');
    expect(payout.attempts).toBe(1);
    expect(payout.reason).toContain('503');
    // back-off: 15 minutes after the first failure (PAYOUT_RETRY_MINUTES default)
    expect(payout.nextAttemptAt!.getTime()).toBe(due.getTime() + 15 * 60_000);
    await sendDuePayouts({ now: new Date(due.getTime() + 5 * 60_000) });
    expect((await payout.reload()).status).toBe('scheduled');
    await sendDuePayouts({ now: new Date(due.getTime() + 16 * 60_000) });
    payout = (await payout.reload())!;
    expect(payout.status).toBe('sent');
    expect(payout.attempts).toBe(2);
    expect(payout.reason).toContain('sent on attempt 2');
    expect(payout.reason).toContain('503');
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
    expect(fake.requests(payout.idempotencyKey)).toBe(2);
  });

  it('pays once when the provider accepted the order but the reply was lost: the retry gets the same order back', async () => {
    const s = await setUp('Payouts: lost reply');
    await s.details('P-lost', 'p-lost@example.test');
    await s.complete('P-lost');
    let payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-lost' } }))!;
    fake.failNext({ count: 1, status: 502, after: true });
    await sendDuePayouts({ now: noon(payout.dueDate) });
    payout = (await payout.reload())!;
    expect(payout.status).toBe('scheduled');
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
    await sendDuePayouts({ now: new Date(noon(payout.dueDate).getTime() + 60 * 60_000) });
    payout = (await payout.reload())!;
    expect(payout.status).toBe('sent');
    expect(payout.reason).toContain('same idempotency key');
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
    expect(payout.providerReference).toBe(ordersFor(payout.idempotencyKey)[0].id);
  });

  it('pays once when several schedulers run at the same moment', async () => {
    const s = await setUp('Payouts: parallel schedulers');
    await s.details('P-many', 'p-many@example.test');
    await s.complete('P-many');
    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-many' } }))!;
    const runs = await Promise.all(Array.from({ length: 5 }, () => sendDuePayouts({ now: noon(payout.dueDate) })));
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
    // one request reached the provider: the claim, not the provider's idempotency, kept the others out
    expect(fake.requests(payout.idempotencyKey)).toBe(1);
    expect((await payout.reload()).status).toBe('sent');
    expect((await payout.reload()).attempts).toBe(1);
    expect(runs.length).toBe(5);
  });

  it('fails a payout the provider refuses, with the provider’s reason, without retrying', async () => {
    const s = await setUp('Payouts: refused');
    await s.details('P-refused', 'p-refused@example.test');
    await s.complete('P-refused');
    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-refused' } }))!;
    fake.failNext({ count: 1, status: 400 });
    await sendDuePayouts({ now: noon(payout.dueDate) });
    await payout.reload();
    expect(payout.status).toBe('failed');
    expect(payout.reason).toContain('not retried');
    expect(payout.reason).toContain('400');
    await sendDuePayouts({ now: noon(addDays(payout.dueDate, 2)) });
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(0);
  });

  it('e-mails the operators a daily summary of what was sent and what failed, once a day', async () => {
    const s = await setUp('Payouts: summary');
    await s.details('P-sum', 'p-sum@example.test');
    await s.complete('P-sum');
    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-sum' } }))!;
    await sendDuePayouts({ now: noon(payout.dueDate) });
    const nextMorning = new Date(`${addDays(payout.dueDate, 1)}T08:00:00.000Z`);
    expect(await sendDailySummaries({ now: nextMorning })).toBeGreaterThanOrEqual(3); // operator, editor, owner
    const mail = await mailbox.waitFor((m) => m.to.includes(s.team.operator.email) && m.subject.includes('Payouts: summary'));
    expect(mail.subject).toMatch(/1 sent, 0 failed/);
    expect(mail.text).toContain('P-sum');
    expect(mail.text).toContain(`reference ${(await payout.reload()).providerReference}`);
    expect((await mailbox.all()).some((m) => m.to.includes(s.team.viewer.email) && m.subject.includes('Payouts: summary'))).toBe(false);
    const summaries = async () => (await mailbox.all()).filter((m) => m.subject.includes('Payouts: summary')).length;
    const before = await summaries();
    expect(before).toBe(3);
    await sendDailySummaries({ now: new Date(nextMorning.getTime() + 3_600_000) });
    expect(await summaries()).toBe(before);
  });
});

describe('owners approve and cancel; operators read the ledger', () => {
  it('holds payouts above the threshold until an owner approves the batch (audited); operators may not', async () => {
    const s = await setUp('Payouts: approval', { approvalThreshold: 0.01 });
    await s.details('P-appr', 'p-appr@example.test');
    await s.complete('P-appr');
    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId: 'P-appr' } }))!;
    expect(payout.status).toBe('held');
    expect(payout.reason).toContain('approval');
    await sendDuePayouts({ now: noon(payout.dueDate) });
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(0);
    const path = `/api/studies/${s.id}/payouts/approve`;
    expect((await call(approveRoute as never, s.team.operator, 'POST', path, { id: s.id }, { json: { ids: [payout.id] } })).status).toBe(403);
    const ok = await call(approveRoute as never, s.team.owner, 'POST', path, { id: s.id }, { json: { ids: [payout.id] } });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect((await payout.reload()).status).toBe('scheduled');
    const event = await AuditEvent.findOne({ where: { studyId: s.study.id, action: 'payouts.approve' } });
    expect(event?.actorId).toBe(s.team.owner.id);
    expect((await call(approveRoute as never, s.team.owner, 'POST', path, { id: s.id }, { json: { ids: [payout.id] } })).status).toBe(409);
    await sendDuePayouts({ now: noon(payout.dueDate) });
    expect(ordersFor(payout.idempotencyKey)).toHaveLength(1);
  });

  it('lets only owners cancel, audits it, never sends a cancelled payout and refuses to cancel a sent one', async () => {
    const s = await setUp('Payouts: cancel');
    await s.details('P-c1', 'p-c1@example.test');
    await s.details('P-c2', 'p-c2@example.test');
    await s.complete('P-c1');
    await s.complete('P-c2');
    const [p1, p2] = await Payout.findAll({ where: { studyId: s.study.id }, order: [['participantId', 'ASC']] });
    const path = `/api/studies/${s.id}/payouts/cancel`;
    const body = { ids: [p1.id], reason: 'withdrew consent' };
    for (const role of ['viewer', 'operator', 'editor'] as const) expect((await call(cancelRoute as never, s.team[role], 'POST', path, { id: s.id }, { json: body })).status).toBe(403);
    expect((await call(cancelRoute as never, s.team.owner, 'POST', path, { id: s.id }, { json: body })).status).toBe(200);
    expect((await p1.reload()).status).toBe('cancelled');
    expect(p1.reason).toBe('cancelled: withdrew consent');
    const event = await AuditEvent.findOne({ where: { studyId: s.study.id, action: 'payouts.cancel' } });
    expect(event?.details).toMatchObject({ reason: 'withdrew consent', participants: ['P-c1'] });
    await sendDuePayouts({ now: noon(addDays(p2.dueDate > p1.dueDate ? p2.dueDate : p1.dueDate, 1)) });
    expect(ordersFor(p1.idempotencyKey)).toHaveLength(0);
    expect((await p2.reload()).status).toBe('sent');
    const sent = await call(cancelRoute as never, s.team.owner, 'POST', path, { id: s.id }, { json: { ids: [p2.id], reason: 'too late' } });
    expect(sent.status).toBe(409);
    expect(sent.body.error).toContain('P-c2 is sent');
  });

  it('lists and filters the ledger for operators, with totals in exact minor units, and exports it through the formula guard with the caution', async () => {
    const s = await setUp('Payouts: ledger');
    await s.complete('@P1');
    await s.details('P-2', 'p-2@example.test');
    await s.complete('P-2');
    const all = await s.ledger();
    expect(all.status).toBe(200);
    expect(all.body.payouts).toHaveLength(2);
    expect(all.body.caution).toContain('ethics board');
    const held = await s.ledger('?status=held');
    expect(held.body.payouts.map((p: Json) => p.participantId)).toEqual(['@P1']);
    expect(held.body.totals.EUR.held.amountMinor).toBe(held.body.payouts[0].amountMinor);
    expect((await s.ledger('?participant=P-2')).body.payouts.map((p: Json) => p.participantId)).toEqual(['P-2']);
    const csv = await s.ledger('?format=csv');
    expect(csv.status).toBe(200);
    const lines = csv.text.split('\r\n');
    expect(lines[0]).toMatch(/^# Real rewards must follow/);
    expect(lines[2].startsWith('participantId,status,amount,currency,amountMinor')).toBe(true);
    expect(csv.text).toContain("'@P1");
    expect(csv.text).not.toMatch(/(^|,)@P1/m);
    expect((await s.ledger('', s.team.editor)).status).toBe(200);
    expect((await s.ledger('', s.team.viewer)).status).toBe(403);
  });
});

describe('bad input names the field', () => {
  it('refuses settings, filters, ids and payment details that make no sense with 4xx naming the field', async () => {
    const s = await setUp('Payouts: bad input');
    const put = (json: unknown) => call(rewardSettingsRoute as never, s.team.owner, 'PUT', `/api/studies/${s.id}/rewards/${s.version.id}`, { id: s.id, versionId: String(s.version.id) }, { json });
    const fine = { enabled: true, blocks: 'both', cap: null, approvalThreshold: null };
    const rows: Array<[unknown, string]> = [
      [{ ...fine, cap: 12.345 }, 'cap'],
      [{ ...fine, cap: -1 }, 'cap'],
      [{ ...fine, approvalThreshold: 'ten' }, 'approvalThreshold'],
      [{ ...fine, blocks: 'all' }, 'blocks'],
      [{ ...fine, enabled: 'yes' }, 'enabled'],
      [{ ...fine, currency: 'USD' }, 'currency'],
    ];
    for (const [json, field] of rows) {
      const reply = await put(json);
      expect(reply.status, JSON.stringify(json)).toBe(422);
      expect(JSON.stringify(reply.body.issues)).toContain(field);
    }
    expect((await call(rewardSettingsRoute as never, s.team.owner, 'PUT', `/api/studies/${s.id}/rewards/999999`, { id: s.id, versionId: '999999' }, { json: fine })).status).toBe(404);
    const badQuery = await s.ledger('?status=paid');
    expect(badQuery.status).toBe(422);
    expect(badQuery.body.issues[0].path).toBe('status');
    const badIds = await call(cancelRoute as never, s.team.owner, 'POST', `/api/studies/${s.id}/payouts/cancel`, { id: s.id }, { json: { ids: [424242], reason: 'nope' } });
    expect(badIds.status).toBe(422);
    expect(badIds.body.issues[0].path).toBe('ids');
    const badEmail = await s.details('P-x', 'not an address');
    expect(badEmail.status).toBe(422);
    expect(badEmail.body.issues[0].path).toBe('email');
    const settings = await call(rewardsRoute as never, s.team.operator, 'GET', `/api/studies/${s.id}/rewards`, { id: s.id });
    expect(settings.body.versions[0]).toMatchObject({ designVersionId: s.version.id, enabled: true, currency: 'EUR', cap: null });
  });
});

describe('the session page', () => {
  it('shows the drawn payment on the completion screen and takes the address for the reward link there', async () => {
    pageRateLimiter.reset();
    const s = await setUp('Payouts: session page');
    const created = await linksPost(
      await requestAs(s.team.operator, 'POST', `/api/studies/${s.id}/session-links`, {
        json: { designVersionId: s.version.id, name: 'Paid wave', title: 'Choices about money and time', consentText: 'You agree to take part.', instructions: 'Choose the option you prefer.', completionCode: 'HARBOUR-7' },
      }),
      ctx({ id: s.id }),
    );
    expect(created.status).toBe(201);
    const slug = ((await created.json()) as { link: { path: string } }).link.path.replace('/s/', '');
    const post = async (body: unknown, cookie: string | null) => {
      const response = await pagePost(await requestAs(null, 'POST', `/api/session-page/${slug}`, { body: JSON.stringify(body), headers: cookie ? { cookie } : {} }), ctx({ slug }));
      const setCookie = response.headers.get('set-cookie');
      return { status: response.status, body: (await response.json()) as PageState, cookie: setCookie ? setCookie.split(';')[0]! : cookie };
    };
    const participantId = 'PG-pay';
    let r = await post({ action: 'consent', participantId, agree: true }, null);
    const cookie = r.cookie;
    r = await post({ action: 'begin', participantId }, cookie);
    // The payment details are refused before the session is complete.
    expect((await post({ action: 'payment-details', participantId, email: 'early@example.test' }, cookie)).status).toBe(409);
    for (let n = 0; n < 200 && r.body.step.kind === 'choice'; n++) {
      const step = r.body.step;
      r = await post({ action: 'answer', participantId, itemId: step.choice.itemId, chosen: n % 2 ? 'later' : 'sooner', responseTimeMs: 800, sideShown: 'left' }, cookie);
      expect(r.status).toBe(200);
    }
    expect(r.body.step.kind).toBe('complete');
    const completion = (r.body.step as Extract<PageState['step'], { kind: 'complete' }>).completion;
    expect(completion.code).toBe('HARBOUR-7');
    expect(completion.reward?.message).toMatch(/^One of your choices was drawn and is paid as you chose it: EUR \d+\.\d{2}, due /);
    expect(completion.reward?.needsDetails).toBe(true);
    const payout = (await Payout.findOne({ where: { studyId: s.study.id, participantId } }))!;
    expect(payout.status).toBe('held');
    expect(completion.reward?.dueDate).toBe(payout.dueDate);

    const bad = await post({ action: 'payment-details', participantId, email: 'nope' }, cookie);
    expect(bad.status).toBe(422);
    const saved = await post({ action: 'payment-details', participantId, email: 'pg-pay@example.test' }, cookie);
    expect(saved.status).toBe(200);
    const after = (saved.body.step as Extract<PageState['step'], { kind: 'complete' }>).completion.reward;
    expect(after?.needsDetails).toBe(false);
    expect((await payout.reload()).status).toBe('scheduled');
    // A reload shows the same draw; still one payout.
    const again = await pageGet(await requestAs(null, 'GET', `/api/session-page/${slug}?participantId=${participantId}`, { headers: { cookie: cookie! } }), ctx({ slug }));
    const state = (await again.json()) as PageState;
    expect(state.step.kind === 'complete' && state.step.completion.reward?.amount).toBe(after?.amount);
    expect(await Payout.count({ where: { studyId: s.study.id } })).toBe(1);
  });
});
