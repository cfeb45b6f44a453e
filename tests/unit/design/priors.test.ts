import { describe, expect, it } from 'vitest';
import * as ss from 'simple-statistics';
import jStat from 'jstat';
import * as design from '@/lib/design';
import {
  createRandom,
  DesignInputError,
  erfc,
  fitPrior,
  gaussHermite,
  normalCdf,
  priorPoints,
  reversalZone,
  reversibleShare,
  type ModelSpec,
  type RatePrior,
} from '@/lib/design';
import reference from '../../fixtures/reference/reference.json';

const prior: RatePrior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.9, sdLogLarge: 0.7, correlation: 0.6 };

describe('normal distribution function', () => {
  it('agrees with jstat.normal.cdf across the range (second opinion: jstat)', () => {
    for (let z = -8; z <= 8; z += 0.37) {
      const theirs = jStat.normal.cdf(z, 0, 1);
      // jstat's erf is a Chebyshev fit; its agreement with scipy over this range is what the fixture
      // test below pins down for ours, and 1e-12 relative holds for both libraries in both tails
      expect(Math.abs(normalCdf(z) - theirs)).toBeLessThan(1e-12 * Math.max(theirs, 1e-3));
    }
  });

  it('matches scipy.special.erfc to 1e-12 relative from −6 to 26.5, the far tail included (fixture: tests/fixtures/reference)', () => {
    // measured worst: 2.5e-13 relative (at x = 2.25); the sweep runs until erfc nears the subnormal range
    for (const { x, erfc: expected } of reference.erfc) {
      expect(Math.abs(erfc(x) / expected - 1), `erfc(${x})`).toBeLessThan(1e-12);
    }
  });

  it('keeps relative accuracy in the far tail: erfc(10) against the asymptotic series e^(−x²)/(x√π)·(1 − 1/(2x²) + 3/(4x⁴) − 15/(8x⁶)) (A&S 1964, 7.1.23)', () => {
    const x = 10;
    const asymptotic = (Math.exp(-x * x) / (x * Math.sqrt(Math.PI))) * (1 - 1 / (2 * x * x) + 3 / (4 * x ** 4) - 15 / (8 * x ** 6));
    // the asymptotic series truncated after the x^−6 term errs by < 105/(16x^8) ≈ 7e-8 relative
    expect(Math.abs(erfc(x) / asymptotic - 1)).toBeLessThan(1e-7);
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(erfc(0)).toBe(1);
  });
});

describe('Gauss–Hermite rule', () => {
  it('keeps the TSDoc example: one node carries weight √π', () => {
    expect(gaussHermite({ count: 1 }).weights[0]).toBeCloseTo(Math.sqrt(Math.PI), 14);
  });

  it('integrates normal moments exactly up to degree 2n − 1 (E Z² = 1, E Z⁴ = 3, E Z⁶ = 15, E Z^8 = 105: (2m − 1)!!)', () => {
    for (const n of [5, 12, 40]) {
      const { nodes, weights } = gaussHermite({ count: n });
      const moment = (p: number) => nodes.reduce((acc, x, i) => acc + (weights[i] / Math.sqrt(Math.PI)) * (Math.SQRT2 * x) ** p, 0);
      expect(moment(0)).toBeCloseTo(1, 13);
      expect(moment(1)).toBeCloseTo(0, 13);
      expect(moment(2)).toBeCloseTo(1, 12);
      expect(moment(4)).toBeCloseTo(3, 11);
      if (2 * n - 1 >= 8) expect(moment(8)).toBeCloseTo(105, 9);
    }
  });

  it('integrates E exp(Z) = e^(1/2) (lognormal mean) to 1e-12 with 24 nodes', () => {
    const { nodes, weights } = gaussHermite({ count: 24 });
    const v = nodes.reduce((acc, x, i) => acc + (weights[i] / Math.sqrt(Math.PI)) * Math.exp(Math.SQRT2 * x), 0);
    expect(Math.abs(v - Math.exp(0.5))).toBeLessThan(1e-12);
  });
});

