import { handleStage2Answers } from '@/lib/server/http/session-endpoints';
import { sessionPreflight, sessionRoute } from '@/lib/server/http/session-route';

/** A participant's answers to their stage-2 items (Bearer API key). */
export const POST = sessionRoute(handleStage2Answers);
export const OPTIONS = sessionPreflight('POST');
