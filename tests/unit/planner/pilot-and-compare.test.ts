import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { bestOf, compareRows, robustness } from '@/lib/shared/planner/compare';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { fitPilotCsv } from '@/lib/shared/planner/pilot-csv';
import { fmtSmallRow } from '@/lib/shared/planner/format';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { PriorValues } from '@/lib/shared/validations/planner';

describe('pilot uploads', () => {
  const rows = [
    ['p01', 0.021, 0.009],
    ['p02', 0.035, 0.012],
    ['p03', 0.011, 0.006],
    ['p04', 0.05, 0.02],
    ['p05', 0.008, 0.007],
  ] as const;
  const csv = ['participant,kSmall,kLarge', ...rows.map((r) => r.join(','))].join('\n');

  it('fits the log-normal prior by maximum likelihood (simple-statistics as the second opinion)', () => {
    const fit = fitPilotCsv(csv);
    if (!fit.ok) throw new Error(fit.message);
    const a = rows.map((r) => Math.log(r[1]));
    const b = rows.map((r) => Math.log(r[2]));
    expect(fit.rows).toBe(5);
    expect(fit.prior.medianSmall).toBeCloseTo(Math.exp(ss.mean(a)), 12);
    expect(fit.prior.medianLarge).toBeCloseTo(Math.exp(ss.mean(b)), 12);
    expect(fit.prior.sdLogSmall).toBeCloseTo(ss.standardDeviation(a), 12); // population SD = ML estimate
    expect(fit.prior.sdLogLarge).toBeCloseTo(ss.standardDeviation(b), 12);
    expect(fit.prior.correlation).toBeCloseTo(ss.sampleCorrelation(a, b), 12);
  });

  it('lists every bad cell with its line and column, and fits nothing', () => {
    const fit = fitPilotCsv('participant,kSmall,kLarge\np1,0.02,0.01\np2,abc,0.01\n\np3,0.03,-1\np1,0.01,0.01\n');
    expect(fit.ok).toBe(false);
    if (fit.ok) return;
    expect(fit.issues).toEqual([
      expect.objectContaining({ line: 3, field: 'kSmall' }),
      expect.objectContaining({ line: 5, field: 'kLarge' }),
      expect.objectContaining({ line: 6, field: 'participant' }),
    ]);
    expect(fit.message).toMatch(/Nothing was fitted/);
  });

  it('names missing columns in the header', () => {
    const fit = fitPilotCsv('id,kSmall\n1,0.02\n');
    expect(fit.ok).toBe(false);
    if (!fit.ok) expect(fit.issues.map((i) => i.field)).toEqual(['participant', 'kLarge']);
  });

  it('refuses files over 5 MB and over 100,000 rows with a clear message', () => {
    const big = 'participant,kSmall,kLarge\n' + 'p,0.02,0.01,'.padEnd(100, 'x').concat('\n').repeat(53_000);
    const tooBig = fitPilotCsv(big);
    expect(tooBig.ok).toBe(false);
    if (!tooBig.ok) expect(tooBig.message).toMatch(/larger than 5 MB/);
    const many = 'participant,kSmall,kLarge\n' + Array.from({ length: 100_001 }, (_, i) => `p${i},0.02,0.01`).join('\n');
    const tooMany = fitPilotCsv(many);
    expect(tooMany.ok).toBe(false);
    if (!tooMany.ok) expect(tooMany.message).toMatch(/more than 100,000 rows/);
  });
});

describe('comparing designs', () => {
  const prior: PriorValues = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };

  it('highlights the best value of a row, ties included, and nothing with fewer than two values', () => {
    expect(bestOf([0.2, 0.5, 0.5, null], 'higher')).toEqual([1, 2]);
    expect(bestOf([3, 1, 2], 'lower')).toEqual([1]);
    expect(bestOf([0.2, null], 'higher')).toEqual([]);
    expect(bestOf([0.2, 0.3], 'none')).toEqual([]);
  });

  it('reports the design’s own-model reversal rate first in the robustness rows, equal to the design page’s', () => {
    for (const mode of ['personalised', 'population'] as const) {
      const input = { spec: { ...defaultSpec('A', 1), mode }, prior };
      const summary = computeDesignSummary(input);
      const rows = robustness(input, summary);
      expect(rows[0]).toMatchObject({ own: true, model: { id: 'hyperbolic' } });
      expect(rows[0].rate).toBeCloseTo(summary.expectedReversalRate, 12);
      expect(rows).toHaveLength(6);
    }
  });

  it('builds one column per design with the zone width and the criterion', () => {
    const a = { spec: defaultSpec('A', 1), prior };
    const b = { spec: { ...defaultSpec('B', 1), soonDelay: { mode: 'fixed' as const, days: 30 } }, prior };
    const rows = compareRows([a, b], [computeDesignSummary(a), computeDesignSummary(b)]);
    const width = rows.find((r) => r.key === 'zone-width')!;
    // hyperbolic zone width D_upper − D_lower = kd/(xK) − d grows with d when k > xK (docs/mathematics.md closed forms): the 30-day design wins
    expect(width.values[0]).toBeCloseTo((0.02 * 14) / (0.6 * 0.008) - 14, 9);
    expect(width.best).toEqual([1]);
    expect(rows.find((r) => r.key === 'criterion')!.better).toBe('higher');
  });

  it('shows anchor clarity as a share of the probe’s gap product (100% by construction unless the distance bound stopped the anchor), not a copy of the gap-product row', () => {
    const a = { spec: defaultSpec('A', 1), prior };
    const b = { spec: { ...defaultSpec('B', 1), soonDelay: { mode: 'fixed' as const, days: 30 } }, prior };
    const summaries = [computeDesignSummary(a), computeDesignSummary(b)];
    const rows = compareRows([a, b], summaries);
    for (const key of ['late-clarity', 'soon-clarity'] as const) {
      const row = rows.find((r) => r.key === key)!;
      expect(row.unit).toBe('share of the target');
      expect(row.note).toMatch(/distance bound/);
      summaries.forEach((s, i) => {
        const anchor = key === 'late-clarity' ? s.typical.lateAnchor : s.typical.soonAnchor;
        if (!anchor) return expect(row.values[i]).toBeNull();
        // anchorDelays' root finder meets the target to its own tolerance when the bound is not reached
        if (anchor.reachesTarget) expect(row.values[i]).toBeCloseTo(1, 6);
        else expect(row.values[i]!).toBeLessThan(1);
      });
    }
  });
});

describe('one number format per row', () => {
  it('writes every value of a row in exponent notation when any of them is below 0.01', () => {
    const f = fmtSmallRow([0.0123, 0.00456, null]);
    expect([f(0.0123), f(0.00456), f(null)]).toEqual(['1.23e-2', '4.56e-3', '—']);
  });
  it('keeps plain notation when every value is 0.01 or more (or zero)', () => {
    const f = fmtSmallRow([0.0123, 0.5, 0]);
    expect([f(0.0123), f(0.5), f(0)]).toEqual(['0.0123', '0.5', '0']);
  });
});
