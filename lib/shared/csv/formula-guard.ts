/**
 * Spreadsheet formula injection: a cell whose text starts with = + - @, a tab or a carriage
 * return may be run as a formula when the CSV is opened in a spreadsheet. Such cells get a
 * leading apostrophe, which spreadsheets show as text and hide (common practice, as
 * recommended by OWASP's "CSV Injection" page). Numbers are left alone: they are written as
 * numbers, so a negative number is not a formula.
 *
 * @example neutraliseCell('=1+1') // "'=1+1"
 */
export function neutraliseCell<T>(value: T): T | string {
  if (typeof value !== 'string') return value;
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** The original text of a neutralised cell (for reading our own exports back). */
export function restoreCell(value: string): string {
  return /^'[=+\-@\t\r]/.test(value) ? value.slice(1) : value;
}
