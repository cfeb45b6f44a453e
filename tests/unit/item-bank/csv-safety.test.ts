import { describe, expect, it } from 'vitest';
import { neutraliseCell, neutraliseRows, restoreCell } from '@/lib/shared/csv/formula-guard';

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
  it('neutralises every string cell of every row', () => {
    expect(neutraliseRows([{ a: '=x', b: 2, c: 'ok' }])).toEqual([{ a: "'=x", b: 2, c: 'ok' }]);
  });
});
