import { describe, expect, it } from 'vitest';
import { calibrationItems, estimateRates, fitPrior, type ModelSpec } from '@/lib/design';
import { fitPilotCsv } from '@/lib/shared/planner/pilot-csv';

const model: ModelSpec = { id: 'hyperbolic' };
const items = calibrationItems({ model });
const header = 'participant,magnitude,soonerAmount,soonerDelay,laterAmount,laterDelay,choice';

/** A participant who answers without noise: later whenever the item ties at a rate above theirs. */
function answers(person: string, kSmall: number, kLarge: number): string[] {
  return items.map((i) => {
    const k = i.magnitude === 'small' ? kSmall : kLarge;
    return [person, i.magnitude, i.soonerAmount, i.soonerDelay, i.laterAmount, i.laterDelay, i.targetRate > k ? 'later' : 'sooner'].join(',');
  });
}

const people: Array<[string, number, number]> = [
  ['p01', 0.02, 0.006],
  ['p02', 0.05, 0.01],
  ['p03', 0.008, 0.003],
  ['p04', 0.1, 0.03],
  ['p05', 0.015, 0.009],
];

describe('priors fitted from raw pilot choices', () => {
  const csv = [header, ...people.flatMap(([p, k, K]) => answers(p, k, K))].join('\n');

  it('estimates each person with the calibration block’s estimator, then fits the prior to those estimates', () => {
    const fit = fitPilotCsv(csv, { model });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(fit.rows).toBe(5);
    // the same estimator as stage 1 (estimateRates with its defaults), person by person
    const direct = people.map(([, k, K]) => {
      const choices = items.map((i) => (i.targetRate > (i.magnitude === 'small' ? k : K) ? 'LL' : 'SS') as 'LL' | 'SS');
      const e = estimateRates(choices, items, model);
      return { kSmall: e.small.rate, kLarge: e.large.rate };
    });
    const expected = fitPrior(direct);
    for (const key of ['medianSmall', 'medianLarge', 'sdLogSmall', 'sdLogLarge', 'correlation'] as const) expect(fit.prior[key]).toBeCloseTo(expected[key], 12);
    expect(fit.notes[0]).toMatch(/maximum likelihood under the hyperbolic model/);
  });

  it('puts each noise-free person’s estimate between the tie rates of the two items they switched between (a property of the likelihood)', () => {
    for (const [, k] of people) {
      const small = items.filter((i) => i.magnitude === 'small');
      const choices = items.map((i) => (i.targetRate > (i.magnitude === 'small' ? k : 1) ? 'LL' : 'SS') as 'LL' | 'SS');
      const rate = estimateRates(choices, items, model).small.rate;
      const below = Math.max(...small.filter((i) => i.targetRate <= k).map((i) => i.targetRate));
      const above = Math.min(...small.filter((i) => i.targetRate > k).map((i) => i.targetRate));
      expect(rate).toBeGreaterThan(below);
      expect(rate).toBeLessThan(above);
    }
  });

  it('leaves out a person who chose sooner every time (their estimate is only a bound), and says so', () => {
    const always = items.map((i) => ['p06', i.magnitude, i.soonerAmount, i.soonerDelay, i.laterAmount, i.laterDelay, 'sooner'].join(','));
    const fit = fitPilotCsv([csv, ...always].join('\n'), { model });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(fit.rows).toBe(5);
    expect(fit.notes.join(' ')).toMatch(/1 participant was left out: all sooner/);
  });

  it('names the line and column of every bad cell, and fits nothing', () => {
    const bad = [header, 'p01,medium,10,0,20,30,later', 'p01,small,25,0,20,30,later', 'p02,large,10,0,20,abc,maybe', ',small,10,0,20,30,sooner'].join('\n');
    const fit = fitPilotCsv(bad, { model });
    expect(fit.ok).toBe(false);
    if (fit.ok) return;
    expect(fit.issues).toEqual([
      { line: 2, field: 'magnitude', message: '"medium" is not small or large.' },
      { line: 3, field: 'soonerAmount', message: 'The sooner amount must be smaller than the later amount.' },
      { line: 4, field: 'laterDelay', message: '"abc" is not a delay of 0 days or more.' },
      { line: 4, field: 'choice', message: '"maybe" is not sooner or later.' },
      { line: 5, field: 'participant', message: 'The participant code is empty.' },
    ]);
    expect(fit.message).toBe('5 problems in the file. Nothing was fitted.');
  });

  it('names a missing column of a raw-choices file', () => {
    const fit = fitPilotCsv('participant,magnitude,soonerAmount,laterAmount,laterDelay,choice\np01,small,10,20,30,later', { model });
    expect(fit.ok).toBe(false);
    if (fit.ok) return;
    expect(fit.issues).toEqual([{ line: 1, field: 'soonerDelay', message: 'The header has no "soonerDelay" column.' }]);
  });

  it('still reads a file of per-person rates as before', () => {
    const fit = fitPilotCsv('participant,kSmall,kLarge\na,0.02,0.01\nb,0.03,0.012\nc,0.01,0.005', { model });
    expect(fit.ok).toBe(true);
  });
});
