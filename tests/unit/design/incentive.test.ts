import { describe, expect, it } from 'vitest';
import { addDays, createRandom, currencyDigits, DesignInputError, drawIncentive, eligibleChoices, formatMinorUnits, toMinorUnits, type AnsweredItem, type OfferedItem } from '@/lib/design';
import fixture from './fixtures/incentive/incentive.json';

const offered: OfferedItem[] = [
  { id: 'cal-2', block: 'calibration', role: 'calibration', position: 2, soonerAmount: 40, soonerDelay: 0, laterAmount: 100, laterDelay: 30 },
  { id: 'cal-1', block: 'calibration', role: 'calibration', position: 1, soonerAmount: 37.5, soonerDelay: 0, laterAmount: 100, laterDelay: 7 },
  { id: 'check-calibration', block: 'calibration', role: 'attention-check', position: 3, soonerAmount: 100, soonerDelay: 0, laterAmount: 50, laterDelay: 30 },
  { id: 'p-1-far', block: 'probe', role: 'reversal-probe', position: 1, soonerAmount: 60, soonerDelay: 14, laterAmount: 100, laterDelay: 60 },
  { id: 'p-1-near', block: 'probe', role: 'reversal-probe', position: 2, soonerAmount: 60, soonerDelay: 0, laterAmount: 100, laterDelay: 46 },
];
const answers = { 'cal-1': 'later', 'cal-2': 'sooner', 'check-calibration': 'sooner', 'p-1-far': 'later', 'p-1-near': 'sooner' };

describe('eligible choices', () => {
  it('takes every answered calibration and probe item, attention checks excluded, calibration first and by position', () => {
    expect(eligibleChoices({ items: offered, answers }).map((i) => `${i.id}:${i.chosen}`)).toEqual(['cal-1:later', 'cal-2:sooner', 'p-1-far:later', 'p-1-near:sooner']);
  });
  it('draws from one block when asked, and skips unanswered items', () => {
    expect(eligibleChoices({ items: offered, answers, blocks: 'probe' }).map((i) => i.id)).toEqual(['p-1-far', 'p-1-near']);
    expect(eligibleChoices({ items: offered, answers: { 'cal-2': 'later' }, blocks: 'calibration' }).map((i) => i.id)).toEqual(['cal-2']);
  });
  it('gives the same order whatever order the items arrive in', () => {
    expect(eligibleChoices({ items: [...offered].reverse(), answers })).toEqual(eligibleChoices({ items: offered, answers }));
  });
  it.each([
    [{ items: offered, answers, blocks: 'all' as never }, 'blocks'],
    [{ items: offered, answers: { 'cal-1': 'LL' } }, 'answers.cal-1'],
  ])('bad input: %# throws DesignInputError naming %s', (input, field) => {
    expect(() => eligibleChoices(input)).toThrow(DesignInputError);
    try {
      eligibleChoices(input);
    } catch (error) {
      expect((error as DesignInputError).field).toBe(field);
    }
  });
});

describe('minor units', () => {
  // Minor-unit digits from the ISO 4217 table (published standard): EUR 2, JPY 0, BHD 3.
  it('knows the minor unit of a currency from ISO 4217', () => {
    expect([currencyDigits('EUR'), currencyDigits('JPY'), currencyDigits('BHD')]).toEqual([2, 0, 3]);
  });
  it('turns amounts into exact whole minor units, binary noise of the rounding included', () => {
    expect(toMinorUnits({ amount: 37.5, currency: 'EUR' })).toBe(3750);
    expect(toMinorUnits({ amount: 0.1 + 0.2, currency: 'EUR' })).toBe(30);
    expect(toMinorUnits({ amount: 1.005, currency: 'BHD' })).toBe(1005);
    expect(toMinorUnits({ amount: 500, currency: 'JPY' })).toBe(500);
    expect(toMinorUnits({ amount: 0, currency: 'EUR' })).toBe(0);
  });
  it('writes minor units back as exact decimal text', () => {
    expect(formatMinorUnits({ minor: 3750, currency: 'EUR' })).toBe('37.50');
    expect(formatMinorUnits({ minor: 5, currency: 'EUR' })).toBe('0.05');
    expect(formatMinorUnits({ minor: 1005, currency: 'BHD' })).toBe('1.005');
    expect(formatMinorUnits({ minor: 500, currency: 'JPY' })).toBe('500');
  });
  it('round-trips every cent amount from 0 to 1000.00 EUR exactly (the whole range an item bank writes for a 1000 EUR reward)', () => {
    const wrong: number[] = [];
    for (let minor = 0; minor <= 100_000; minor++) {
      if (toMinorUnits({ amount: Number(formatMinorUnits({ minor, currency: 'EUR' })), currency: 'EUR' }) !== minor) wrong.push(minor);
    }
    expect(wrong).toEqual([]);
  });
  it.each([
    [{ amount: 37.505, currency: 'EUR' }, 'amount'],
    [{ amount: -1, currency: 'EUR' }, 'amount'],
    [{ amount: Number.NaN, currency: 'EUR' }, 'amount'],
    [{ amount: 1e300, currency: 'EUR' }, 'amount'],
    [{ amount: 1, currency: 'eur' }, 'currency'],
    [{ amount: 1, currency: 'ZZZZ' }, 'currency'],
  ])('bad input: %j is refused, naming %s', (input, field) => {
    try {
      toMinorUnits(input);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(DesignInputError);
      expect((error as DesignInputError).field).toBe(field);
    }
  });
});