describe('prior points', () => {
  it('keeps the TSDoc example: a point-mass prior gives its median', () => {
    const p = priorPoints({ medianSmall: 0.01, medianLarge: 0.005, sdLogSmall: 0, sdLogLarge: 0, correlation: 0 }, { method: 'quadrature', nodes: 1 });
    expect(p.kSmall[0]).toBeCloseTo(0.01, 15);
  });

  it('Monte Carlo draws have the prior log-means, SDs and correlation (second opinion: simple-statistics)', () => {
    const p = priorPoints(prior, { method: 'monte-carlo', count: 100_000, random: createRandom({ seed: 5 }) });
    const a = Array.from(p.kSmall, Math.log);
    const b = Array.from(p.kLarge, Math.log);
    // SE of a mean ≈ σ/√n ≈ 3e-3, of an SD ≈ σ/√(2n) ≈ 2e-3, of r ≈ (1 − r²)/√n ≈ 2e-3: 5 SE each
    expect(Math.abs(ss.mean(a) - Math.log(0.02))).toBeLessThan(0.015);
    expect(Math.abs(ss.mean(b) - Math.log(0.008))).toBeLessThan(0.012);
    expect(Math.abs(ss.standardDeviation(a) - 0.9)).toBeLessThan(0.01);
    expect(Math.abs(ss.standardDeviation(b) - 0.7)).toBeLessThan(0.008);
    expect(Math.abs(ss.sampleCorrelation(a, b) - 0.6)).toBeLessThan(0.01);
  });

  it('the quadrature rule reproduces the prior moments exactly (weights sum to 1)', () => {
    const p = priorPoints(prior, { method: 'quadrature', nodes: 10 });
    const w = p.weights!;
    const E = (f: (i: number) => number) => w.reduce((acc, wi, i) => acc + wi * f(i), 0);
    const la = (i: number) => Math.log(p.kSmall[i]) - Math.log(0.02);
    const lb = (i: number) => Math.log(p.kLarge[i]) - Math.log(0.008);
    expect(E(() => 1)).toBeCloseTo(1, 13);
    expect(E((i) => la(i) ** 2)).toBeCloseTo(0.81, 12);
    expect(E((i) => lb(i) ** 2)).toBeCloseTo(0.49, 12);
    expect(E((i) => la(i) * lb(i))).toBeCloseTo(0.6 * 0.9 * 0.7, 12);
  });
});

describe('share of the prior that can reverse', () => {
  it('hyperbolic: equals Φ((μ_k − μ_K − ln x)/√(σ_k² + σ_K² − 2ρσ_kσ_K)) (non-empty iff k > xK; Φ by jstat.normal.cdf)', () => {
    const sd = Math.sqrt(0.81 + 0.49 - 2 * 0.6 * 0.9 * 0.7);
    const expected = jStat.normal.cdf((Math.log(0.02) - Math.log(0.008) - Math.log(0.3)) / sd, 0, 1);
    // 64-node Gauss–Hermite on a smooth integrand: 1e-10 absolute
    expect(Math.abs(reversibleShare(prior, { model: { id: 'hyperbolic' }, ratio: 0.3, soonDelay: 14 }) - expected)).toBeLessThan(1e-10);
  });

  it('keeps the TSDoc example: exponential share is Φ(ln 2) for equal log-SDs 1 and ρ = 0.5 (jstat.normal.cdf)', () => {
    const share = reversibleShare({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.5 }, { model: { id: 'exponential' }, ratio: 0.5, soonDelay: 7 });
    expect(Math.abs(share - jStat.normal.cdf(Math.LN2, 0, 1))).toBeLessThan(1e-10);
  });

  it('other models agree with the share of Monte Carlo draws whose zone is non-empty (independent check through reversalZone)', () => {
    const models: ModelSpec[] = [
      { id: 'hyperboloid', sensitivity: 0.6 },
      { id: 'power-delay', sensitivity: 0.7 },
      { id: 'exponential-power', sensitivity: 0.5 },
      { id: 'quasi-hyperbolic', presentBias: 0.8 },
    ];
    const n = 40_000;
    const draws = priorPoints(prior, { method: 'monte-carlo', count: n, random: createRandom({ seed: 9 }) });
    for (const model of models) {
      let hits = 0;
      for (let i = 0; i < n; i++) if (reversalZone({ model, ratio: 0.4, soonDelay: 30, kSmall: draws.kSmall[i], kLarge: draws.kLarge[i] }) !== null) hits++;
      const mc = hits / n;
      const share = reversibleShare(prior, { model, ratio: 0.4, soonDelay: 30 });
      // binomial SE √(p(1 − p)/n) ≤ 2.5e-3: 4 SE
      expect(Math.abs(share - mc), model.id).toBeLessThan(0.01);
    }
  });

  it('is 0 when the soon delay is 0', () => {
    expect(reversibleShare(prior, { model: { id: 'quasi-hyperbolic', presentBias: 0.5 }, ratio: 0.5, soonDelay: 0 })).toBe(0);
  });
});

