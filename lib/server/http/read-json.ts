import type { z } from 'zod';
import { ApiError, ValidationError } from '@/lib/server/errors';
import { zodIssues } from './error-reply';

export const MAX_BODY_BYTES = 1_000_000;

/**
 * Reads a JSON body and parses it with `schema`. Bodies over 1 MB → 413, malformed JSON → 400,
 * wrong types or unknown fields (schemas are strict) → 422 naming the fields.
 */
export async function readJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  return parseJsonText(await readBodyText(request, MAX_BODY_BYTES, BODY_TOO_LARGE), schema);
}

export const BODY_TOO_LARGE = 'The request body is larger than 1 MB.';

/** Parses a body already read as text: malformed JSON → 400, schema failures → 422 naming the fields. */
export function parseJsonText<S extends z.ZodType>(text: string, schema: S): z.infer<S> {
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

/**
 * Reads a body as UTF-8 text, refusing more than `maxBytes` with 413 and `tooBig` as the message,
 * whether the size is declared up front or only seen while streaming.
 */
export async function readBodyText(request: Request, maxBytes: number, tooBig: string): Promise<string> {
  if (Number(request.headers.get('content-length') ?? '0') > maxBytes) throw new ApiError(413, tooBig);
  if (!request.body) return '';
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel();
      throw new ApiError(413, tooBig);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/** Parses a request's query parameters with `schema` (strict): unknown or bad parameters → 422 naming them. */
export function readQuery<S extends z.ZodType>(request: Request, schema: S): z.infer<S> {
  const parsed = schema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
  return parsed.data;
}
