import Papa from 'papaparse';
import { fitPrior, type ModelSpec } from '@/lib/design';
import { estimatePilotChoices, type PilotIssue } from './pilot-choices';

export type { PilotIssue };
import { PILOT_MAX_BYTES, PILOT_MAX_ROWS, type PriorValues } from '@/lib/shared/validations/planner';


export type PilotFit =
  | { ok: true; rows: number; prior: PriorValues; notes: string[] }
  | { ok: false; rows: number; issues: PilotIssue[]; message: string };

const REQUIRED = ['participant', 'kSmall', 'kLarge'] as const;
const MAX_LISTED = 50;

/** Byte length of a text as UTF-8 (the size the browser uploads). */
export function utf8Bytes(text: string): number {
  return new TextEncoder().encode(text).length;
}

/**
 * Reads a pilot CSV (columns participant, kSmall, kLarge: one row per participant, rates per
 * day) with papaparse and fits the bivariate log-normal prior by maximum likelihood (fitPrior
 * in the design core). Every bad cell is reported with its line and column; nothing is fitted
 * while any remains. Files over 5 MB or with over 100,000 rows are refused before fitting.
 * Fitted spreads and correlations are clipped to the ranges a prior set accepts, with a note.
 *
 * A file with a "choice" column holds raw pilot choices instead (one row per answered question:
 * participant, magnitude, soonerAmount, soonerDelay, laterAmount, laterDelay, choice); each
 * participant's rates are then first estimated with the calibration block's estimator under
 * `model` (estimatePilotChoices), and the prior is fitted to those estimates.
 */
export function fitPilotCsv(text: string, options: { model?: ModelSpec } = {}): PilotFit {
  if (utf8Bytes(text) > PILOT_MAX_BYTES) {
    return { ok: false, rows: 0, issues: [], message: `The file is larger than 5 MB. Upload at most ${PILOT_MAX_ROWS.toLocaleString('en-GB')} rows of participant, kSmall, kLarge.` };
  }
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { header: false, skipEmptyLines: false });
  const lines = parsed.data;
  const header = (lines[0] ?? []).map((h) => h.trim());
  if (header.some((h) => h.toLowerCase() === 'choice')) return fitChoices(lines, header, parsed.errors, options.model ?? { id: 'hyperbolic' });
  const columns = REQUIRED.map((name) => header.findIndex((h) => h.toLowerCase() === name.toLowerCase()));
  const missing = REQUIRED.filter((_, i) => columns[i] < 0);
  if (missing.length) {
    return { ok: false, rows: 0, issues: missing.map((field) => ({ line: 1, field, message: `The header has no "${field}" column.` })), message: 'The first line must name the columns participant, kSmall and kLarge.' };
  }
  const issues: PilotIssue[] = parsed.errors
    .filter((e) => e.type !== 'Delimiter')
    .map((e) => ({ line: (e.row ?? 0) + 1, field: '(row)', message: e.message }));
  const estimates: { kSmall: number; kLarge: number }[] = [];
  const seen = new Set<string>();
  let rows = 0;
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i];
    if (cells.length === 1 && cells[0].trim() === '') continue;
    rows++;
    if (rows > PILOT_MAX_ROWS) {
      return { ok: false, rows, issues: [], message: `The file has more than ${PILOT_MAX_ROWS.toLocaleString('en-GB')} rows; split it or summarise it first.` };
    }
    const line = i + 1;
    const participant = (cells[columns[0]] ?? '').trim();
    if (!participant) issues.push({ line, field: 'participant', message: 'The participant code is empty.' });
    else if (seen.has(participant)) issues.push({ line, field: 'participant', message: `Participant "${participant.slice(0, 40)}" appears twice.` });
    seen.add(participant);
    const rates = [1, 2].map((c) => {
      const raw = (cells[columns[c]] ?? '').trim();
      const value = Number(raw);
      if (raw === '' || !Number.isFinite(value) || value <= 0) {
        issues.push({ line, field: REQUIRED[c], message: raw === '' ? 'The rate is empty.' : `"${raw.slice(0, 20)}" is not a rate above 0 (per day).` });
        return NaN;
      }
      return value;
    });
    if (rates.every(Number.isFinite)) estimates.push({ kSmall: rates[0], kLarge: rates[1] });
  }
  if (issues.length) {
    const listed = issues.slice(0, MAX_LISTED);
    const more = issues.length - listed.length;
    return { ok: false, rows, issues: listed, message: `${issues.length} problem${issues.length === 1 ? '' : 's'} in the file${more > 0 ? ` (the first ${MAX_LISTED} are listed)` : ''}. Nothing was fitted.` };
  }
  if (estimates.length < 3) return { ok: false, rows, issues: [], message: 'A prior needs at least 3 participants with both rates.' };
  return { ok: true, rows, ...clip(fitPrior(estimates)) };
}

function clip(fit: PriorValues): { prior: PriorValues; notes: string[] } {
  const notes: string[] = [];
  const prior = { ...fit };
  for (const key of ['sdLogSmall', 'sdLogLarge'] as const) {
    if (prior[key] > 5) {
      prior[key] = 5;
      notes.push(`The spread of ${key === 'sdLogSmall' ? 'the small' : 'the large'}-reward rates (SD of ln k) was above 5 and is set to 5.`);
    }
  }
  if (Math.abs(prior.correlation) > 0.99) {
    prior.correlation = Math.sign(prior.correlation) * 0.99;
    notes.push('The correlation of the two rates was beyond ±0.99 and is set to ±0.99.');
  }
  for (const key of ['medianSmall', 'medianLarge'] as const) {
    if (prior[key] > 10) {
      prior[key] = 10;
      notes.push(`The median ${key === 'medianSmall' ? 'small' : 'large'}-reward rate was above 10 per day and is set to 10.`);
    }
  }
  return { prior, notes };
}

function listed(issues: PilotIssue[], rows: number): PilotFit {
  const shown = issues.slice(0, MAX_LISTED);
  const more = issues.length - shown.length;
  return { ok: false, rows, issues: shown, message: `${issues.length} problem${issues.length === 1 ? '' : 's'} in the file${more > 0 ? ` (the first ${MAX_LISTED} are listed)` : ''}. Nothing was fitted.` };
}

function fitChoices(lines: string[][], header: string[], errors: Papa.ParseError[], model: ModelSpec): PilotFit {
  const rows = lines.slice(1).filter((cells) => !(cells.length === 1 && cells[0].trim() === '')).length;
  if (rows > PILOT_MAX_ROWS) return { ok: false, rows, issues: [], message: `The file has more than ${PILOT_MAX_ROWS.toLocaleString('en-GB')} rows; split it first.` };
  const parseIssues: PilotIssue[] = errors.filter((e) => e.type !== 'Delimiter').map((e) => ({ line: (e.row ?? 0) + 1, field: '(row)', message: e.message }));
  if (parseIssues.length) return listed(parseIssues, rows);
  const result = estimatePilotChoices(lines, header, model);
  if (!result.ok) return result.message ? { ok: false, rows, issues: result.issues, message: result.message } : listed(result.issues, rows);
  if (result.estimates.length < 3) {
    return { ok: false, rows, issues: [], message: `A prior needs at least 3 participants with usable estimates; this file gave ${result.estimates.length}. ${result.notes.slice(1).join(' ')}`.trim() };
  }
  const fitted = clip(fitPrior(result.estimates));
  return { ok: true, rows: result.used, prior: fitted.prior, notes: [...result.notes, ...fitted.notes] };
}
