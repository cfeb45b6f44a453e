import { NotFoundError } from '@/lib/server/errors';

/** Parses a numeric route parameter (prior or design id); anything malformed is "not found". */
export function parseEntityId(raw: string | undefined, what: string): number {
  const id = Number(raw);
  if (!raw || !/^\d{1,10}$/.test(raw) || !Number.isSafeInteger(id) || id <= 0) throw new NotFoundError(`${what} not found.`);
  return id;
}
