import { ApiError, ForbiddenError, ValidationError } from '@/lib/server/errors';
import { errorReply, jsonReply, type PlainReply } from '@/lib/server/http/error-reply';
import { parseJsonText } from '@/lib/server/http/read-json';
import { createRandom, participantSeed, shuffle } from '@/lib/design';
import { RevokedKeyError, requireApiKey, type CachedKey } from '@/lib/server/services/api-keys';
import { bankOrInvalid, frozenVersionById, type FrozenVersionRef } from '@/lib/server/services/item-bank';
import { itemBankId, presentationOf, type Presentation } from '@/lib/server/services/item-bank-id';
import { KeyRateLimiter, probeRateLimiter } from '@/lib/server/http/key-rate-limit';
import { calibrationQuerySchema, stage2AnswersRequestSchema } from '@/lib/shared/validations/session';
import { paymentDetailsSchema } from '@/lib/shared/validations/payouts';
import { savePaymentDetails } from '@/lib/server/services/payouts-draw';
import { withCors } from '@/lib/server/http/cors';
import { recordStage2Answers } from '@/lib/server/services/stage2-answers';
import { requireParticipantToken, startSession } from '@/lib/server/services/session-tokens';
import { parseRouteId } from '@/lib/server/route-ids';
import { probeApiEnv } from '@/lib/server/env';

/** One request to a participant-session endpoint, without a framework (the Next routes and serve.mjs build it). */
export type SessionCall = {
  /** the `{id}` segment of /api/v1/studies/{id}/…, as given */
  studyId: string;
  /** the Authorization header, null when missing */
  authorization: string | null;
  /** the Origin header, null or absent when missing (server-to-server calls) */
  origin?: string | null;
  /** the X-Session-Token header, null or absent when missing */
  sessionToken?: string | null;
  /** the query string (absent: empty) */
  query?: URLSearchParams;
  /** reads the body as text (413 past 1 MB); called only once the key and the rate limit let the request through */
  readBody: () => Promise<string>;
};

export const CAUTION = 'Estimates describe hypothetical choices of this participant; they are not a clinical assessment.';

/**
 * Browser keys have a limiter of their own (BROWSER_API_BURST, default 120; BROWSER_API_PER_SECOND,
 * default 30): a key shipped in a public page should not be able to use a server key's budget.
 */
export const browserRateLimiter = new KeyRateLimiter(probeApiEnv().BROWSER_API_BURST, probeApiEnv().BROWSER_API_PER_SECOND, undefined, 'browser');

/** The study id segment as a number, -1 when it is not one (the key check then answers 404). */
export function studyIdOf(raw: string): number {
  return parseRouteId(raw) ?? -1;
}

/** A key's presentation settings (what its calibration block, scoring and item-bank id use). */
export function keyPresentation(key: CachedKey, version: FrozenVersionRef): Presentation {
  return presentationOf(version.hash, { seed: key.seed, delayUnit: key.delayUnit, minGap: key.minGap });
}

/**
 * Runs a session endpoint: the key of the study (401/404), its origin rule (a browser key only
 * from its listed origins; any key refuses a browser origin it does not list: 403), its rate
 * limit (429 with Retry-After; shared by every app process when REDIS_URL is set), then `run`.
 * Every outcome, errors included, leaves with the CORS
 * headers that fit the request's origin.
 */
export async function sessionEndpoint(call: SessionCall, run: (key: CachedKey) => Promise<PlainReply>): Promise<PlainReply> {
  const studyId = studyIdOf(call.studyId);
  let key: CachedKey | null = null;
  let reply: PlainReply;
  try {
    key = await requireApiKey(call.authorization, studyId);
    const origin = call.origin ? call.origin.toLowerCase() : null;
    if (key.kind === 'browser' && origin === null) throw new ForbiddenError('A browser key is used from a web page: this request carries no Origin.');
    if (origin !== null && !key.allowedOrigins.includes(origin)) throw new ForbiddenError(`This key may not be used from ${call.origin}; an operator can add the origin to the key's list.`);
    const wait = await (key.kind === 'browser' ? browserRateLimiter : probeRateLimiter).takeShared(key.id);
    reply = wait > 0 ? jsonReply(429, { error: `Too many requests for this key; retry in ${wait} s.` }, { 'Retry-After': String(wait) }) : await run(key);
  } catch (error) {
    reply = errorReply(error);
    // a revoked key of this study: its own origins may read the 401 (no other active key may list them)
    if (error instanceof RevokedKeyError && error.key.studyId === studyId) key = error.key;
  }
  return withCors(reply, studyId < 0 ? null : studyId, call.origin ?? null, key);
}

