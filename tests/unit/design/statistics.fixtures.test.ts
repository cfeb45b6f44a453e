import { describe, expect, it } from 'vitest';
import { binomialTestHalf, choiceProbability, findRoot, fitPrior, maximiseBrent, normalQuantile, priorPoints, wilsonInterval, type Alternative, type RatePrior } from '@/lib/design';
import fixture from './fixtures/statistics/statistics.json';

// Reference values: tests/unit/design/fixtures/statistics/generate.py (scipy.stats.binomtest, mpmath at 50 digits,
// numpy, scipy.optimize polished in mpmath). Tolerances in units of machine epsilon ε = 2^−52 unless a reason is given.
const EPS = Number.EPSILON;
const rel = (got: number, want: number) => (want === 0 ? Math.abs(got) : Math.abs(got - want) / Math.abs(want));

describe('normal quantile against mpmath, p from 1e-300 to 1 − 1e-16', () => {
  it('is within 16 ε relative everywhere (Wichura AS 241 promises about 1e-16)', () => {
    for (const [p, want] of fixture.normalQuantile) {
      expect(rel(normalQuantile(p), want), `p = ${p}`).toBeLessThanOrEqual(16 * EPS);
    }
  });
});

describe('exact binomial test at 1/2 against scipy.stats.binomtest, n = 0 to 20,000', () => {
  it('gives every p-value within 8 ε·(1 + ln n!) relative (each term is exp of a difference of ln-factorials)', () => {
    // each term exp(ln n! − ln i! − ln (n − i)! − n ln 2) carries the rounding of ln-factorials of size ln n!, which
    // exp turns into that many ε of relative error (about 3e-10 at n = 20,000, 1.5e-14 at n = 33)
    const lnFactorial = [0];
    for (let i = 1; i <= 20000; i++) lnFactorial.push(lnFactorial[i - 1] + Math.log(i));
    for (const [x, n, two, greater, less] of fixture.binomialTestHalf) {
      const tol = 8 * EPS * (1 + lnFactorial[n]);
      const alternatives: [Alternative, number][] = [['two-sided', two], ['greater', greater], ['less', less]];
      for (const [alternative, want] of alternatives) {
        const got = binomialTestHalf(x, n, alternative).pValue;
        if (want < 1e-300) expect(got, `${x}/${n} ${alternative}`).toBeLessThan(1e-290);
        else expect(rel(got, want), `${x}/${n} ${alternative}`).toBeLessThanOrEqual(tol);
      }
    }
  });
});

describe('Wilson interval against its closed form in mpmath', () => {
  it('gives both ends within 64 ε absolute for n up to 10^6 and confidence up to 0.999999', () => {
    for (const [s, n, confidence, lower, upper] of fixture.wilsonInterval) {
      const got = wilsonInterval(s, n, confidence);
      expect(Math.abs(got.lower - lower), `${s}/${n} at ${confidence}`).toBeLessThanOrEqual(64 * EPS);
      expect(Math.abs(got.upper - upper), `${s}/${n} at ${confidence}`).toBeLessThanOrEqual(64 * EPS);
    }
  });
});

describe('logistic choice with lapse against mpmath', () => {
  it('is within 4 ε·(1 + |γΔ|) relative for γ from 1e-6 to 1e6, lapse 0 to 0.999 and gaps of either sign up to 1e300', () => {
    // γ·Δ is rounded, and exp turns that rounding into |γΔ|·ε of relative error in the small tail
    for (const [sensitivity, lapse, gap, want] of fixture.choiceProbability) {
      const got = choiceProbability({ sensitivity, lapse }, gap);
      if (want < 1e-300) expect(got, `γ=${sensitivity} ε=${lapse} Δ=${gap}`).toBeLessThan(1e-290);
      else expect(rel(got, want), `γ=${sensitivity} ε=${lapse} Δ=${gap}`).toBeLessThanOrEqual(4 * EPS * (1 + Math.abs(sensitivity * gap)));
    }
  });
});

