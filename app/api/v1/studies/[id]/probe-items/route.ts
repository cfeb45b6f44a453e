import { NextResponse } from 'next/server';
import { ApiError } from '@/lib/api/errors';
import { route } from '@/lib/api/handler';
import { readJson } from '@/lib/api/read-json';
import { requireApiKey } from '@/lib/services/api-keys';
import { frozenVersionById } from '@/lib/services/item-bank';
import { probeRateLimiter } from '@/lib/services/item-bank-rate-limit';
import { serveProbeItemsJson } from '@/lib/services/participants';
import { probeItemsRequestSchema } from '@/lib/validations/item-bank';

/** A participant's personalised probe block from their calibration responses (Bearer API key). */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const key = await requireApiKey(request, /^\d{1,10}$/.test(id) ? Number(id) : -1);
  const wait = probeRateLimiter.take(key.id);
  if (wait > 0) {
    return NextResponse.json({ error: `Too many requests for this key; retry in ${wait} s.` }, { status: 429, headers: { 'Retry-After': String(wait) } });
  }
  const body = await readJson(request, probeItemsRequestSchema);
  const version = await frozenVersionById(key.designVersionId);
  if (version.studyId !== key.studyId) throw new ApiError(500, 'API key and design version disagree.');
  // The reply's JSON text as stored with the participant: built once, sent as is.
  const json = await serveProbeItemsJson(version, body.participantId, body.responses, { source: 'api', key });
  return new NextResponse(json, { headers: { 'content-type': 'application/json' } });
});
