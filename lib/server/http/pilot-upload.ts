import { readBodyText } from '@/lib/server/http/read-json';
import { PILOT_MAX_BYTES } from '@/lib/shared/validations/planner';

const TOO_BIG = 'The file is larger than 5 MB; upload at most 100,000 rows of participant, kSmall, kLarge.';

/** Reads a pilot upload's body as UTF-8 text, refusing more than 5 MB with 413 (declared or streamed). */
export function readPilotText(request: Request): Promise<string> {
  return readBodyText(request, PILOT_MAX_BYTES, TOO_BIG);
}
