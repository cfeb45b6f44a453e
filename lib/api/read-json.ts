import type { z } from 'zod';
import { ApiError, ValidationError } from './errors';
import { zodIssues } from './handler';

export const MAX_BODY_BYTES = 1_000_000;

/**
 * Reads a JSON body and parses it with `schema`. Bodies over 1 MB → 413, malformed JSON → 400,
 * wrong types or unknown fields (schemas are strict) → 422 naming the fields.
 */
export async function readJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > MAX_BODY_BYTES) throw new ApiError(413, 'The request body is larger than 1 MB.');
  const text = await readLimited(request);
  let data: unknown;
  try {
    data = text.length ? JSON.parse(text) : undefined;
  } catch {
    throw new ApiError(400, 'The request body is not valid JSON.');
  }
  const parsed = schema.safeParse(data);
  if (!parsed.success) throw new ValidationError(zodIssues(parsed.error));
  return parsed.data;
}

async function readLimited(request: Request): Promise<string> {
  if (!request.body) return '';
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > MAX_BODY_BYTES) {
      await reader.cancel();
      throw new ApiError(413, 'The request body is larger than 1 MB.');
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString('utf8');
}
