import { ApiError } from '@/lib/api/errors';
import { PILOT_MAX_BYTES } from '@/lib/validations/design';

const TOO_BIG = 'The file is larger than 5 MB; upload at most 100,000 rows of participant, kSmall, kLarge.';

/** Reads a pilot upload's body as UTF-8 text, refusing more than 5 MB with 413 (declared or streamed). */
export async function readPilotText(request: Request): Promise<string> {
  if (Number(request.headers.get('content-length') ?? '0') > PILOT_MAX_BYTES) throw new ApiError(413, TOO_BIG);
  if (!request.body) return '';
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > PILOT_MAX_BYTES) {
      await reader.cancel();
      throw new ApiError(413, TOO_BIG);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString('utf8');
}
