import { describe, expect, it } from 'vitest';
import { fmin } from './secondOpinion';
import { DesignInputError, findRoot, maximiseBrent } from '@/lib/design';

describe('root finder (Brent–Dekker)', () => {
  it('keeps the TSDoc example: the root of x² − 2 on [0, 2] is √2', () => {
    expect(findRoot((x) => x * x - 2, { lower: 0, upper: 2 }).root).toBeCloseTo(Math.SQRT2, 12);
  });

  it('agrees with fmin.bisect on awkward functions (second opinion: fmin.bisect)', () => {
    const cases: [(x: number) => number, number, number][] = [
      [(x) => Math.cos(x) - x, 0, 1],
      [(x) => Math.exp(x) - 1e6, 0, 50],
      [(x) => Math.pow(x, 9) - 0.5, 0, 1],
      [(x) => Math.atan(1000 * (x - 0.123456)), -5, 5],
      [(x) => 1 / (1 + 0.05 * x) - 0.3, 0, 1000],
    ];
    for (const [f, a, b] of cases) {
      const ours = findRoot(f, { lower: a, upper: b, tolerance: 1e-13 });
      const theirs = fmin.bisect(f, a, b, { tolerance: 1e-13, maxIterations: 400 });
      expect(ours.converged).toBe(true);
      // both stop at ~1e-13 absolute on the argument
      expect(Math.abs(ours.root - theirs)).toBeLessThan(1e-11 * Math.max(1, Math.abs(theirs)));
      expect(ours.iterations).toBeLessThan(60);
    }
  });

  it('reports non-convergence instead of a plausible number', () => {
    const r = findRoot((x) => Math.atan(1000 * (x - 0.123456)), { lower: -5, upper: 5, tolerance: 1e-15, maxIterations: 3 });
    expect(r.converged).toBe(false);
  });

  it('refuses a bracket without a sign change, and non-finite bounds', () => {
    expect(() => findRoot((x) => x * x + 1, { lower: -1, upper: 1 })).toThrow(DesignInputError);
    expect(() => findRoot((x) => x, { lower: -Infinity, upper: 1 })).toThrow(DesignInputError);
    expect(() => findRoot((x) => x, { lower: NaN, upper: 1 })).toThrow(DesignInputError);
    expect(() => findRoot((x) => x, { lower: 1, upper: -1 })).toThrow(DesignInputError);
  });
});

describe('Brent maximiser', () => {
  it('keeps the TSDoc example: the maximum of −(x − 1)² on [0, 3] is at 1', () => {
    // a quadratic is fitted exactly by the parabolic step; the stopping rule leaves ~1e-8
    expect(maximiseBrent((x) => -(x - 1) * (x - 1), { lower: 0, upper: 3 }).argmax).toBeCloseTo(1, 7);
  });

  it('agrees with fmin.nelderMead on smooth unimodal functions (second opinion: fmin.nelderMead)', () => {
    const cases: [(x: number) => number, number, number][] = [
      [(x) => x * Math.exp(-x), 0, 10],
      [(x) => Math.sin(x), 0, 3],
      [(x) => -Math.cosh(x - 0.3), -2, 2],
    ];
    for (const [f, a, b] of cases) {
      const ours = maximiseBrent(f, { lower: a, upper: b, tolerance: 1e-12 });
      const theirs = fmin.nelderMead((v) => -f(v[0]), [(a + b) / 2], { maxIterations: 5000, minErrorDelta: 1e-16, minTolerance: 1e-14 });
      // function values place a smooth maximum only to ~sqrt(eps) ≈ 1.5e-8 relative: allow 1e-6
      expect(Math.abs(ours.argmax - theirs.x[0])).toBeLessThan(1e-6);
      expect(ours.value).toBeGreaterThanOrEqual(-theirs.fx - 1e-15);
    }
  });

  it('reports non-convergence when iterations run out', () => {
    expect(maximiseBrent((x) => Math.sin(x), { lower: 0, upper: 3, maxIterations: 2 }).converged).toBe(false);
  });

  it('refuses non-finite or unordered bounds and a non-positive tolerance', () => {
    expect(() => maximiseBrent((x) => x, { lower: 0, upper: Infinity })).toThrow(DesignInputError);
    expect(() => maximiseBrent((x) => x, { lower: 2, upper: 1 })).toThrow(DesignInputError);
    expect(() => maximiseBrent((x) => x, { lower: 0, upper: 1, tolerance: 0 })).toThrow(DesignInputError);
  });
});
