import Papa from 'papaparse';

/** Size limits of an observed-choices upload (as the pilot upload: 5 MB, 100,000 rows). */
export const CHOICES_MAX_BYTES = 5 * 1024 * 1024;
export const CHOICES_MAX_ROWS = 100_000;

/** One problem in an uploaded file: the 1-based line and the column it concerns. */
export type ChoiceIssue = { line: number; column: string; message: string };

/** One observed stage-2 choice from the file. */
export type ChoiceRow = { line: number; participant: string; itemId: string; chosen: 'SS' | 'LL'; responseMs: number | null };

export type ParsedChoices =
  | { ok: true; rows: ChoiceRow[]; delimiter: ',' | ';' | '\t'; byteOrderMark: boolean; notes: string[] }
  | { ok: false; issues: ChoiceIssue[]; message: string; delimiter: ',' | ';' | '\t' | null; byteOrderMark: boolean };

const COLUMNS = { participant: ['participant', 'participant_id'], item: ['item', 'item_id'], choice: ['choice', 'chosen', 'chosen_option'], responseMs: ['response_ms', 'rt_ms', 'response_time_ms'] } as const;
const CHOICE_WORDS: Record<string, 'SS' | 'LL'> = { sooner: 'SS', ss: 'SS', later: 'LL', ll: 'LL' };
const MAX_LISTED = 50;

/** Byte length of a text as UTF-8 (the size the browser uploads). */
export function utf8Bytes(text: string): number {
  return new TextEncoder().encode(text).length;
}

/**
 * Reads an observed-choices CSV in long format: one row per participant and stage-2 item, with
 * the columns participant, item (the served item id), choice (`sooner` / `later`, or `SS` /
 * `LL`) and optionally response_ms. A byte-order mark is removed and reported; the separator
 * (comma, semicolon or tab) is detected by papaparse and reported. Every bad cell is named by
 * its line and column, and a row repeated with a different choice is refused (the same row
 * twice is kept once). Files over 5 MB or 100,000 rows are refused before reading rows.
 */
export function parseChoicesCsv(text: string): ParsedChoices {
  const byteOrderMark = text.startsWith('\uFEFF');
  if (utf8Bytes(text) > CHOICES_MAX_BYTES) {
    return { ok: false, issues: [], delimiter: null, byteOrderMark, message: `The file is larger than 5 MB. Upload at most ${CHOICES_MAX_ROWS.toLocaleString('en-GB')} rows, or split it by participant.` };
  }
  const parsed = Papa.parse<string[]>(byteOrderMark ? text.slice(1) : text, { header: false, skipEmptyLines: false, delimitersToGuess: [',', ';', '\t'] });
  const delimiter = (parsed.meta.delimiter === ';' || parsed.meta.delimiter === '\t' ? parsed.meta.delimiter : ',') as ',' | ';' | '\t';
  const lines = parsed.data;
  const header = (lines[0] ?? []).map((h) => h.trim().toLowerCase());
  const at = (names: readonly string[]) => header.findIndex((h) => names.includes(h));
  const index = { participant: at(COLUMNS.participant), item: at(COLUMNS.item), choice: at(COLUMNS.choice), responseMs: at(COLUMNS.responseMs) };
  const missing = (['participant', 'item', 'choice'] as const).filter((c) => index[c] < 0);
  if (missing.length) {
    return {
      ok: false,
      delimiter,
      byteOrderMark,
      issues: missing.map((column) => ({ line: 1, column, message: `The header has no "${column}" column.` })),
      message: 'The first line must name the columns participant, item and choice (response_ms is optional).',
    };
  }
  const issues: ChoiceIssue[] = parsed.errors.filter((e) => e.type !== 'Delimiter').map((e) => ({ line: (e.row ?? 0) + 1, column: '(row)', message: e.message }));
  const rows: ChoiceRow[] = [];
  const seen = new Map<string, ChoiceRow>();
  let duplicates = 0;
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i];
    if (cells.length === 1 && cells[0].trim() === '') continue;
    if (rows.length + duplicates >= CHOICES_MAX_ROWS) {
      return { ok: false, issues: [], delimiter, byteOrderMark, message: `The file has more than ${CHOICES_MAX_ROWS.toLocaleString('en-GB')} rows; split it by participant.` };
    }
    const line = i + 1;
    const participant = (cells[index.participant] ?? '').trim();
    const itemId = (cells[index.item] ?? '').trim();
    const rawChoice = (cells[index.choice] ?? '').trim();
    const chosen = CHOICE_WORDS[rawChoice.toLowerCase()];
    if (!participant) issues.push({ line, column: 'participant', message: 'The participant code is empty.' });
    else if (participant.length > 128) issues.push({ line, column: 'participant', message: 'The participant code is longer than 128 characters.' });
    if (!itemId) issues.push({ line, column: 'item', message: 'The item id is empty.' });
    else if (itemId.length > 64) issues.push({ line, column: 'item', message: 'The item id is longer than 64 characters.' });
    if (!chosen) issues.push({ line, column: 'choice', message: rawChoice ? `"${rawChoice.slice(0, 20)}" is not a choice: write sooner or later (or SS or LL).` : 'The choice is empty.' });
    let responseMs: number | null = null;
    if (index.responseMs >= 0) {
      const raw = (cells[index.responseMs] ?? '').trim();
      if (raw !== '') {
        const value = Number(raw);
        if (!Number.isInteger(value) || value < 0 || value > 3_600_000) issues.push({ line, column: 'response_ms', message: `"${raw.slice(0, 20)}" is not a whole number of milliseconds from 0 to 3,600,000.` });
        else responseMs = value;
      }
    }
    if (!participant || !itemId || !chosen) continue;
    const key = `${participant}\u0000${itemId}`;
    const earlier = seen.get(key);
    if (earlier) {
      if (earlier.chosen !== chosen) issues.push({ line, column: 'choice', message: `Participant "${participant.slice(0, 40)}" answered ${itemId} as ${earlier.chosen} on line ${earlier.line} and as ${chosen} here.` });
      else duplicates++;
      continue;
    }
    const row = { line, participant, itemId, chosen, responseMs };
    seen.set(key, row);
    rows.push(row);
  }
  if (issues.length) return { ok: false, delimiter, byteOrderMark, ...listed(issues, 'Nothing was imported.') };
  const notes: string[] = [];
  if (byteOrderMark) notes.push('A byte-order mark at the start of the file was removed.');
  if (delimiter !== ',') notes.push(`Columns were separated by ${delimiter === ';' ? 'semicolons' : 'tabs'}.`);
  if (duplicates) notes.push(`${duplicates} repeated row(s) with the same choice were counted once.`);
  return { ok: true, rows, delimiter, byteOrderMark, notes };
}

/** At most 50 issues, with a message saying how many there were. */
export function listed(issues: ChoiceIssue[], tail: string): { issues: ChoiceIssue[]; message: string } {
  const shown = issues.slice(0, MAX_LISTED);
  const more = issues.length - shown.length;
  return { issues: shown, message: `${issues.length} problem${issues.length === 1 ? '' : 's'} in the file${more > 0 ? ` (the first ${MAX_LISTED} are listed)` : ''}. ${tail}` };
}
