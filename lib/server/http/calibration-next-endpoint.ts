import type { PlainReply } from '@/lib/server/http/error-reply';
import { jsonReply } from '@/lib/server/http/error-reply';
import { parseJsonText } from '@/lib/server/http/read-json';
import { calibrationNextStep } from '@/lib/server/services/adaptive-calibration';
import { requireParticipantToken } from '@/lib/server/services/session-tokens';
import { calibrationNextRequestSchema } from '@/lib/shared/validations/session';
import { CAUTION, keyPresentation, sessionEndpoint, versionOfKey, type SessionCall } from './session-endpoints';

/**
 * POST /api/v1/studies/{id}/calibration-next: one step of a participant's adaptive calibration
 * (calibrationNextStep: idempotent per participant and step, answers stored server-side). The
 * reply carries the next item as the key's presentation words it, or `done` with the posterior
 * estimates and the `responses` to send to probe-items. Key, origin, rate limit and CORS as every
 * session endpoint (sessionEndpoint); a browser key acts only with the participant's session token.
 */
export function handleCalibrationNext(call: SessionCall): Promise<PlainReply> {
  return sessionEndpoint(call, async (key) => {
    const body = parseJsonText(await call.readBody(), calibrationNextRequestSchema);
    await requireParticipantToken(key, body.participantId, call.sessionToken ?? null);
    const version = await versionOfKey(key);
    const step = await calibrationNextStep(version, keyPresentation(key, version), body, { source: 'api', apiKeyId: key.id });
    return jsonReply(200, { participantId: body.participantId, designVersionId: version.id, ...step, caution: CAUTION });
  });
}
