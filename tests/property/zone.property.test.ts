import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { discountFactor, LATE_DELAY_STEP, maximiseBrent, optimiseLateDelay, predictPattern, preferenceGaps, reversalZone, type ModelSpec, type PairInput } from '@/lib/design';

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map(Math.exp);

const model: fc.Arbitrary<ModelSpec> = fc.oneof(
  fc.constant<ModelSpec>({ id: 'exponential' }),
  fc.constant<ModelSpec>({ id: 'hyperbolic' }),
  fc.double({ min: 0.3, max: 2, noNaN: true }).map((s): ModelSpec => ({ id: 'hyperboloid', sensitivity: s })),
  fc.double({ min: 0.3, max: 2, noNaN: true }).map((s): ModelSpec => ({ id: 'power-delay', sensitivity: s })),
  fc.double({ min: 0.3, max: 2, noNaN: true }).map((s): ModelSpec => ({ id: 'exponential-power', sensitivity: s })),
  fc.double({ min: 0.3, max: 1, noNaN: true }).map((b): ModelSpec => ({ id: 'quasi-hyperbolic', presentBias: b })),
);

const pair = (m: fc.Arbitrary<ModelSpec>): fc.Arbitrary<PairInput> =>
  fc.record({
    model: m,
    ratio: fc.double({ min: 0.02, max: 0.98, noNaN: true }),
    soonDelay: logUniform(0.5, 365),
    kSmall: logUniform(1e-4, 1),
    kLarge: logUniform(1e-4, 1),
  });

const gapProduct = (input: PairInput, D: number) => {
  const g = preferenceGaps({ ...input, lateDelay: D });
  return g.far * g.near;
};

// Zones narrower than 1e-6 relative, or beyond 1e12 days, are excluded from the pattern
// checks: a late delay placed 1e-7 of the width from an edge is then within rounding of it.
// Also excluded: far-view values x·f_k(d) below 1e-290, close to the subnormal range where a
// double keeps only a few significant digits (e.g. exponential-power with k·d^s ≈ 700).
const usable = (z: { lower: number; upper: number } | null, input?: PairInput) =>
  z !== null &&
  z.upper < 1e12 &&
  (z.upper - z.lower) / z.upper > 1e-6 &&
  (input === undefined || input.ratio * discountFactor(input.model, input.kSmall, input.soonDelay) > 1e-290);

