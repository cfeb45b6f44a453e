/** A timestamp as "2 Dec 2026, 14:05" in the reader's time zone. */
export function formatDateTime(iso: string): string {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' }).format(new Date(iso));
}
