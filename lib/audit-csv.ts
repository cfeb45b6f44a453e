/**
 * Makes a cell safe to open in a spreadsheet: text starting with =, +, -, @, a tab or a carriage
 * return would be read as a formula, so it gets a leading apostrophe (common practice against
 * CSV formula injection). Everything else is left as it is.
 */
export function neutraliseCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** Quotes a cell when it holds a comma, quote or line break (RFC 4180), doubling inner quotes. */
function quote(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A CSV document (RFC 4180, CRLF line ends) of the given columns and rows, every cell neutralised
 * against formula injection.
 * @example toSafeCsv(['a'], [['=1+1']]) === "a\r\n'=1+1\r\n"
 */
export function toSafeCsv(header: string[], rows: Array<Array<string | number | null>>): string {
  const line = (cells: Array<string | number | null>) => cells.map((c) => quote(neutraliseCell(c === null ? '' : String(c)))).join(',');
  return [line(header), ...rows.map(line)].join('\r\n') + '\r\n';
}
