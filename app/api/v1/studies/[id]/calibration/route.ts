import { handleCalibration } from '@/lib/server/http/session-endpoints';
import { sessionPreflight, sessionRoute } from '@/lib/server/http/session-route';

/** The key's calibration block as the lab presents it; starts a participant's session (Bearer API key). */
export const GET = sessionRoute(handleCalibration);
export const OPTIONS = sessionPreflight('GET');
