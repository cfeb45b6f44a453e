import { describe, expect, it } from 'vitest';
import * as ss from 'simple-statistics';
import jStat from 'jstat';
import { createRandom, DesignInputError } from '@/lib/design';

// An independent SFC32 written with BigInt arithmetic modulo 2^32 (no 32-bit integer tricks),
// from the generator's definition: t = a + b + d; d += 1; a = b ^ (b >> 9); b = c + (c << 3);
// c = rotl(c, 21) + t.
function referenceSfc32(seed: number, count: number): number[] {
  const M = 0xffffffffn;
  let a = 0x9e3779b9n;
  let b = 0x243f6a88n;
  let c = 0xb7e15162n;
  let d = BigInt(seed >>> 0);
  const next = () => {
    const t = (a + b + d) & M;
    d = (d + 1n) & M;
    a = b ^ (b >> 9n);
    b = (c + (c << 3n)) & M;
    c = (((c << 21n) | (c >> 11n)) & M) + t;
    c &= M;
    return Number(t);
  };
  for (let i = 0; i < 12; i++) next();
  return Array.from({ length: count }, () => next() / 2 ** 32);
}

describe('seeded generator', () => {
  it('matches an independent BigInt implementation of SFC32 bit for bit', () => {
    for (const seed of [0, 1, 42, 2 ** 31 - 1, -7]) {
      const r = createRandom({ seed });
      const ours = Array.from({ length: 1000 }, () => r.uniform());
      expect(ours).toEqual(referenceSfc32(seed, 1000));
    }
  });

  it('keeps the TSDoc example: the same seed gives the same stream', () => {
    expect(createRandom({ seed: 1 }).uniform() === createRandom({ seed: 1 }).uniform()).toBe(true);
    expect(createRandom({ seed: 1 }).uniform()).not.toBe(createRandom({ seed: 2 }).uniform());
  });

  it('gives uniforms on [0, 1) with mean 1/2 and variance 1/12', () => {
    const r = createRandom({ seed: 3 });
    const u = Array.from({ length: 200_000 }, () => r.uniform());
    expect(ss.min(u)).toBeGreaterThanOrEqual(0);
    expect(ss.max(u)).toBeLessThan(1);
    // SE of the mean is √(1/12/2e5) ≈ 6.5e-4: 5 SE = 3.2e-3
    expect(Math.abs(ss.mean(u) - 0.5)).toBeLessThan(3.2e-3);
    expect(Math.abs(ss.variance(u) - 1 / 12)).toBeLessThan(1.5e-3);
  });

  it('gives standard normal draws (moments, and a Kolmogorov–Smirnov distance against jstat.normal.cdf)', () => {
    const r = createRandom({ seed: 11 });
    const n = 100_000;
    const z = Array.from({ length: n }, () => r.normal()).sort((a, b) => a - b);
    // SE of the mean is 1/√n ≈ 3.2e-3; of the variance ≈ √(2/n) ≈ 4.5e-3: 5 SE each
    expect(Math.abs(ss.mean(z))).toBeLessThan(0.016);
    expect(Math.abs(ss.variance(z) - 1)).toBeLessThan(0.023);
    let ks = 0;
    for (let i = 0; i < n; i++) {
      const F = jStat.normal.cdf(z[i], 0, 1); // second opinion: jstat
      ks = Math.max(ks, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    }
    // KS critical value at α = 0.001 is ≈ 1.95/√n (common practice, asymptotic Kolmogorov distribution)
    expect(ks).toBeLessThan(1.95 / Math.sqrt(n));
  });

  it('refuses a seed that is not a whole number', () => {
    for (const seed of [0.5, NaN, Infinity]) expect(() => createRandom({ seed })).toThrow(DesignInputError);
  });
});