describe('prior points against log-normal moments', () => {
  it('the 200-node quadrature reproduces E k, E K and E[k·K] = exp(μ + σ²/2) within 1e-12 relative, spreads up to 3', () => {
    // exp(σz) is entire: Gauss–Hermite with 200 nodes integrates it far beyond double precision for σ ≤ 3, so what is
    // left is the rounding of 40,000 weighted terms
    for (const { prior, meanSmall, meanLarge, meanProduct } of fixture.priorMoments as { prior: RatePrior; meanSmall: number; meanLarge: number; meanProduct: number }[]) {
      const { kSmall, kLarge, weights } = priorPoints(prior, { method: 'quadrature', nodes: 200 });
      let a = 0;
      let b = 0;
      let ab = 0;
      for (let i = 0; i < kSmall.length; i++) {
        a += weights![i] * kSmall[i];
        b += weights![i] * kLarge[i];
        ab += weights![i] * kSmall[i] * kLarge[i];
      }
      expect(rel(a, meanSmall), JSON.stringify(prior)).toBeLessThanOrEqual(1e-12);
      expect(rel(b, meanLarge), JSON.stringify(prior)).toBeLessThanOrEqual(1e-12);
      expect(rel(ab, meanProduct), JSON.stringify(prior)).toBeLessThanOrEqual(1e-12);
    }
  });

  it('fitPrior matches numpy’s means, population SDs and Pearson correlation of the logs within 64 ε·n relative', () => {
    for (const { estimates, prior } of fixture.fitPrior) {
      const got = fitPrior(estimates);
      const tol = 64 * EPS * estimates.length;
      for (const key of ['medianSmall', 'medianLarge', 'sdLogSmall', 'sdLogLarge', 'correlation'] as const) {
        expect(rel(got[key], prior[key]), `${key}, n = ${estimates.length}`).toBeLessThanOrEqual(tol);
      }
    }
  });
});

describe('solvers against scipy, polished at 50 digits', () => {
  const roots: Record<string, [(x: number) => number, number, number]> = {
    sqrt2: [(x) => x * x - 2, 0, 2],
    cosFixedPoint: [(x) => Math.cos(x) - x, 0, 1],
    exp10: [(x) => Math.exp(x) - 10, -5, 5],
    steepCubic: [(x) => (x - 1e-3) ** 3, -1, 2],
    tinyScale: [(x) => x - 3e-9, 0, 1e-8],
    logistic: [(x) => 1 / (1 + Math.exp(-50 * (x - 0.3))) - 0.5, -1, 1],
  };
  it('findRoot meets its absolute tolerance (1e-12 by default, 1e-20 asked for the tiny scale) on every test function', () => {
    for (const [name, [f, lower, upper]] of Object.entries(roots)) {
      const tolerance = name === 'tinyScale' ? 1e-20 : 1e-12;
      const result = findRoot(f, { lower, upper, tolerance });
      expect(result.converged, name).toBe(true);
      // Brent–Dekker stops when the bracket is within 2ε|x| + tolerance/2 of the root, so it lands within tolerance
      expect(Math.abs(result.root - (fixture.findRoot as Record<string, number>)[name]), name).toBeLessThanOrEqual(tolerance + 4 * EPS * Math.abs(result.root));
    }
  });

  const maxima: Record<string, [(x: number) => number, number, number]> = {
    parabola: [(x) => -((x - 1) ** 2), 0, 3],
    gapProductLike: [(x) => (1 / (1 + 0.05 * x) - 0.5 / 1.1) * (0.5 - 1 / (1 + 0.05 * (x - 1))), 21, 200],
    quarticFlat: [(x) => -((x - 0.7) ** 4) - 0.01 * (x - 0.7) ** 2, -2, 2],
    lognormalShape: [(x) => Math.exp(-(Math.log(x) ** 2) / 2) / x, 0.05, 3],
  };
  it('maximiseBrent places each maximum within 3e-8 relative: function values cannot place a smooth maximum closer than about √ε', () => {
    for (const [name, [f, lower, upper]] of Object.entries(maxima)) {
      const result = maximiseBrent(f, { lower, upper });
      expect(result.converged, name).toBe(true);
      expect(rel(result.argmax, (fixture.maximiseBrent as Record<string, number>)[name]), name).toBeLessThanOrEqual(3e-8);
    }
  });
});
