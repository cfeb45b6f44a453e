import { estimateRates, type CalibrationItem, type Choice, type ModelSpec } from '@/lib/design';

/** One problem in a pilot file: the 1-based line of the file and the column it concerns. */
export type PilotIssue = { line: number; field: string; message: string };

/** Columns of a raw-choices pilot file: one row per answered question. */
export const CHOICE_COLUMNS = ['participant', 'magnitude', 'soonerAmount', 'soonerDelay', 'laterAmount', 'laterDelay', 'choice'] as const;

/** Flags that make an estimate a bound rather than a rate (the same ones stage 1 falls back on). */
const UNUSABLE = ['all-sooner', 'all-later', 'non-monotone'] as const;

type Row = { participant: string; item: CalibrationItem; choice: Choice };

export type ChoicesFit =
  | { ok: true; participants: number; used: number; estimates: Array<{ kSmall: number; kLarge: number }>; notes: string[] }
  | { ok: false; issues: PilotIssue[]; message: string };

const NUMBER_COLUMNS = ['soonerAmount', 'soonerDelay', 'laterAmount', 'laterDelay'] as const;

/**
 * Reads the rows of a raw-choices pilot file (already split into cells, header first) and
 * estimates each participant's k and K with the calibration block's own estimator
 * (estimateRates: maximum likelihood in ln k, logistic choice, γ = 10, the chosen model), so a
 * prior fitted from pilot choices describes rates the way stage 1 will estimate them.
 * Participants whose small or large estimate is only a bound (all sooner, all later, or no
 * consistent switch point) are left out with a note, as stage 1 would serve them the fallback set.
 * Every bad cell is reported with its 1-based line and column.
 */
export function estimatePilotChoices(lines: string[][], header: string[], model: ModelSpec): ChoicesFit {
  const at = CHOICE_COLUMNS.map((name) => header.findIndex((h) => h.toLowerCase() === name.toLowerCase()));
  const missing = CHOICE_COLUMNS.filter((_, i) => at[i] < 0);
  if (missing.length) {
    return {
      ok: false,
      issues: missing.map((field) => ({ line: 1, field, message: `The header has no "${field}" column.` })),
      message: `A file of raw choices needs the columns ${CHOICE_COLUMNS.join(', ')}.`,
    };
  }
  const col = Object.fromEntries(CHOICE_COLUMNS.map((name, i) => [name, at[i]])) as Record<(typeof CHOICE_COLUMNS)[number], number>;
  const issues: PilotIssue[] = [];
  const rows: Row[] = [];
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i];
    if (cells.length === 1 && cells[0].trim() === '') continue;
    const line = i + 1;
    const cell = (name: (typeof CHOICE_COLUMNS)[number]) => (cells[col[name]] ?? '').trim();
    const before = issues.length;
    const participant = cell('participant');
    if (!participant) issues.push({ line, field: 'participant', message: 'The participant code is empty.' });
    const magnitude = cell('magnitude').toLowerCase();
    if (magnitude !== 'small' && magnitude !== 'large') issues.push({ line, field: 'magnitude', message: `"${cell('magnitude').slice(0, 20)}" is not small or large.` });
    const numbers = Object.fromEntries(
      NUMBER_COLUMNS.map((name) => {
        const raw = cell(name);
        const value = Number(raw);
        const delay = name.endsWith('Delay');
        const fine = raw !== '' && Number.isFinite(value) && (delay ? value >= 0 : value > 0);
        if (!fine) issues.push({ line, field: name, message: raw === '' ? 'The cell is empty.' : `"${raw.slice(0, 20)}" is not ${delay ? 'a delay of 0 days or more' : 'an amount above 0'}.` });
        return [name, value];
      }),
    ) as Record<(typeof NUMBER_COLUMNS)[number], number>;
    if (issues.length === before) {
      if (!(numbers.soonerAmount < numbers.laterAmount)) issues.push({ line, field: 'soonerAmount', message: 'The sooner amount must be smaller than the later amount.' });
      if (!(numbers.soonerDelay < numbers.laterDelay)) issues.push({ line, field: 'laterDelay', message: 'The later delay must be longer than the sooner delay.' });
    }
    const raw = cell('choice').toLowerCase();
    const choice: Choice | null = raw === 'sooner' || raw === 'ss' ? 'SS' : raw === 'later' || raw === 'll' ? 'LL' : null;
    if (!choice) issues.push({ line, field: 'choice', message: `"${cell('choice').slice(0, 20)}" is not sooner or later.` });
    if (issues.length === before && choice) {
      rows.push({ participant, choice, item: { magnitude: magnitude as 'small' | 'large', ...numbers, targetRate: Number.NaN } });
    }
  }
  if (issues.length) return { ok: false, issues, message: '' };

  const byPerson = new Map<string, Row[]>();
  for (const row of rows) byPerson.set(row.participant, [...(byPerson.get(row.participant) ?? []), row]);
  const estimates: Array<{ kSmall: number; kLarge: number }> = [];
  const incomplete: string[] = [];
  const bounded: string[] = [];
  for (const [participant, own] of byPerson) {
    if (!own.some((r) => r.item.magnitude === 'small') || !own.some((r) => r.item.magnitude === 'large')) {
      incomplete.push(participant);
      continue;
    }
    const fit = estimateRates(
      own.map((r) => r.choice),
      own.map((r) => r.item),
      model,
    );
    if (UNUSABLE.some((f) => fit.small.flags.includes(f) || fit.large.flags.includes(f))) bounded.push(participant);
    else estimates.push({ kSmall: fit.small.rate, kLarge: fit.large.rate });
  }
  const notes = [`Rates estimated from ${rows.length} choices by maximum likelihood under the ${model.id} model (logistic choice, γ = 10), as in the calibration block.`];
  if (bounded.length) notes.push(`${bounded.length} participant${bounded.length === 1 ? ' was' : 's were'} left out: all sooner, all later or without a consistent switch point, so their estimates are only bounds.`);
  if (incomplete.length) notes.push(`${incomplete.length} participant${incomplete.length === 1 ? ' was' : 's were'} left out for answering only one reward size.`);
  return { ok: true, participants: byPerson.size, used: estimates.length, estimates, notes };
}
