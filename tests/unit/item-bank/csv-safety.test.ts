import { describe, expect, it } from 'vitest';
import { execSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { csvComment, neutraliseCell, recordsToCsv, restoreCell } from '@/lib/shared/csv';

// Cases from OWASP's "CSV Injection" page (from memory): cells starting with = + - @ tab or CR.
describe('formula-injection neutralising', () => {
  for (const cell of ['=1+1', '+cmd|/C calc', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '=HYPERLINK("http://x")']) {
    it(`prefixes ${JSON.stringify(cell)} with an apostrophe and restores it`, () => {
      expect(neutraliseCell(cell)).toBe(`'${cell}`);
      expect(restoreCell(neutraliseCell(cell) as string)).toBe(cell);
    });
  }
  it('leaves ordinary text, inner formulas and numbers alone', () => {
    expect(neutraliseCell('Which would you take: €60 today?')).toBe('Which would you take: €60 today?');
    expect(neutraliseCell('a=1')).toBe('a=1');
    expect(neutraliseCell(-3)).toBe(-3);
    expect(neutraliseCell(null)).toBe(null);
  });
  it('neutralises every string cell of every row, column names included', () => {
    expect(recordsToCsv({ records: [{ a: '=x', b: 2, c: 'ok' }] })).toBe("a,b,c\r\n'=x,2,ok\r\n");
    expect(recordsToCsv({ records: [{ '@col': -1 }] })).toBe("'@col\r\n-1\r\n");
  });
});

describe('comment lines', () => {
  it('stay one line starting with "#", with every piece a spreadsheet splits off guarded', () => {
    const line = csvComment('study 3 "x",=HYPERLINK("http://e.example");@SUM(1)\n+2');
    expect(line.startsWith('# study 3')).toBe(true);
    expect(line).not.toMatch(/[\r\n"]/);
    for (const piece of line.split(/[,;]/)) expect(piece).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe('one CSV writer', () => {
  it('is the only CSV writer in the app: no other library or hand-made writer', () => {
    const sources = execSync("git ls-files -- app components lib db scripts", { encoding: 'utf8' })
      .split('\n')
      .filter((file) => /\.(ts|tsx|mjs)$/.test(file) && !file.startsWith('lib/shared/csv/'));
    for (const file of sources) {
      const text = readFileSync(file, 'utf8');
      expect(text, file).not.toMatch(/json2csv|\.unparse\(|csv-safety/);
    }
    const manifest = JSON.parse(readFileSync('package.json', 'utf8')) as { dependencies: Record<string, string> };
    expect(Object.keys(manifest.dependencies)).not.toContain('@json2csv/plainjs');
  });
});