describe('fitting a prior to pilot estimates', () => {
  it('keeps the TSDoc example: identical rows give their rate as median and SD 0', () => {
    const rows = [0, 1, 2].map(() => ({ kSmall: 0.01, kLarge: 0.001 }));
    const fit = fitPrior(rows);
    expect(fit.medianSmall).toBeCloseTo(0.01, 15);
    expect(fit.sdLogSmall).toBe(0);
    expect(fit.correlation).toBe(0);
  });

  it('matches the ML formulas computed by simple-statistics (mean, population SD, correlation of logs)', () => {
    const r = createRandom({ seed: 21 });
    const rows = Array.from({ length: 50 }, () => ({ kSmall: Math.exp(-4 + r.normal()), kLarge: Math.exp(-5 + 0.5 * r.normal()) }));
    const a = rows.map((x) => Math.log(x.kSmall));
    const b = rows.map((x) => Math.log(x.kLarge));
    const fit = fitPrior(rows);
    expect(Math.log(fit.medianSmall)).toBeCloseTo(ss.mean(a), 12);
    expect(fit.sdLogSmall).toBeCloseTo(ss.standardDeviation(a), 12); // simple-statistics' standardDeviation divides by n
    expect(fit.sdLogLarge).toBeCloseTo(ss.standardDeviation(b), 12);
    expect(fit.correlation).toBeCloseTo(ss.sampleCorrelation(a, b), 12);
  });

  it('recovers a known prior from many seeded draws', () => {
    const p = priorPoints(prior, { method: 'monte-carlo', count: 20_000, random: createRandom({ seed: 33 }) });
    const fit = fitPrior(Array.from(p.kSmall, (k, i) => ({ kSmall: k, kLarge: p.kLarge[i] })));
    // SEs at n = 2e4: ≈ 6e-3 for log-means, 5e-3 for SDs, 5e-3 for r: 4 SE
    expect(Math.abs(Math.log(fit.medianSmall / prior.medianSmall))).toBeLessThan(0.025);
    expect(Math.abs(fit.sdLogLarge - prior.sdLogLarge)).toBeLessThan(0.02);
    expect(Math.abs(fit.correlation - prior.correlation)).toBeLessThan(0.02);
  });

  it('refuses fewer than 3 rows and bad rates with the row named', () => {
    expect(() => fitPrior([{ kSmall: 1, kLarge: 1 }, { kSmall: 1, kLarge: 1 }])).toThrow(/estimates must be a list of at least 3 rows/);
    try {
      fitPrior([{ kSmall: 1, kLarge: 1 }, { kSmall: 1, kLarge: NaN }, { kSmall: 1, kLarge: 1 }]);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(DesignInputError);
      expect((e as DesignInputError).field).toBe('estimates[1].kLarge');
    }
  });
});

describe('checks and small helpers keep their TSDoc examples', () => {
  it('erfc(0) = 1 and Φ(0) = 1/2', () => {
    expect(erfc(0)).toBe(1);
    expect(normalCdf(0)).toBe(0.5);
  });
  it('checkPrior names prior.correlation for a correlation of 2', () => {
    expect(() => design.checkPrior({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 2 })).toThrow(expect.objectContaining({ field: 'prior.correlation' }));
  });
  it('checkChoiceModel names choice.sensitivity for γ = 0', () => {
    expect(() => design.checkChoiceModel({ sensitivity: 0 })).toThrow(expect.objectContaining({ field: 'choice.sensitivity' }));
  });
});
