// Every per-person CSV carries the caution as its last column (not comment lines, which break plain
// spreadsheet and survey imports), and every CSV the app writes either is per-person and goes
// through personRecordsCsv, or is listed here with the reason it describes no person.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { CAUTION_COLUMN, personRecordsCsv } from '@/lib/shared/csv';

/** CSV writers that hold no estimate or judgement of a person, with the reason. */
const NOT_PER_PERSON: Record<string, string> = {
  'lib/server/services/item-bank.ts': 'the item bank: questions of a frozen design, before anyone answers',
  'lib/server/services/power-export.ts': 'power results: simulated study-level shares, no participant',
  'lib/server/services/audit-trail.ts': "the team's own actions on the study",
  'components/item-bank/batch-upload.tsx': 'the empty answer sheet an operator fills in (column names only)',
  'lib/server/services/payouts-ledger.ts': 'the payout ledger: amounts owed under the random incentive system, no estimate of anyone (it carries the real-reward caution of its own)',
};

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sources(path);
    return /\.(ts|tsx)$/.test(name) ? [path] : [];
  });
}

describe('per-person CSV exports', () => {
  it('end with a caution column holding the caution on every row, as a plain table', () => {
    const csv = personRecordsCsv({ records: [{ participantId: 'P1', kSmall: 0.05 }, { participantId: '=cmd', kSmall: 0.01, extra: 'x' }] });
    const parsed = Papa.parse<Record<string, string>>(csv.trim(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(['participantId', 'kSmall', 'extra', CAUTION_COLUMN]);
    expect(parsed.data.map((r) => r.caution)).toEqual([PERSON_CAUTION, PERSON_CAUTION]);
    expect(parsed.data[1].participantId).toBe("'=cmd");
    expect(csv.startsWith('#')).toBe(false);
  });

  it('keep one caution column when the records already name one', () => {
    const csv = personRecordsCsv({ records: [{ a: 1, caution: 'other' }], columns: ['a', 'caution'] });
    expect(csv.split('\r\n')[0]).toBe('a,caution');
  });

  it('are the only CSVs the app writes, apart from the listed ones that describe no person', () => {
    const writers = ['lib/server', 'app', 'components']
      .flatMap((dir) => sources(dir))
      .filter((path) => /\b(toCsv|recordsToCsv)\(/.test(readFileSync(path, 'utf8')));
    expect(writers.sort()).toEqual(Object.keys(NOT_PER_PERSON).sort());
  });
});
