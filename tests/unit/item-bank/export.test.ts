import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { restoreCell } from '@/lib/shared/csv';
import { amountText, amountUnit, delayText, predictPattern, type BankItem } from '@/lib/design';
import { ITEM_COLUMNS, itemsCsv } from '@/lib/server/services/item-bank';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { frozenDesign as design, HASH } from '../../support/frozen-design';

const NULLABLE = new Set(['view', 'pairId', 'magnitude']);

/** Reads an item CSV back: '#' header lines skipped, numbers typed, empty nullable cells → null, neutralised text restored. */
function readBack(csv: string): BankItem[] {
  const parsed = Papa.parse<Record<string, unknown>>(csv, { header: true, comments: '#', skipEmptyLines: true, dynamicTyping: true });
  expect(parsed.errors).toEqual([]);
  return parsed.data.map((row) =>
    Object.fromEntries(ITEM_COLUMNS.map((c) => {
      const v = row[c];
      if (v === null || v === '') return [c, NULLABLE.has(c) ? null : v];
      return [c, typeof v === 'string' ? restoreCell(v) : v];
    })) as BankItem,
  );
}

describe('item-bank export', () => {
  it('CSV parsed back equals the JSON items (population and personalised designs)', () => {
    for (const content of [design(), design({ mode: 'population', criterion: 'gap-product' }), design({ currency: 'JPY', largeAmount: 10000 })]) {
      const { bank } = bankFor({ hash: HASH, content }, { delayUnit: 'weeks' });
      const csv = itemsCsv(bank.items, ['study 1', `hash ${HASH} seed 7`]);
      expect(csv.startsWith('# study 1\r\n# hash')).toBe(true);
      expect(readBack(csv)).toEqual(JSON.parse(JSON.stringify(bank.items)));
    }
  });

  it('writes a plain CSV without header lines: the column row first, no comment lines', () => {
    const { bank } = bankFor({ hash: HASH, content: design() });
    const csv = itemsCsv(bank.items);
    expect(csv.split('\r\n')[0]).toBe(ITEM_COLUMNS.join(','));
    expect(csv).not.toMatch(/^#/m);
    expect(readBack(csv)).toEqual(JSON.parse(JSON.stringify(bank.items)));
  });

  it('neutralises a formula smuggled into a text cell and restores it on reading back', () => {
    const { bank } = bankFor({ hash: HASH, content: design() });
    const items = bank.items.map((i, n) => (n === 0 ? { ...i, text: '=HYPERLINK("http://example.org")' } : i));
    const csv = itemsCsv(items, ['x']);
    expect(csv).toContain(`"'=HYPERLINK(""http://example.org"")"`);
    expect(readBack(csv)[0].text).toBe('=HYPERLINK("http://example.org")');
  });

  it('has the blocks, roles and a dominated attention check in each block', () => {
    const { bank } = bankFor({ hash: HASH, content: design() });
    const roles = new Set(bank.items.map((i) => i.role));
    expect(roles).toEqual(new Set(['calibration', 'attention-check', 'reversal-probe', 'late-anchor', 'soon-anchor']));
    for (const check of bank.items.filter((i) => i.role === 'attention-check')) {
      expect(check.soonerAmount).toBeGreaterThan(check.laterAmount);
      expect(check.laterDelay).toBeGreaterThan(check.soonerDelay);
    }
    expect(bank.items.filter((i) => i.role === 'calibration')).toHaveLength(20);
    const longestProbe = Math.max(...bank.items.filter((i) => i.view === 'far').map((i) => i.laterDelay));
    expect(Math.max(...bank.items.filter((i) => i.role === 'calibration').map((i) => i.laterDelay))).toBeGreaterThanOrEqual(longestProbe);
  });

  it('is reproducible for a seed and changes order with another seed', () => {
    const a = bankFor({ hash: HASH, content: design() }, { seed: 11 }).bank.items.map((i) => i.id);
    const b = bankFor({ hash: HASH, content: design() }, { seed: 11 }).bank.items.map((i) => i.id);
    const c = bankFor({ hash: HASH, content: design() }, { seed: 12 }).bank.items.map((i) => i.id);
    expect(a).toEqual(b);
    expect(c).not.toEqual(a);
  });

  it('counterbalances sides within each block', () => {
    const { bank } = bankFor({ hash: HASH, content: design() });
    for (const block of ['calibration', 'probe']) {
      const units = new Map(bank.items.filter((i) => i.block === block).map((i) => [i.pairId ?? i.id, i.soonerSide]));
      const left = [...units.values()].filter((s) => s === 'left').length;
      expect(Math.abs(2 * left - units.size)).toBeLessThanOrEqual(1);
    }
  });
});

describe('rounding and wording', () => {
  it('the rounding report matches a recomputation from the exported pairs', () => {
    for (const delayUnit of ['days', 'weeks', 'months'] as const) {
      const { bank } = bankFor({ hash: HASH, content: design() }, { delayUnit });
      const { medianSmall: kSmall, medianLarge: kLarge } = design().prior;
      for (const entry of bank.rounding.pairs) {
        const far = bank.items.find((i) => i.id === `${entry.pairId}-far`)!;
        const near = bank.items.find((i) => i.id === `${entry.pairId}-near`)!;
        expect(far.laterDelay - far.soonerDelay).toBe(near.laterDelay);
        const pattern = predictPattern({ model: { id: 'hyperbolic' }, ratio: far.soonerAmount / far.laterAmount, soonDelay: far.soonerDelay, lateDelay: far.laterDelay, kSmall, kLarge });
        expect(entry.rounded.pattern).toBe(pattern);
        expect(entry.rounded.lateDelay).toBe(far.laterDelay);
        expect(entry.changed).toBe(entry.exact.pattern !== pattern);
        expect(far.laterDelay % { days: 1, weeks: 7, months: 30 }[delayUnit]).toBe(0);
      }
      expect(bank.rounding.patternsPreserved).toBe(bank.rounding.pairs.every((p) => p.exact.pattern === p.rounded.pattern));
    }
  });

  it('rounds amounts to a 1–2–5 step within the currency and words delays and amounts', () => {
    expect(amountUnit({ currency: 'EUR', largeAmount: 100, smallAmount: 40 })).toBe(0.5);
    expect(amountUnit({ currency: 'JPY', largeAmount: 10000, smallAmount: 6000 })).toBe(50);
    expect(amountUnit({ currency: 'EUR', largeAmount: 1, smallAmount: 0.5 })).toBe(0.01);
    expect(delayText(21, 'weeks')).toBe('in 3 weeks');
    expect(delayText(20, 'weeks')).toBe('in 20 days');
    expect(delayText(60, 'months')).toBe('in 2 months');
    expect(delayText(0)).toBe('today');
    expect(amountText(37.5, 'EUR')).toBe('€37.50');
    expect(amountText(100, 'EUR')).toBe('€100');
  });
});