describe('due dates', () => {
  // Python's datetime (proleptic Gregorian calendar), tests/unit/design/fixtures/incentive/generate.py.
  it.each(fixture.dueDates)('$completedOn + $delayDays days is $dueDate', ({ completedOn, delayDays, dueDate }) => {
    expect(addDays(completedOn, delayDays)).toBe(dueDate);
  });
  it.each([
    ['2026-02-30', 1, 'completedOn'],
    ['3 Dec 2026', 1, 'completedOn'],
    ['2026-12-03', -1, 'delayDays'],
    ['2026-12-03', 1.5, 'delayDays'],
  ])('bad input: %s + %s days names %s', (date, days, field) => {
    try {
      addDays(date, days);
      expect.unreachable();
    } catch (error) {
      expect((error as DesignInputError).field).toBe(field);
    }
  });
});

describe('the random incentive draw', () => {
  const items = eligibleChoices({ items: offered, answers });

  it('is reproducible from the recorded seed', () => {
    for (const seed of [0, 1, 7, 123_456, 2 ** 32 - 1]) expect(drawIncentive({ items, seed, completedOn: '2026-12-03', currency: 'EUR' })).toEqual(drawIncentive({ items, seed, completedOn: '2026-12-03', currency: 'EUR' }));
  });

  it('draws index ⌊u·n⌋ with u the first uniform of the seeded generator', () => {
    for (let seed = 0; seed < 50; seed++) {
      const u = createRandom({ seed }).uniform();
      expect(drawIncentive({ items, seed, completedOn: '2026-12-03', currency: 'EUR' }).index).toBe(Math.floor(u * items.length));
    }
  });

  it('pays the chosen option at its delay: a sooner option at delay 0 is due the same day', () => {
    const seedFor = (id: string) => {
      for (let seed = 0; ; seed++) if (drawIncentive({ items, seed, completedOn: '2026-12-03', currency: 'EUR' }).item.id === id) return seed;
    };
    const sooner = drawIncentive({ items, seed: seedFor('cal-2'), completedOn: '2026-12-03', currency: 'EUR' });
    expect(sooner).toMatchObject({ chosen: 'sooner', amountMinor: 4000, delayDays: 0, dueDate: '2026-12-03', capped: false });
    const later = drawIncentive({ items, seed: seedFor('cal-1'), completedOn: '2026-12-03', currency: 'EUR' });
    expect(later).toMatchObject({ chosen: 'later', amountMinor: 10000, delayDays: 7, dueDate: '2026-12-10' });
    const farSooner = drawIncentive({ items, seed: seedFor('p-1-near'), completedOn: '2026-12-31', currency: 'EUR' });
    expect(farSooner).toMatchObject({ chosen: 'sooner', amountMinor: 6000, delayDays: 0, dueDate: '2026-12-31' });
    const farLater = drawIncentive({ items, seed: seedFor('p-1-far'), completedOn: '2026-12-31', currency: 'EUR' });
    expect(farLater).toMatchObject({ chosen: 'later', amountMinor: 10000, delayDays: 60, dueDate: '2027-03-01' });
  });

  it('pays at most the per-participant cap, and says so', () => {
    const draws = Array.from({ length: 40 }, (_, seed) => drawIncentive({ items, seed, completedOn: '2026-12-03', currency: 'EUR', capMinor: 5000 }));
    for (const d of draws) {
      expect(d.amountMinor).toBe(Math.min(d.chosenAmountMinor, 5000));
      expect(d.capped).toBe(d.chosenAmountMinor > 5000);
    }
    expect(draws.some((d) => d.capped) && draws.some((d) => !d.capped)).toBe(true);
  });

  // Pearson's chi-square goodness of fit over seeds 0 … 200n − 1 against the 0.999 quantile of
  // chi-square with n − 1 degrees of freedom (scipy.stats.chi2.ppf, fixtures/incentive/generate.py).
  it.each(fixture.uniformity)('draws each of $items items equally often (chi-square below $chi2Critical)', ({ items: n, chi2Critical }) => {
    const many: AnsweredItem[] = Array.from({ length: n }, (_, i) => ({ id: `i${i}`, block: 'probe', role: 'reversal-probe', position: i + 1, soonerAmount: 10, soonerDelay: 0, laterAmount: 20, laterDelay: 10, chosen: 'later' }));
    const draws = 200 * n;
    const counts = new Array<number>(n).fill(0);
    for (let seed = 0; seed < draws; seed++) counts[drawIncentive({ items: many, seed, completedOn: '2026-12-03', currency: 'EUR' }).index] += 1;
    const expected = draws / n;
    const chi2 = counts.reduce((sum, c) => sum + (c - expected) ** 2 / expected, 0);
    expect(chi2).toBeLessThan(chi2Critical);
  });

  it.each([
    [{ items: [], seed: 1, completedOn: '2026-12-03', currency: 'EUR' }, 'items'],
    [{ items, seed: 1.5, completedOn: '2026-12-03', currency: 'EUR' }, 'seed'],
    [{ items, seed: 1, completedOn: '2026-13-01', currency: 'EUR' }, 'completedOn'],
    [{ items, seed: 1, completedOn: '2026-12-03', currency: 'EUR', capMinor: 0 }, 'capMinor'],
    [{ items, seed: 1, completedOn: '2026-12-03', currency: 'EUR', capMinor: 12.5 }, 'capMinor'],
    [{ items, seed: 1, completedOn: '2026-12-03', currency: 'euro' }, 'currency'],
  ])('bad input: draw %# names %s', (input, field) => {
    try {
      drawIncentive(input);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(DesignInputError);
      expect((error as DesignInputError).field).toBe(field);
    }
  });
});
