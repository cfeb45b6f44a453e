/**
 * Spreadsheet formula injection: a cell whose text starts with = + - @, a tab or a carriage
 * return may be run as a formula when the CSV is opened in a spreadsheet. Such cells get a
 * leading apostrophe, which spreadsheets show as text and hide (common practice, as
 * recommended by OWASP's "CSV Injection" page). Numbers are left alone: they are written as
 * numbers, so a negative number is not a formula.
 *
 * @example neutraliseCell('=1+1') // "'=1+1"
 */
export function neutraliseCell(value: unknown): unknown {
  if (typeof value !== 'string') return value;
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** Every string cell of every row neutralised (see neutraliseCell); a new array of new rows. */
export function neutraliseRows<T extends Record<string, unknown>>(rows: readonly T[]): T[] {
  return rows.map((row) => Object.fromEntries(Object.entries(row).map(([k, v]) => [k, neutraliseCell(v)])) as T);
}

/** The original text of a neutralised cell (for reading our own exports back). */
export function restoreCell(value: string): string {
  return /^'[=+\-@\t\r]/.test(value) ? value.slice(1) : value;
}

/** Quotes a cell when it holds a comma, quote or line break (RFC 4180), doubling inner quotes. */
function quote(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A small CSV document (RFC 4180, CRLF line ends) of the given columns and rows, every text cell
 * neutralised against formula injection; numbers are written as they are.
 * @example toSafeCsv(['a'], [['=1+1']]) === "a\r\n'=1+1\r\n"
 */
export function toSafeCsv(header: string[], rows: Array<Array<string | number | null>>): string {
  const line = (cells: Array<string | number | null>) => cells.map((c) => quote(c === null ? '' : String(neutraliseCell(c)))).join(',');
  return [line(header), ...rows.map(line)].join('\r\n') + '\r\n';
}
