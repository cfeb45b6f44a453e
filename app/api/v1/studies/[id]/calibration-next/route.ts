import { handleCalibrationNext } from '@/lib/server/http/calibration-next-endpoint';
import { sessionPreflight, sessionRoute } from '@/lib/server/http/session-route';

/** One step of a participant's adaptive calibration (Bearer API key). */
export const POST = sessionRoute(handleCalibrationNext);
export const OPTIONS = sessionPreflight('POST');
