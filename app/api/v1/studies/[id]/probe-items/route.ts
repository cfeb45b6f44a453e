import type { NextRequest } from 'next/server';
import { toNextResponse } from '@/lib/server/http/handler';
import { BODY_TOO_LARGE, MAX_BODY_BYTES, readBodyText } from '@/lib/server/http/read-json';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';

/**
 * A participant's personalised probe block from their calibration responses (Bearer API key).
 * The logic is `handleProbeItems`; in production scripts/serve.mjs answers this path with it
 * directly, so this adapter serves `next dev` and tests that call the route.
 */
export async function POST(request: NextRequest, { params }: { params: Promise<{ id: string }> }): Promise<Response> {
  const { id } = await params;
  const reply = await handleProbeItems({
    studyId: id,
    authorization: request.headers.get('authorization'),
    readBody: () => readBodyText(request, MAX_BODY_BYTES, BODY_TOO_LARGE),
  });
  return toNextResponse(reply);
}
