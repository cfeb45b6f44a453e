/**
 * The one date format of the app, on pages and in e-mails: "2 Dec 2026, 14:05 UTC".
 * Always in UTC, so a page rendered on the server reads the same as in the browser and an
 * e-mail reads the same for everyone on the team, wherever they are.
 */
const DATE_TIME = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: 'UTC' });
const DATE = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

function toDate(value: string | Date): Date {
  return value instanceof Date ? value : new Date(value);
}

/** A moment as "2 Dec 2026, 14:05 UTC" ("—" for a value that is not a date). */
export function formatDateTime(value: string | Date): string {
  const date = toDate(value);
  if (Number.isNaN(date.getTime())) return '—';
  const parts = Object.fromEntries(DATE_TIME.formatToParts(date).map((p) => [p.type, p.value]));
  return `${parts.day} ${parts.month} ${parts.year}, ${parts.hour}:${parts.minute} UTC`;
}

/** A calendar day as "2 Dec 2026" (UTC), for dates without a time of day. */
export function formatDate(value: string | Date): string {
  const date = toDate(value);
  return Number.isNaN(date.getTime()) ? '—' : DATE.format(date);
}
