import { readBodyText } from '@/lib/server/http/read-json';
import { ValidationError } from '@/lib/server/errors';
import { MODEL_CHOICES, PILOT_MAX_BYTES, pilotQuerySchema } from '@/lib/shared/validations/planner';

const TOO_BIG = 'The file is larger than 5 MB; upload at most 100,000 rows of participant, kSmall, kLarge.';

/** Reads a pilot upload's body as UTF-8 text, refusing more than 5 MB with 413 (declared or streamed). */
export function readPilotText(request: Request): Promise<string> {
  return readBodyText(request, PILOT_MAX_BYTES, TOO_BIG);
}

/** The model named in a pilot upload's query (?model=…, default hyperbolic); 422 naming "model" for an unknown one. */
export function readPilotModel(request: Request): { id: (typeof MODEL_CHOICES)[number] } {
  const parsed = pilotQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
  return { id: parsed.data.model };
}
