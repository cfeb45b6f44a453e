import { createHash, randomBytes } from 'node:crypto';
import { db, rawQuery } from '@/db';
import { decodeJson } from '@/db/json';
import { ParticipantSession, SessionLink } from '@/db/models';
import { ApiError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '@/lib/server/errors';
import { participantIdSchema } from '@/lib/shared/validations/item-bank';
import type { PageAction } from '@/lib/shared/validations/session-links';
import type { PageLink, PageState } from '@/lib/shared/session-page';
import type { BankItem } from '@/lib/design';
import { bankOrInvalid, frozenVersionById, type FrozenVersionRef } from '../item-bank';
import { serveProbeItemsJson } from '../participants';
import { recordStage2Answers } from '../stage2-answers';
import { drawPayoutOnCompletion, savePaymentDetails } from '../payouts-draw';
import { nextCalibrationItem, type CalibrationAnswers } from './calibration-step';
import { currentStep, nextProbeItem, type PageItems, type PageProgress } from './steps';

// Switchback's own session page, for participants (public: no team cookie). A participant is
// known by the session token in their httpOnly cookie (only its SHA-256 is stored), and every
// request also names the participant id, which must be the token's. Answers land in the same
// tables as the session API's: calibration answers in participant_sessions until the block is
// done, then the participants row (served exactly as the API serves), then stage2_answers.

/** A refused step that carries the step the participant is really on (a stale tab, a changed answer). */
export class StepConflictError extends ConflictError {
  constructor(
    message: string,
    readonly state: PageState,
  ) {
    super(message);
  }
}

/** 410: the link was closed for good. */
export class LinkClosedError extends ApiError {
  constructor() {
    super(410, 'This study is closed and no longer takes part in new answers. Thank you for your interest.');
  }
}

const SLUG = /^[A-Za-z0-9_-]{16,32}$/;

/** A new link's path segment: 128 random bits, so links cannot be guessed from one another. */
export function newSlug(): string {
  return randomBytes(16).toString('base64url');
}

/** A new session token (handed to the participant's browser once, in the cookie). */
function newToken(): string {
  return randomBytes(24).toString('base64url');
}

function tokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

type OpenLink = { link: SessionLink; version: FrozenVersionRef; items: PageItems };

/** The frozen version's items as a link presents them (the version's default presentation, as the default export). */
export function pageItems(version: FrozenVersionRef): { items: PageItems; bank: ReturnType<typeof bankOrInvalid>['bank']; locate: ReturnType<typeof bankOrInvalid>['locate'] } {
  const { bank, locate } = bankOrInvalid(version);
  const calibration = bank.adaptive ? bank.adaptive.candidates : bank.items.filter((i) => i.block === 'calibration').sort((a, b) => a.position - b.position);
  return {
    bank,
    locate,
    items: { calibration, adaptive: bank.adaptive ? { design: version.content, bank } : null, probeLength: bank.items.filter((i) => i.block === 'probe').length, currency: version.content.spec.currency, delayUnit: bank.delayUnit },
  };
}

/** The link behind a page address, with its version's items; 404 for an unknown address. */
export async function openLinkBySlug(slug: string): Promise<OpenLink> {
  db();
  const link = SLUG.test(slug) ? await SessionLink.findOne({ where: { slug } }) : null;
  if (!link) throw new NotFoundError('There is no study at this address. Check the link you were given.');
  const version = await frozenVersionById(link.designVersionId);
  return { link, version, items: pageItems(version).items };
}

/** What participants see of a link. */
export function pageLinkOf(link: SessionLink): PageLink {
  return { title: link.title, consentText: link.consentText, instructions: link.instructions, participantParam: link.participantParam };
}

/** The participant id of a request, checked (422 naming the link's query parameter or the body field). */
export function readParticipantId(raw: string | null | undefined, field: string): string {
  const parsed = participantIdSchema.safeParse(raw ?? '');
  if (!parsed.success) {
    const message = raw ? parsed.error.issues[0]!.message : `This link needs your participant id in its address (?${field}=…); open the link exactly as you were given it.`;
    throw new ValidationError([{ path: field, message }], 'The participant id is missing or invalid.');
  }
  return parsed.data;
}

async function sessionOfToken(link: SessionLink, token: string | null): Promise<ParticipantSession | null> {
  if (!token || token.length > 100) return null;
  return ParticipantSession.findOne({ where: { tokenHash: tokenHash(token), sessionLinkId: link.id } });
}

const SELECT_SERVED = 'SELECT id, result FROM participants WHERE study_id = ? AND participant_id = ?';
const SELECT_ANSWERS = 'SELECT item_id, chosen FROM stage2_answers WHERE participant_ref = ?';

async function servedOf(link: SessionLink, participantId: string): Promise<{ ref: number; items: BankItem[] } | null> {
  const [row] = await rawQuery(SELECT_SERVED, [link.studyId, participantId]);
  if (!row) return null;
  const result = decodeJson(row.result as string | { items: BankItem[] }) as { items: BankItem[] };
  return { ref: Number(row.id), items: result.items };
}

async function progressOf(link: SessionLink, row: ParticipantSession): Promise<PageProgress> {
  const served = await servedOf(link, row.participantId);
  const stage2 = new Map<string, 'sooner' | 'later'>();
  if (served) for (const a of await rawQuery(SELECT_ANSWERS, [served.ref])) stage2.set(String(a.item_id), a.chosen === 'LL' ? 'later' : 'sooner');
  return {
    consented: row.consentedAt !== null,
    instructionsRead: row.instructionsReadAt !== null,
    calibration: (decodeJson(row.calibrationAnswers) ?? {}) as CalibrationAnswers,
    served: served?.items ?? null,
    stage2,
  };
}

/**
 * Serves the stage-2 items once the calibration block is complete, exactly as the probe-items
 * API does (serveProbeItemsJson: idempotent, one participants row), and moves the session to
 * `served`. Runs again harmlessly after a lost reply or a crash between the two writes.
 */
async function ensureServed(open: OpenLink, row: ParticipantSession, progress: PageProgress): Promise<PageProgress> {
  if (progress.served || nextCalibrationItem(open.items, progress.calibration, row.participantId) !== null) return progress;
  await serveProbeItemsJson(open.version, row.participantId, { ...progress.calibration }, { source: 'page' });
  const now = new Date();
  await rawQuery(
    "UPDATE participant_sessions SET status = IF(status IN ('started', 'calibrated'), 'served', status), calibrated_at = COALESCE(calibrated_at, ?), served_at = COALESCE(served_at, ?), last_activity_at = ? WHERE id = ?",
    [now, now, now, row.id],
  );
  return progressOf(open.link, row);
}

async function stateOf(open: OpenLink, row: ParticipantSession, notice?: string): Promise<PageState> {
  const progress = await ensureServed(open, row, await progressOf(open.link, row));
  const step = currentStep(open.link, row.participantId, open.items, progress);
  if (step.kind === 'complete') {
    // Real rewards: the drawn choice (drawn when the last answer was recorded; drawn here if that failed).
    const reward = await drawPayoutOnCompletion({ studyId: open.link.studyId, participantId: row.participantId });
    if (reward) step.completion.reward = { message: reward.message, amount: reward.amount, currency: reward.currency, dueDate: reward.dueDate, needsDetails: reward.needsDetails };
  }
  return { link: pageLinkOf(open.link), participantId: row.participantId, step, ...(notice ? { notice } : {}) };
}

async function startedElsewhere(link: SessionLink, participantId: string): Promise<boolean> {
  const [row] = await rawQuery('SELECT id FROM participant_sessions WHERE study_id = ? AND participant_id = ?', [link.studyId, participantId]);
  return row !== undefined;
}

const ELSEWHERE = (participantId: string) =>
  `Participant ${participantId} has already started this study in another browser or on another device; please continue there. (If this is a mistake, contact the research team.)`;

/**
 * The step a participant is on (GET). Nothing is written: a participant who has not agreed to
 * the consent text has no record. A paused or closed link answers with that step.
 */
export async function readPageState(slug: string, rawParticipantId: string | null, token: string | null): Promise<PageState> {
  const open = await openLinkBySlug(slug);
  const participantId = readParticipantId(rawParticipantId, open.link.participantParam);
  if (open.link.status !== 'open') return { link: pageLinkOf(open.link), participantId, step: { kind: 'unavailable', reason: open.link.status } };
  const row = await sessionOfToken(open.link, token);
  if (row && row.participantId === participantId) return stateOf(open, row);
  if (await startedElsewhere(open.link, participantId)) throw new ForbiddenError(ELSEWHERE(participantId));
  return { link: pageLinkOf(open.link), participantId, step: { kind: 'consent' } };
}

/** The outcome of a step: the state to show, and a new session token for the cookie when one was issued. */
export type ActionOutcome = { state: PageState; token: string | null };

const ER_DUP_ENTRY = 1062;

/**
 * One step of a participant (POST): consent (starts the session and issues its token), begin
 * (instructions read), or an answer to the item they are on. Answers are idempotent per item: the
 * same answer again records nothing and replies with the current step; a different answer to an
 * answered item, or an answer to an item that is not the current one (a stale tab), is 409 with
 * the step the participant is really on. 409 on a paused link, 410 on a closed one.
 */
export async function takePageAction(slug: string, action: PageAction, token: string | null): Promise<ActionOutcome> {
  const open = await openLinkBySlug(slug);
  if (open.link.status === 'closed') throw new LinkClosedError();
  if (open.link.status === 'paused') throw new ConflictError('This study is paused for now; nothing was recorded. Please try again later.');
  const row = await sessionOfToken(open.link, token);
  const own = row && row.participantId === action.participantId ? row : null;
  if (action.action === 'consent') {
    if (own) return { state: await stateOf(open, own), token: null };
    return consent(open, action.participantId);
  }
  if (!own) {
    if (await startedElsewhere(open.link, action.participantId)) throw new ForbiddenError(ELSEWHERE(action.participantId));
    throw new StepConflictError('Agree to the consent text first.', { link: pageLinkOf(open.link), participantId: action.participantId, step: { kind: 'consent' } });
  }
  const now = new Date();
  if (action.action === 'begin') {
    await own.update({ instructionsReadAt: own.instructionsReadAt ?? now, lastActivityAt: now });
    return { state: await stateOf(open, own), token: null };
  }
  if (action.action === 'payment-details') {
    // real rewards: an address for the reward link, taken once the session is complete
    if ((await stateOf(open, own)).step.kind !== 'complete') throw new StepConflictError('Finish the choices first.', await stateOf(open, own));
    await savePaymentDetails({ studyId: open.link.studyId, participantId: own.participantId, email: action.email });
    return { state: await stateOf(open, own), token: null };
  }
  if (!own.instructionsReadAt) throw new StepConflictError('Read the instructions first.', await stateOf(open, own));
  return { state: await answer(open, own, action), token: null };
}

async function consent(open: OpenLink, participantId: string): Promise<ActionOutcome> {
  const token = newToken();
  const now = new Date();
  try {
    const row = await ParticipantSession.create({
      studyId: open.link.studyId,
      designVersionId: open.link.designVersionId,
      participantId,
      status: 'started',
      source: 'page',
      apiKeyId: null,
      calibrationAnswers: {},
      startedAt: now,
      calibratedAt: null,
      servedAt: null,
      completedAt: null,
      lastActivityAt: now,
      tokenHash: tokenHash(token),
      sessionLinkId: open.link.id,
      consentedAt: now,
      instructionsReadAt: null,
    });
    return { state: await stateOf(open, row), token };
  } catch (error) {
    const errno = (error as { parent?: { errno?: number }; original?: { errno?: number } }).parent?.errno ?? (error as { original?: { errno?: number } }).original?.errno;
    if (errno === ER_DUP_ENTRY || (error as { name?: string }).name === 'SequelizeUniqueConstraintError') throw new ForbiddenError(ELSEWHERE(participantId));
    throw error;
  }
}

type AnswerAction = Extract<PageAction, { action: 'answer' }>;

async function answer(open: OpenLink, row: ParticipantSession, action: AnswerAction): Promise<PageState> {
  const served = await servedOf(open.link, row.participantId);
  if (!served) {
    const outcome = await answerCalibration(open, row, action);
    if (outcome === 'recorded') return stateOf(open, await ParticipantSession.findByPk(row.id).then((r) => r!));
    return refuse(open, row, action, outcome);
  }
  const stored = new Map((await rawQuery(SELECT_ANSWERS, [served.ref])).map((a) => [String(a.item_id), a.chosen === 'LL' ? 'later' : 'sooner']));
  const previous = stored.get(action.itemId);
  if (previous !== undefined) return refuse(open, row, action, previous === action.chosen ? 'replay' : 'changed');
  if (nextProbeItem(served.items, stored)?.id !== action.itemId) return refuse(open, row, action, 'not-current');
  try {
    await recordStage2Answers({
      studyId: open.link.studyId,
      designVersionId: open.link.designVersionId,
      participantId: row.participantId,
      answers: [{ itemId: action.itemId, chosen: action.chosen === 'later' ? 'LL' : 'SS', responseMs: action.responseTimeMs ?? null, sideShown: action.sideShown ?? null }],
      source: 'page',
    });
  } catch (error) {
    // a second tab or a double click with another answer won the race for this item
    if (error instanceof ConflictError) return refuse(open, row, action, 'changed');
    throw error;
  }
  return stateOf(open, row);
}

type CalibrationOutcome = 'recorded' | 'replay' | 'changed' | 'not-current';

/** One calibration answer, under a lock on the session row so parallel requests see each other's answers. */
async function answerCalibration(open: OpenLink, row: ParticipantSession, action: AnswerAction): Promise<CalibrationOutcome> {
  return db().transaction(async (transaction) => {
    const locked = await ParticipantSession.findByPk(row.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!locked) throw new NotFoundError('This session no longer exists.');
    const answers: Record<string, 'sooner' | 'later'> = { ...((decodeJson(locked.calibrationAnswers) ?? {}) as CalibrationAnswers) };
    const previous = answers[action.itemId];
    if (previous !== undefined) return previous === action.chosen ? 'replay' : 'changed';
    if (nextCalibrationItem(open.items, answers, row.participantId)?.id !== action.itemId) return 'not-current';
    answers[action.itemId] = action.chosen;
    const now = new Date();
    const complete = nextCalibrationItem(open.items, answers, row.participantId) === null;
    await locked.update({ calibrationAnswers: answers, lastActivityAt: now, ...(complete ? { status: 'calibrated' as const, calibratedAt: now } : {}) }, { transaction });
    return 'recorded';
  });
}

async function refuse(open: OpenLink, row: ParticipantSession, action: AnswerAction, outcome: Exclude<CalibrationOutcome, 'recorded'>): Promise<PageState> {
  const fresh = (await ParticipantSession.findByPk(row.id)) ?? row;
  if (outcome === 'replay') return stateOf(open, fresh, 'That answer was already recorded.');
  const state = await stateOf(open, fresh, 'This page had fallen behind (another tab or a repeated click); here is your current question.');
  if (outcome === 'changed') throw new StepConflictError(`${action.itemId} already has a different answer; the first answer stays.`, state);
  throw new StepConflictError(`${action.itemId} is not the current question; here is the current one.`, state);
}