describe('reversal zone properties', () => {
  it('every late delay strictly inside the zone gives LS', () => {
    fc.assert(
      fc.property(pair(model), fc.double({ min: 1e-4, max: 1 - 1e-4, noNaN: true }), (input, u) => {
        const z = reversalZone(input);
        fc.pre(usable(z, input));
        const D = z!.lower + u * (z!.upper - z!.lower);
        expect(predictPattern({ ...input, lateDelay: D })).toBe('LS');
      }),
      { numRuns: 500 },
    );
  });

  it('no late delay outside the zone gives LS', () => {
    fc.assert(
      fc.property(pair(model), fc.double({ min: 1e-4, max: 1 - 1e-4, noNaN: true }), fc.double({ min: 1e-4, max: 10, noNaN: true }), (input, u, v) => {
        const z = reversalZone(input);
        const d = input.soonDelay;
        if (z === null) {
          expect(predictPattern({ ...input, lateDelay: d + v * 100 })).not.toBe('LS');
          return;
        }
        fc.pre(usable(z, input));
        if (z.lower > d) expect(predictPattern({ ...input, lateDelay: d + u * (z.lower - d) * (1 - 1e-6) })).not.toBe('LS');
        expect(predictPattern({ ...input, lateDelay: z.upper * (1 + 1e-6 + v) })).not.toBe('LS');
      }),
      { numRuns: 500 },
    );
  });

  it('hyperbolic: the zone is non-empty exactly when kSmall > ratio·kLarge (docs/mathematics.md, "Closed forms")', () => {
    fc.assert(
      fc.property(pair(fc.constant<ModelSpec>({ id: 'hyperbolic' })), (input) => {
        const r = input.kSmall / (input.ratio * input.kLarge);
        fc.pre(Math.abs(r - 1) > 1e-9); // at equality the zone has zero width up to rounding
        expect(reversalZone(input) !== null).toBe(r > 1);
      }),
      { numRuns: 500 },
    );
  });

  it('exponential: the zone is non-empty exactly when kSmall > kLarge', () => {
    fc.assert(
      fc.property(pair(fc.constant<ModelSpec>({ id: 'exponential' })), (input) => {
        fc.pre(Math.abs(input.kSmall / input.kLarge - 1) > 1e-9);
        expect(reversalZone(input) !== null).toBe(input.kSmall > input.kLarge);
      }),
      { numRuns: 500 },
    );
  });

  it('scaling all delays by c and rates by 1/c scales the zone and the optimum by c (s = 1, β = 1)', () => {
    const unitShape = fc.constantFrom<ModelSpec>(
      { id: 'exponential' },
      { id: 'hyperbolic' },
      { id: 'hyperboloid', sensitivity: 1 },
      { id: 'power-delay', sensitivity: 1 },
      { id: 'exponential-power', sensitivity: 1 },
      { id: 'quasi-hyperbolic', presentBias: 1 },
    );
    fc.assert(
      fc.property(pair(unitShape), logUniform(1e-3, 1e3), (input, c) => {
        const o = optimiseLateDelay(input);
        // zones narrower than 1e-6 relative sit at the emptiness boundary, where rounding of the scaled inputs decides
        fc.pre(o !== null && o.gapProduct > 1e-200 && (o.upper - o.lower) / o.upper > 1e-6);
        const scaled = optimiseLateDelay({ ...input, soonDelay: input.soonDelay * c, kSmall: input.kSmall / c, kLarge: input.kLarge / c });
        expect(scaled).not.toBeNull();
        // bounds and closed forms: a few roundings; root finder: 1e-10 in ln(D − d) → 1e-8 relative leaves room
        const rel = (a: number, b: number) => Math.abs(a / b - 1);
        expect(rel(scaled!.lower, o!.lower * c)).toBeLessThan(1e-9);
        expect(rel(scaled!.upper, o!.upper * c)).toBeLessThan(1e-9);
        expect(rel(scaled!.lateDelay, o!.lateDelay * c)).toBeLessThan(1e-8);
        expect(rel(scaled!.gapProduct, o!.gapProduct)).toBeLessThan(1e-8);
      }),
      { numRuns: 300 },
    );
  });
});

