import { describe, expect, it } from 'vitest';
import { erfc, gaussHermite, normalCdf } from '@/lib/design';
import special from './fixtures/special/erfc.json';
import hermite from './fixtures/special/gauss-hermite.json';

// Reference values: tests/unit/design/fixtures/special/generate.py (mpmath at 50 digits; scipy.special.roots_hermite
// polished at 50 digits). Tolerances are in units of machine epsilon ε = 2^−52.
const EPS = Number.EPSILON;

describe('erfc and the normal distribution function against mpmath over the whole real line', () => {
  it('erfc keeps relative accuracy within 64 ε·(1 + x²) wherever its value is a normal double', () => {
    // the series for |x| < 0.8 sums positive terms (1 − erf then loses at most a factor 4) and the continued
    // fraction beyond it is evaluated backwards: both lose only a few dozen roundings; exp(−x²) carries
    // x²·ε of argument error for large |x| (x² is rounded), hence the factor (1 + x²)
    for (const [x, want] of special.erfc) {
      const got = erfc(x);
      if (want < 1e-300) {
        expect(got).toBeLessThan(1e-290);
        continue;
      }
      expect(Math.abs(got - want) / want, `erfc(${x})`).toBeLessThanOrEqual(64 * EPS * (1 + x * x));
    }
  });

  it('normalCdf keeps relative accuracy within 64 ε·(1 + z²) down to the deepest tail a double holds', () => {
    for (const [z, want] of special.normalCdf) {
      const got = normalCdf(z);
      if (want < 1e-300) continue;
      expect(Math.abs(got - want) / want, `Φ(${z})`).toBeLessThanOrEqual(64 * EPS * (1 + z * z));
    }
  });

  it('erfc of NaN is NaN', () => {
    expect(erfc(NaN)).toBeNaN();
  });
});

describe('Gauss–Hermite rules against 50-digit references for every count from 1 to 200', () => {
  const rules = hermite.rules as Record<string, { nodes: number[]; weights: number[] }>;

  it('places every node within 8 ε·max(1, |x|) of the reference: no two nodes share a root at any count', () => {
    // Newton on the three-term recurrence converges to the correctly rounded root up to the rounding of the
    // recurrence itself (a few ulps); 8 ε leaves room for that, and is far below the gap between nodes
    for (let n = 1; n <= 200; n++) {
      const rule = gaussHermite({ count: n });
      const ref = rules[n];
      expect(rule.nodes.length).toBe(n);
      ref.nodes.forEach((want, i) => {
        expect(Math.abs(rule.nodes[i] - want), `n = ${n}, node ${i}`).toBeLessThanOrEqual(8 * EPS * Math.max(1, Math.abs(want)));
        expect(rule.nodes[n - 1 - i] === -rule.nodes[i]).toBe(true);
      });
    }
  });

  it('gives every weight to a relative accuracy of (16 + 6n) ε, down to the 1e−170 weights of the outermost nodes at n = 200', () => {
    // the weight 2/(√(2n)·p̃_(n−1))² inherits the rounding of n steps of the recurrence (a few roundings
    // each, doubled by the square), so its relative error grows about linearly with n: 4.5n ε at worst (n = 155)
    for (let n = 1; n <= 200; n++) {
      const rule = gaussHermite({ count: n });
      rules[n].weights.forEach((want, i) => {
        expect(Math.abs(rule.weights[i] / want - 1), `n = ${n}, weight ${i}`).toBeLessThanOrEqual((16 + 6 * n) * EPS);
        expect(rule.weights[n - 1 - i]).toBe(rule.weights[i]);
      });
    }
  });

  it('weights sum to √π at every count (the zeroth moment; 4n ε for the sum of n terms)', () => {
    for (let n = 1; n <= 200; n++) {
      const { weights } = gaussHermite({ count: n });
      const sum = weights.reduce((a, b) => a + b, 0);
      expect(Math.abs(sum / Math.sqrt(Math.PI) - 1), `n = ${n}`).toBeLessThanOrEqual(4 * n * EPS);
    }
  });
});
