import { describe, expect, it } from 'vitest';
import { predictPattern, preferenceGaps, reversalZone, type ModelSpec } from '@/lib/design';

const hyperbolic: ModelSpec = { id: 'hyperbolic' };
const exponential: ModelSpec = { id: 'exponential' };

describe('preference gaps', () => {
  it('keeps the TSDoc example (direct evaluation of A = f_K(D) − x·f_k(d), B = x − f_K(D − d))', () => {
    const g = preferenceGaps({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 20, kSmall: 0.1, kLarge: 0.05 });
    expect(g.far).toBeCloseTo(0.25, 15);
    expect(g.near).toBeCloseTo(0.5 - 1 / 1.5, 15);
  });

  it('at an infinite late delay the far view picks SS and the near view picks SS', () => {
    const g = preferenceGaps({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: Infinity, kSmall: 0.1, kLarge: 0.05 });
    expect(g.far).toBeCloseTo(-0.25, 15);
    expect(g.near).toBe(0.5);
    expect(predictPattern({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: Infinity, kSmall: 0.1, kLarge: 0.05 })).toBe('SS');
  });
});

describe('reversal zone bounds (closed forms of docs/mathematics.md, checked by the pattern at the edges)', () => {
  it('hyperbolic: D_lower = d + (1 − x)/(xK), D_upper = (1 + kd − x)/(xK)', () => {
    const z = reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 });
    // direct evaluation: 10 + 0.5/0.025 = 30, (1 + 1 − 0.5)/0.025 = 60 (the TSDoc example)
    expect(z!.lower).toBeCloseTo(30, 12);
    expect(z!.upper).toBeCloseTo(60, 12);
  });

  it('exponential: D_lower = d + ln(1/x)/K, D_upper = (kd + ln(1/x))/K', () => {
    const z = reversalZone({ model: exponential, ratio: 0.4, soonDelay: 7, kSmall: 0.03, kLarge: 0.01 });
    expect(z!.lower).toBeCloseTo(7 + Math.log(2.5) / 0.01, 10);
    expect(z!.upper).toBeCloseTo((0.21 + Math.log(2.5)) / 0.01, 10);
  });

  it('the far gap vanishes at D_upper and the near gap at D_lower, for every model', () => {
    const models: ModelSpec[] = [
      hyperbolic,
      exponential,
      { id: 'hyperboloid', sensitivity: 0.5 },
      { id: 'power-delay', sensitivity: 0.8 },
      { id: 'exponential-power', sensitivity: 0.6 },
      { id: 'quasi-hyperbolic', presentBias: 0.9 },
    ];
    for (const model of models) {
      const input = { model, ratio: 0.6, soonDelay: 30, kSmall: 0.05, kLarge: 0.02 };
      const z = reversalZone(input)!;
      expect(z, model.id).not.toBeNull();
      // gaps are differences of O(1) factors: 1e-12 absolute is a few roundings
      expect(Math.abs(preferenceGaps({ ...input, lateDelay: z.upper }).far)).toBeLessThan(1e-12);
      expect(Math.abs(preferenceGaps({ ...input, lateDelay: z.lower }).near)).toBeLessThan(1e-12);
    }
  });

  it('is empty when small rewards are discounted no faster than large ones (exponential)', () => {
    expect(reversalZone({ model: exponential, ratio: 0.5, soonDelay: 10, kSmall: 0.01, kLarge: 0.01 })).toBeNull();
    expect(reversalZone({ model: exponential, ratio: 0.5, soonDelay: 10, kSmall: 0.0101, kLarge: 0.01 })).not.toBeNull();
  });

  it('is empty for hyperbolic discounters when k ≤ xK and open when k > xK', () => {
    expect(reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.005, kLarge: 0.01 })).toBeNull();
    expect(reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.0051, kLarge: 0.01 })).not.toBeNull();
  });

  it('is empty when the soon delay is 0 (both views coincide)', () => {
    expect(reversalZone({ model: { id: 'quasi-hyperbolic', presentBias: 0.5 }, ratio: 0.5, soonDelay: 0, kSmall: 0.1, kLarge: 0.01 })).toBeNull();
    expect(reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 0, kSmall: 0.1, kLarge: 0.01 })).toBeNull();
  });

  it('quasi-hyperbolic reverses with equal rates through present bias alone, from d when β ≤ x', () => {
    const z = reversalZone({ model: { id: 'quasi-hyperbolic', presentBias: 0.5 }, ratio: 0.6, soonDelay: 10, kSmall: 0.01, kLarge: 0.01 });
    expect(z!.lower).toBe(10);
    expect(z!.upper).toBeCloseTo((0.1 - Math.log(0.6)) / 0.01, 10); // direct evaluation of (kd + ln(1/x))/K
    expect(predictPattern({ model: { id: 'quasi-hyperbolic', presentBias: 0.5 }, ratio: 0.6, soonDelay: 10, lateDelay: 10.001, kSmall: 0.01, kLarge: 0.01 })).toBe('LS');
  });

  it('handles ratios near 0 and 1', () => {
    const nearOne = reversalZone({ model: hyperbolic, ratio: 1 - 1e-9, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })!;
    expect(nearOne.lower).toBeCloseTo(10, 6); // (1 − x)/(xK) ≈ 2e-8 days
    expect(nearOne.upper).toBeCloseTo(20, 6); // kd/K
    const nearZero = reversalZone({ model: hyperbolic, ratio: 1e-9, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })!;
    expect(nearZero.upper / nearZero.lower).toBeCloseTo(2, 6); // ratio of bounds → 1 + kd as x → 0
  });

  it('reports an infinite upper bound when it overflows a double', () => {
    const z = reversalZone({ model: { id: 'power-delay', sensitivity: 0.001 }, ratio: 0.5, soonDelay: 10, kSmall: 1, kLarge: 0.5 })!;
    expect(z.upper).toBe(Infinity);
    expect(Number.isFinite(z.lower)).toBe(true);
  });

  it('works for tiny and huge rates', () => {
    const tiny = reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 2e-9, kLarge: 1e-9 })!;
    expect(tiny.lower).toBeCloseTo(10 + 1e9, -1);
    const huge = reversalZone({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 2e3, kLarge: 1e3 })!;
    expect(huge.lower).toBeCloseTo(10 + 1e-3, 9);
    expect(huge.upper).toBeCloseTo((0.5 + 2e4) / 500, 9);
  });
});

describe('predicted choice pattern', () => {
  it('keeps the TSDoc example: D = 40 lies in (30, 60) and gives LS', () => {
    expect(predictPattern({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05 })).toBe('LS');
  });
  it('gives LL below the zone and SS above it', () => {
    const base = { model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 };
    expect(predictPattern({ ...base, lateDelay: 20 })).toBe('LL');
    expect(predictPattern({ ...base, lateDelay: 90 })).toBe('SS');
  });
  it('gives SL when the large reward is discounted much faster than the small one', () => {
    // direct evaluation: K = 1, k = 0.001, x = 0.9, d = 1, D = 1.05: A = 1/2.05 − 0.9/1.001 < 0, B = 0.9 − 1/1.05 < 0
    expect(predictPattern({ model: hyperbolic, ratio: 0.9, soonDelay: 1, lateDelay: 1.05, kSmall: 0.001, kLarge: 1 })).toBe('SL');
  });
});
