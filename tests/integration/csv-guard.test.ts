// Formula injection through any CSV the app writes: text a user controls (a study name in the
// item bank's comment lines, a participant id, a name in the audit trail) must not reach a
// spreadsheet as a formula, whether it splits lines at commas or (as in many locales) semicolons.
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { GET as exportBank } from '@/app/api/studies/[id]/item-bank/[versionId]/export/route';
import { GET as auditCsv } from '@/app/api/studies/[id]/audit/csv/route';
import { Study, User } from '@/db/models';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { makeFrozenVersion } from './item-bank-support';

beforeAll(migrateUp);

const HOSTILE = 'Lab pilot",=HYPERLINK("http://evil.example","open");@SUM(1+1),+1,-1\t=2\n=3';

/** Every cell of every line (comment lines included), as a spreadsheet splitting at `delimiter` reads it. */
function cells(text: string, delimiter: string): string[] {
  return Papa.parse<string[]>(text, { delimiter, skipEmptyLines: true }).data.flat();
}

function expectNoFormula(text: string) {
  for (const delimiter of [',', ';']) {
    for (const cell of cells(text, delimiter)) expect(cell, `a cell split at "${delimiter}"`).not.toMatch(/^[=+\-@\t\r]/);
  }
}

describe('the formula guard on every CSV', () => {
  it('neutralises a hostile study name in the item bank comment lines', async () => {
    const { study, team } = await makeStudyWithTeam('CSV guard');
    await Study.update({ name: HOSTILE.slice(0, 120) }, { where: { id: study.id } });
    const version = await makeFrozenVersion(study.id);
    const reply = await exportBank(
      await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=csv-annotated`),
      ctx({ id: String(study.id), versionId: String(version.id) }),
    );
    expect(reply.status).toBe(200);
    const text = await reply.text();
    expect(text).toMatch(/^# Switchback item bank/);
    expectNoFormula(text);
    // Readers that skip "#" lines still get the items.
    const rows = Papa.parse<Record<string, string>>(text, { header: true, comments: '#', skipEmptyLines: true });
    expect(rows.errors).toEqual([]);
    expect(rows.data.length).toBeGreaterThan(0);
  });

  it('neutralises hostile names in the audit trail, split at commas or semicolons', async () => {
    const { study, team } = await makeStudyWithTeam('CSV guard audit');
    await User.update({ name: HOSTILE.slice(0, 100) }, { where: { id: team.owner.id } });
    await Study.update({ name: 'Renamed' }, { where: { id: study.id } });
    const reply = await auditCsv(await requestAs(team.owner, 'GET', `/api/studies/${study.id}/audit/csv`), ctx({ id: String(study.id) }));
    expect(reply.status).toBe(200);
    expectNoFormula(await reply.text());
  });
});