describe('optimal late delay properties', () => {
  it('lies in the zone and beats every point of a dense grid', () => {
    fc.assert(
      fc.property(pair(model), (input) => {
        const o = optimiseLateDelay(input);
        // a zone narrower than 1e-6 relative cannot place D to better than rounding of D itself
        fc.pre(o !== null && o.upper < 1e12 && o.gapProduct > 1e-200 && (o.upper - o.lower) / o.upper > 1e-6);
        const d = input.soonDelay;
        const width = (o!.upper - o!.lower) / o!.upper;
        expect(o!.lateDelay).toBeGreaterThanOrEqual(o!.lower);
        expect(o!.lateDelay).toBeLessThan(o!.upper);
        // a zone that starts at d (quasi-hyperbolic, β ≤ x) is plannable from one day after d (or its middle, if
        // shorter than two days): C's supremum at d⁺ is no pair (docs/mathematics.md "Closed forms")
        const first = d + Math.min(LATE_DELAY_STEP, 0.5 * (o!.upper - d));
        if (o!.lower <= d) expect(o!.lateDelay).toBeGreaterThanOrEqual(first);
        const lo = o!.lower > d ? Math.log(o!.lower - d) : Math.log(first - d);
        const hi = Math.log(o!.upper - d);
        // the gaps are differences of discount factors (at most 1, in units of L) across a zone of
        // relative width w, so each carries relative rounding of about eps/w, and of about eps/gap
        // when a gap is small beside the factors it is the difference of (small ratios x):
        // allow 1e-12 + 1e-15/w + 16·eps·(1/far + 1/near) at the optimum. That allowance is bounded:
        // an input whose gaps at the optimum are so small that it would exceed 1e-6 cannot be ranked
        // against a grid at all, so it is skipped (fc.pre), never accepted; fast-check fails the
        // property if skips crowd out the 300 runs (maxSkipsPerRun).
        const at = o!.lateDelay > d ? preferenceGaps({ ...input, lateDelay: o!.lateDelay }) : null;
        const rounding = 1e-12 + 1e-15 / width + (at ? 16 * Number.EPSILON * (1 / Math.abs(at.far) + 1 / Math.abs(at.near)) : 0);
        fc.pre(rounding <= 1e-6);
        for (let i = 1; i < 400; i++) {
          const D = d + Math.exp(lo + ((hi - lo) * i) / 400);
          if (!(D > o!.lower && D < o!.upper)) continue;
          expect(gapProduct(input, D)).toBeLessThanOrEqual(o!.gapProduct * (1 + rounding));
        }
      }),
      { numRuns: 300 },
    );
  }, 60_000); // 300 runs × 400 grid points; speed is measured in the benchmarks, not here

  it('closed forms equal the bracketed numerical optimum (hyperbolic ↔ hyperboloid s = 1, exponential ↔ exponential-power s = 1)', () => {
    fc.assert(
      fc.property(pair(fc.constantFrom<ModelSpec>({ id: 'hyperbolic' }, { id: 'exponential' })), (input) => {
        const closed = optimiseLateDelay(input);
        const twin: ModelSpec = { id: input.model.id === 'hyperbolic' ? 'hyperboloid' : 'exponential-power', sensitivity: 1 };
        const numeric = optimiseLateDelay({ ...input, model: twin });
        fc.pre(closed !== null && closed.gapProduct > 1e-200 && (closed.upper - closed.lower) / closed.upper > 1e-6);
        expect(numeric).not.toBeNull();
        // root finder to 1e-10 in ln(D − d); the hyperbolic closed form loses ~eps/(1 − x) in p* − 1: 1e-8 relative is honest
        expect(Math.abs(numeric!.lateDelay / closed!.lateDelay - 1)).toBeLessThan(1e-8);
      }),
      { numRuns: 500 },
    );
  });

  it('the exponential optimum is the quasi-hyperbolic one with β = 1, to the last bit', () => {
    fc.assert(
      fc.property(pair(fc.constant<ModelSpec>({ id: 'exponential' })), (input) => {
        // the same closed form on two code paths (the exponential one skips ln β and tests emptiness first)
        expect(optimiseLateDelay(input)).toEqual(optimiseLateDelay({ ...input, model: { id: 'quasi-hyperbolic', presentBias: 1 } }));
      }),
      { numRuns: 500 },
    );
  });

  it('closed forms agree with the function-value Brent maximiser to its sqrt(eps) limit', () => {
    fc.assert(
      fc.property(pair(fc.constantFrom<ModelSpec>({ id: 'hyperbolic' }, { id: 'exponential' }, { id: 'quasi-hyperbolic', presentBias: 0.9 })), (input) => {
        const o = optimiseLateDelay(input);
        fc.pre(o !== null && o.lower > input.soonDelay && o.gapProduct > 1e-200 && (o.upper - o.lower) / o.upper > 1e-4);
        const d = input.soonDelay;
        const m = maximiseBrent((t) => gapProduct(input, d + Math.exp(t)), { lower: Math.log(o!.lower - d), upper: Math.log(o!.upper - d), tolerance: 1e-12 });
        // function values place a smooth maximum only to ~sqrt(2.2e-16) ≈ 1.5e-8 relative in ln(D − d); allow 1e-6 in D
        expect(Math.abs(d + Math.exp(m.argmax) - o!.lateDelay) / o!.lateDelay).toBeLessThan(1e-6);
        // rounding of C near a narrow zone: eps/w relative, as in the dense-grid property
        expect(m.value).toBeLessThanOrEqual(o!.gapProduct * (1 + 1e-12 + 1e-15 / ((o!.upper - o!.lower) / o!.upper)));
      }),
      { numRuns: 300 },
    );
  });
});
