import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { neutraliseCell, toSafeCsv } from '@/lib/shared/csv/formula-guard';

describe('cells that a spreadsheet would run as formulas are neutralised', () => {
  it.each(['=1+1', '+1', '-2+3', '@SUM(A1)', '\tx', '\rx'])('prefixes %j with an apostrophe', (cell) => {
    expect(neutraliseCell(cell)).toBe(`'${cell}`);
  });

  it.each(['plain', '1.5', '', ' =not first', "'already"])('leaves %j alone', (cell) => {
    expect(neutraliseCell(cell)).toBe(cell);
  });
});

describe('the CSV document', () => {
  it('matches its documented example', () => {
    expect(toSafeCsv(['a'], [['=1+1']])).toBe("a\r\n'=1+1\r\n");
  });

  it('round-trips commas, quotes, line breaks and nulls through an independent parser (papaparse)', () => {
    const rows = [['a, b', 'say "hi"', 'two\nlines', null, 7]];
    const parsed = Papa.parse<string[]>(toSafeCsv(['one', 'two', 'three', 'four', 'five'], rows), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual([
      ['one', 'two', 'three', 'four', 'five'],
      ['a, b', 'say "hi"', 'two\nlines', '', '7'],
    ]);
  });

  it('neutralises a formula even when the cell also needs quoting', () => {
    const parsed = Papa.parse<string[]>(toSafeCsv(['x'], [['=HYPERLINK("http://a.example","b")']]), { skipEmptyLines: true });
    expect(parsed.data[1][0]).toBe(`'=HYPERLINK("http://a.example","b")`);
  });
});
