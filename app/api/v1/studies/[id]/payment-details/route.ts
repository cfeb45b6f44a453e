import { handlePaymentDetails } from '@/lib/server/http/session-endpoints';
import { sessionPreflight, sessionRoute } from '@/lib/server/http/session-route';

/** Where a participant's reward link goes, for studies with real rewards (Bearer API key). */
export const POST = sessionRoute(handlePaymentDetails);
export const OPTIONS = sessionPreflight('POST');