/** The frozen version a key serves, checked against the key's study. */
export async function versionOfKey(key: CachedKey): Promise<FrozenVersionRef> {
  const version = await frozenVersionById(key.designVersionId);
  if (version.studyId !== key.studyId) throw new ApiError(500, 'API key and design version disagree.');
  return version;
}

/**
 * GET /api/v1/studies/{id}/calibration: the key's calibration block exactly as the lab presents it
 * (the key's delay unit, gap and seed; amounts, currency, wording and sides as exported with those
 * settings), with its item-bank id. With a participant id it starts that participant's session;
 * `order=participant` shuffles the block for them (seeded by the bank's seed and their id, so
 * every call gives the same order). A browser key needs a participant id.
 */
export function handleCalibration(call: SessionCall): Promise<PlainReply> {
  return sessionEndpoint(call, async (key) => {
    const parsed = calibrationQuerySchema.safeParse(Object.fromEntries(call.query ?? []));
    if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
    const { participantId, order } = parsed.data;
    if (key.kind === 'browser' && !participantId) throw new ValidationError([{ path: 'participantId', message: 'A browser key fetches the calibration block for one participant: give participantId.' }]);
    if (order === 'participant' && !participantId) throw new ValidationError([{ path: 'order', message: 'order=participant needs a participantId.' }]);
    const version = await versionOfKey(key);
    const presentation = keyPresentation(key, version);
    const { bank } = bankOrInvalid(version, presentation);
    let items = bank.items.filter((i) => i.block === 'calibration');
    if (order === 'participant' && participantId) {
      const random = createRandom({ seed: participantSeed(bank.seed, `calibration:${participantId}`) });
      items = shuffle(items, random).map((item, index) => Object.assign({}, item, { position: index + 1 }));
    }
    const session = participantId ? await startSession(key, version, participantId, call.sessionToken ?? null) : { sessionToken: null };
    return jsonReply(200, {
      participantId: participantId ?? null,
      designVersionId: version.id,
      designHash: version.hash,
      itemBankId: itemBankId(version.hash, presentation),
      presentation: { ...presentation, amountUnit: bank.amountUnit, currency: version.content.spec.currency, monthDays: 30 },
      order,
      items,
      ...(session.sessionToken ? { sessionToken: session.sessionToken } : {}),
      caution: CAUTION,
    });
  });
}

/**
 * POST /api/v1/studies/{id}/stage2-answers: some or all of a participant's answers to the stage-2
 * items served to them (recordStage2Answers: idempotent, 409 on a changed answer, 422 for items
 * not served or answers before calibration). The reply says how much of the block is answered.
 */
export function handleStage2Answers(call: SessionCall): Promise<PlainReply> {
  return sessionEndpoint(call, async (key) => {
    const body = parseJsonText(await call.readBody(), stage2AnswersRequestSchema);
    await requireParticipantToken(key, body.participantId, call.sessionToken ?? null);
    const result = await recordStage2Answers({
      studyId: key.studyId,
      designVersionId: key.designVersionId,
      participantId: body.participantId,
      answers: body.answers.map((a) => ({ itemId: a.itemId, chosen: a.chosen === 'sooner' ? 'SS' : 'LL', responseMs: a.responseTimeMs ?? null, sideShown: a.sideShown ?? null })),
      source: 'api',
      apiKeyId: key.id,
    });
    return jsonReply(200, result);
  });
}

/**
 * POST /api/v1/studies/{id}/payment-details (real rewards): where a participant's reward link goes
 * (an e-mail address; nothing more is kept). A payout held for want of it is scheduled. A browser
 * key needs the participant's session token, like every other call for one participant.
 */
export function handlePaymentDetails(call: SessionCall): Promise<PlainReply> {
  return sessionEndpoint(call, async (key) => {
    const body = parseJsonText(await call.readBody(), paymentDetailsSchema);
    await requireParticipantToken(key, body.participantId, call.sessionToken ?? null);
    return jsonReply(200, await savePaymentDetails({ studyId: key.studyId, participantId: body.participantId, email: body.email }));
  });
}
