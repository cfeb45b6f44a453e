// The one CSV writer of the app: every file the app writes as CSV (item banks, served
// participants, batch results, power results, the audit trail, the offline answer sheet) is built
// here, so every cell — column names and comment lines included — passes the formula guard.

import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { neutraliseCell } from './formula-guard';

export { neutraliseCell, restoreCell } from './formula-guard';

/** A cell's value: text, a number, a flag, or empty. */
export type CsvCell = string | number | boolean | null | undefined;

/**
 * One cell as CSV text: guarded (neutraliseCell), then quoted when it holds a quote, a line break
 * or a separator — the comma of RFC 4180, and also the semicolon and tab that spreadsheets in many
 * locales split on, so no part of a cell can become a cell of its own. Non-finite numbers are empty.
 */
export function csvCell(value: CsvCell | unknown): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return String(value);
  const text = String(neutraliseCell(typeof value === 'string' ? value : JSON.stringify(value)));
  return /[",;\t\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * A comment line ("# ..."), which readers that know the convention skip and spreadsheets show as
 * ordinary cells. It must stay one unquoted line that starts with "#", so double quotes become
 * single ones and line breaks and tabs spaces, and every piece a spreadsheet would read as a cell
 * of its own (split at commas and semicolons) passes the formula guard.
 */
export function csvComment(text: string): string {
  const flat = `# ${text}`.replace(/[\r\n\t]+/g, ' ').replace(/"/g, "'");
  return flat
    .split(/([,;])/)
    .map((piece) => (piece === ',' || piece === ';' ? piece : String(neutraliseCell(piece))))
    .join('');
}

const LINE_END = '\r\n';

/** Options of a CSV document: the column names, the rows, and comment lines above them. */
export type CsvDocument = {
  columns: readonly string[];
  rows: ReadonlyArray<ReadonlyArray<CsvCell | unknown>>;
  comments?: readonly string[];
};

/**
 * A CSV document (RFC 4180, CRLF line ends, a line end after the last row): comment lines, the
 * column names, then one line per row, every cell through the formula guard.
 * @example toCsv({ columns: ['a'], rows: [['=1+1']] }) === "a\r\n'=1+1\r\n"
 */
export function toCsv({ columns, rows, comments = [] }: CsvDocument): string {
  const lines = [...comments.map(csvComment), columns.map(csvCell).join(','), ...rows.map((row) => row.map(csvCell).join(','))];
  return lines.join(LINE_END) + LINE_END;
}

/**
 * A CSV document of records: one column per key (`columns`, or every key in order of first
 * appearance), one line per record, a missing value as an empty cell.
 * @example recordsToCsv({ records: [{ a: 1, b: '@x' }] }) === "a,b\r\n1,'@x\r\n"
 */
export function recordsToCsv({ records, columns, comments }: { records: ReadonlyArray<Record<string, unknown>>; columns?: readonly string[]; comments?: readonly string[] }): string {
  const keys = columns ?? [...new Set(records.flatMap((record) => Object.keys(record)))];
  return toCsv({ columns: keys, rows: records.map((record) => keys.map((key) => record[key])), comments });
}

/** The last column of every per-person CSV: the caution, on every row, as an ordinary cell. */
export const CAUTION_COLUMN = 'caution';

/**
 * A CSV of records about people (participants, sessions, estimates, analyses): recordsToCsv with a
 * last column `caution` holding PERSON_CAUTION on every row. A column rather than comment lines,
 * so the file stays a plain table for spreadsheets and survey imports, and the caution travels
 * with any row copied out of it.
 * @example personRecordsCsv({ records: [{ a: 1 }] }).split('\r\n')[0] === 'a,caution'
 */
export function personRecordsCsv({ records, columns }: { records: ReadonlyArray<Record<string, unknown>>; columns?: readonly string[] }): string {
  const keys = (columns ?? [...new Set(records.flatMap((record) => Object.keys(record)))]).filter((key) => key !== CAUTION_COLUMN);
  return toCsv({ columns: [...keys, CAUTION_COLUMN], rows: records.map((record) => [...keys.map((key) => record[key]), PERSON_CAUTION]) });
}
