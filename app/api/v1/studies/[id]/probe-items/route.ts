import { handleProbeItems } from '@/lib/server/http/probe-endpoint';
import { sessionPreflight, sessionRoute } from '@/lib/server/http/session-route';

/**
 * A participant's personalised probe block from their calibration responses (Bearer API key).
 * The logic is `handleProbeItems`; in production scripts/serve.mjs answers this path with it
 * directly, so this adapter serves `next dev` and tests that call the route.
 */
export const POST = sessionRoute(handleProbeItems);
export const OPTIONS = sessionPreflight('POST');
