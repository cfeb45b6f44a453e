import { NotFoundError } from '@/lib/server/errors';

/**
 * The one parser of numeric route ids (studies, designs, priors, runs, members, invitations): a
 * positive whole number written with 1 to 10 digits and no sign, point or exponent, or null.
 */
export function parseRouteId(raw: string | undefined): number | null {
  if (!raw || !/^\d{1,10}$/.test(raw)) return null;
  const id = Number(raw);
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

/** Parses a numeric route parameter (`what`: "Study", "Design", ...); anything malformed is "<what> not found". */
export function parseEntityId(raw: string | undefined, what: string): number {
  const id = parseRouteId(raw);
  if (id === null) throw new NotFoundError(`${what} not found.`);
  return id;
}
