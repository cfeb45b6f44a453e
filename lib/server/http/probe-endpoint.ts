import { parseRouteId } from '@/lib/server/route-ids';
import { ApiError } from '@/lib/server/errors';
import { errorReply, jsonReply, type PlainReply } from '@/lib/server/http/error-reply';
import { parseJsonText } from '@/lib/server/http/read-json';
import { requireApiKey } from '@/lib/server/services/api-keys';
import { frozenVersionById } from '@/lib/server/services/item-bank';
import { probeRateLimiter } from './key-rate-limit';
import { serveProbeItemsJson } from '@/lib/server/services/participants';
import { probeItemsRequestSchema } from '@/lib/shared/validations/item-bank';

export type ProbeItemsCall = {
  /** The `{id}` segment of /api/v1/studies/{id}/probe-items, as given. */
  studyId: string;
  /** The Authorization header's value, null when it is missing. */
  authorization: string | null;
  /**
   * Reads the body as text, throwing ApiError 413 past 1 MB (MAX_BODY_BYTES). Called only once
   * the key and the rate limit let the request through, so a refused caller's body is never read.
   */
  readBody: () => Promise<string>;
};

/**
 * POST /api/v1/studies/{id}/probe-items without a framework: a participant's personalised probe
 * block from their calibration responses, for a Bearer API key of the study. Every outcome is a
 * reply, errors included (statuses through `errorReply`). Both the Next route and the production
 * server's direct path (scripts/serve.mjs) answer with this one function.
 */
export async function handleProbeItems(call: ProbeItemsCall): Promise<PlainReply> {
  try {
    const key = await requireApiKey(call.authorization, parseRouteId(call.studyId) ?? -1);
    const wait = probeRateLimiter.take(key.id);
    if (wait > 0) return jsonReply(429, { error: `Too many requests for this key; retry in ${wait} s.` }, { 'Retry-After': String(wait) });
    const body = parseJsonText(await call.readBody(), probeItemsRequestSchema);
    const version = await frozenVersionById(key.designVersionId);
    if (version.studyId !== key.studyId) throw new ApiError(500, 'API key and design version disagree.');
    // The reply's JSON text as stored with the participant: built once, sent as is.
    const json = await serveProbeItemsJson(version, body.participantId, body.responses, { source: 'api', key });
    return { status: 200, headers: { 'content-type': 'application/json' }, body: json };
  } catch (error) {
    return errorReply(error);
  }
}
