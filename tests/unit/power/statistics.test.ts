import { describe, expect, it } from 'vitest';
import binomialTest from '@stdlib/stats-binomial-test';
import jstat from 'jstat';
import { mcnemarExactTest, normalQuantile, sampleSizeFor, signTest, wilsonInterval } from '@/lib/design';
import reference from '../../fixtures/reference/reference.json';

const { jStat } = jstat as unknown as { jStat: { normal: { inv: (p: number, mean: number, sd: number) => number } } };

describe('exact McNemar test on LS against SL counts', () => {
  it('equals the exact binomial test at 1/2 of an independent library for many counts', () => {
    // second opinion: @stdlib/stats-binomial-test (independent npm implementation)
    for (const [b, c] of [[0, 1], [1, 0], [3, 7], [9, 1], [12, 12], [30, 18], [55, 41], [140, 99], [400, 350]]) {
      for (const alternative of ['two-sided', 'greater', 'less'] as const) {
        const expected = binomialTest(b, b + c, { p: 0.5, alternative }).pValue;
        // sums of up to 750 positive terms: 1e-12 relative is honest
        expect(mcnemarExactTest(b, c, alternative).pValue).toBeCloseTo(expected, 12);
        expect(Math.abs(mcnemarExactTest(b, c, alternative).pValue - expected)).toBeLessThanOrEqual(1e-12 * Math.max(expected, 1e-300) + 1e-300);
      }
    }
  });

  it('gives 11/1024 one-sided and 22/1024 two-sided for 9 LS against 1 SL (exact arithmetic: P(X ≥ 9) = (10 + 1)/2^10)', () => {
    expect(mcnemarExactTest(9, 1, 'greater').pValue).toBeCloseTo(11 / 1024, 15);
    expect(mcnemarExactTest(9, 1, 'two-sided').pValue).toBeCloseTo(22 / 1024, 15);
    // a sum of ten terms: 1e-13 absolute is honest
    expect(mcnemarExactTest(9, 1, 'less').pValue).toBeCloseTo(1 - 1 / 1024, 13);
  });

  it('answers 1 when there are no discordant pairs or they are balanced two-sided', () => {
    expect(mcnemarExactTest(0, 0, 'greater').pValue).toBe(1);
    expect(mcnemarExactTest(6, 6, 'two-sided').pValue).toBe(1);
  });

  it('keeps tiny tail probabilities instead of rounding them to 0', () => {
    // P(X ≥ 60 | n = 60) = 2^−60 (exact arithmetic)
    expect(mcnemarExactTest(60, 0, 'greater').pValue / 2 ** -60).toBeCloseTo(1, 12);
  });

  it('refuses counts that are not whole numbers and unknown alternatives', () => {
    expect(() => mcnemarExactTest(-1, 3, 'greater')).toThrow(/b/);
    expect(() => mcnemarExactTest(1.5, 3, 'greater')).toThrow(/b/);
    expect(() => mcnemarExactTest(1, 3, 'bigger' as never)).toThrow(/alternative/);
  });
});

describe('sign test', () => {
  it('matches the exact binomial test of an independent library', () => {
    // second opinion: @stdlib/stats-binomial-test
    expect(signTest(8, 2, 'greater').pValue).toBeCloseTo(binomialTest(8, 10, { alternative: 'greater' }).pValue, 14);
    expect(signTest(8, 2, 'greater').pValue).toBeCloseTo(56 / 1024, 15); // exact arithmetic: (1 + 10 + 45)/2^10
  });
});

describe('Wilson score interval', () => {
  it('reproduces the Wilson intervals tabulated by Newcombe (1998, Stat Med 17:857–872, Table I, method 3)', () => {
    // Newcombe's table rounds to 4 decimals, so 5e-5 is the tolerance; the same four cases to full
    // precision are in the scipy fixture (next test)
    const cases: Array<[number, number, number, number]> = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [x, n, lower, upper] of cases) {
      const interval = wilsonInterval(x, n);
      expect(Math.abs(interval.lower - lower)).toBeLessThan(5e-5 + 1e-12);
      expect(Math.abs(interval.upper - upper)).toBeLessThan(5e-5 + 1e-12);
    }
  });

  it('matches scipy.stats.binomtest(...).proportion_ci(method="wilson") over n from 1 to 10,000, every edge, three levels (fixture: tests/fixtures/reference)', () => {
    // the formula is closed; Φ⁻¹ (AS 241) is good to about 1e-16 relative, so a few ulps: 1e-14 absolute (measured worst 3.3e-16)
    for (const c of reference.wilson) {
      const interval = wilsonInterval(c.successes, c.trials, c.confidence);
      expect(Math.abs(interval.lower - c.lower), `${c.successes}/${c.trials} at ${c.confidence}`).toBeLessThan(1e-14);
      expect(Math.abs(interval.upper - c.upper), `${c.successes}/${c.trials} at ${c.confidence}`).toBeLessThan(1e-14);
    }
  });

  it('is [0, 1] without trials and touches 0 and 1 at the extremes', () => {
    expect(wilsonInterval(0, 0)).toEqual({ lower: 0, upper: 1 });
    expect(wilsonInterval(0, 50).lower).toBe(0);
    expect(wilsonInterval(50, 50).upper).toBe(1);
  });

  it('widens with the confidence level', () => {
    const a = wilsonInterval(40, 100, 0.9);
    const b = wilsonInterval(40, 100, 0.99);
    expect(b.lower).toBeLessThan(a.lower);
    expect(b.upper).toBeGreaterThan(a.upper);
  });

  it('refuses successes above trials and confidences outside (0, 1)', () => {
    expect(() => wilsonInterval(5, 4)).toThrow(/successes/);
    expect(() => wilsonInterval(1, 4, 1)).toThrow(/confidence/);
  });
});

describe('normal quantile', () => {
  it('agrees with jStat to 1e-9 across the range (independent library)', () => {
    for (const p of [1e-10, 0.001, 0.025, 0.3, 0.5, 0.8, 0.975, 0.999999]) {
      // jStat's inverse is itself accurate to about 1e-9; that is the honest tolerance
      expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 8);
    }
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14); // Φ⁻¹(0.975), standard tables
  });
});

describe('sample size for a target power', () => {
  it('interpolates linearly between the simulated sizes that straddle the target', () => {
    expect(sampleSizeFor([{ n: 20, power: 0.6 }, { n: 40, power: 0.9 }], 0.8)).toEqual({ kind: 'interpolated', n: 34, between: [20, 40] });
  });
  it('says "at most" when the smallest size already reaches it, and "not reached" when none does', () => {
    expect(sampleSizeFor([{ n: 20, power: 0.95 }, { n: 40, power: 1 }], 0.8)).toEqual({ kind: 'at-most', n: 20 });
    expect(sampleSizeFor([{ n: 20, power: 0.1 }, { n: 40, power: 0.2 }], 0.8)).toEqual({ kind: 'not-reached', largest: 40 });
  });
});
