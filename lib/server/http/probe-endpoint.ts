import { ValidationError } from '@/lib/server/errors';
import type { PlainReply } from '@/lib/server/http/error-reply';
import { parseJsonText } from '@/lib/server/http/read-json';
import { keyPresentation, sessionEndpoint, versionOfKey, type SessionCall } from './session-endpoints';
import { requireParticipantToken } from '@/lib/server/services/session-tokens';
import { itemBankId } from '@/lib/server/services/item-bank-id';
import { serveProbeItemsJson } from '@/lib/server/services/participants';
import { probeItemsRequestSchema } from '@/lib/shared/validations/item-bank';

/** One call of the probe-items endpoint (a session-endpoint call: key, origin, token, body). */
export type ProbeItemsCall = SessionCall;

/**
 * POST /api/v1/studies/{id}/probe-items without a framework: a participant's personalised probe
 * block from their calibration responses, for a key of the study, scored with the items of the
 * key's presentation settings (the same as its calibration block and an export with them). A
 * request naming another item bank (`itemBankId`) is refused, never rescored. Every outcome is a
 * reply, errors included (statuses through `errorReply`, CORS through `sessionEndpoint`). Both the
 * Next route and the production server's direct path (scripts/serve.mjs) answer with this function.
 */
export function handleProbeItems(call: ProbeItemsCall): Promise<PlainReply> {
  return sessionEndpoint(call, async (key) => {
    const body = parseJsonText(await call.readBody(), probeItemsRequestSchema);
    const version = await versionOfKey(key);
    const presentation = keyPresentation(key, version);
    if (body.itemBankId !== undefined) {
      const expected = itemBankId(version.hash, presentation);
      if (body.itemBankId !== expected) {
        throw new ValidationError(
          [{ path: 'itemBankId', message: `These calibration answers are for item bank ${body.itemBankId}, but this key presents and scores item bank ${expected} (delays in ${presentation.delayUnit}, gap ${presentation.minGap}, seed ${presentation.seed}). Export the items with the key's settings, or use a key bound to the export's settings.` }],
          'The calibration items do not match this key\'s item bank; nothing was scored.',
        );
      }
    }
    await requireParticipantToken(key, body.participantId, call.sessionToken ?? null);
    // The reply's JSON text as stored with the participant: built once, sent as is. Serving through
    // a key also records the participant's session as served.
    const json = await serveProbeItemsJson(version, body.participantId, body.responses, { source: 'api', key }, presentation);
    return { status: 200, headers: { 'content-type': 'application/json' }, body: json };
  });
}
