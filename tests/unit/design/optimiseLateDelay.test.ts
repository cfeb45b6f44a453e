import { describe, expect, it } from 'vitest';
import { all, create, type BigNumber } from 'mathjs';
import { fmin } from './secondOpinion';
const { bisect, nelderMead } = fmin;
import { optimiseLateDelay, preferenceGaps, reversalZone, type ModelSpec, type PairInput } from '@/lib/design';

const gapProduct = (input: PairInput, D: number) => {
  const g = preferenceGaps({ ...input, lateDelay: D });
  return g.far * g.near;
};

const settings = [
  { ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 },
  { ratio: 0.9, soonDelay: 1, kSmall: 0.5, kLarge: 0.02 },
  { ratio: 0.2, soonDelay: 180, kSmall: 0.004, kLarge: 0.001 },
  { ratio: 0.75, soonDelay: 30, kSmall: 2, kLarge: 1.5 },
];

describe('optimal late delay: closed forms', () => {
  it('keeps the TSDoc example: hyperbolic x = 0.5, d = 10, k = 0.1, K = 0.05 gives (80/3)(0.5 + √(35/32))', () => {
    // direct evaluation of the closed form p* = [(1 + xc) + √((1 + xc)(1 − ac))]/(x + a), D* = (p* − 1)/K
    const o = optimiseLateDelay({ model: { id: 'hyperbolic' }, ...settings[0] })!;
    expect(o.lateDelay).toBeCloseTo((80 / 3) * (0.5 + Math.sqrt(35 / 32)), 10);
  });

  it('hyperbolic closed form equals the bracketed root finder run on the hyperboloid with s = 1 (same function, other code path)', () => {
    for (const s of settings) {
      const closed = optimiseLateDelay({ model: { id: 'hyperbolic' }, ...s })!;
      const numeric = optimiseLateDelay({ model: { id: 'hyperboloid', sensitivity: 1 }, ...s })!;
      // root finder stops at 1e-10 in ln(D − d): 1e-9 relative is honest
      expect(Math.abs(closed.lateDelay / numeric.lateDelay - 1)).toBeLessThan(1e-9);
      expect(Math.abs(closed.gapProduct / numeric.gapProduct - 1)).toBeLessThan(1e-12);
    }
  });

  it('exponential closed form equals the bracketed root finder run on exponential-power with s = 1', () => {
    for (const s of settings) {
      const closed = optimiseLateDelay({ model: { id: 'exponential' }, ...s })!;
      const numeric = optimiseLateDelay({ model: { id: 'exponential-power', sensitivity: 1 }, ...s })!;
      expect(Math.abs(closed.lateDelay / numeric.lateDelay - 1)).toBeLessThan(1e-9);
    }
  });

  it('quasi-hyperbolic with β = 1 is the exponential optimum', () => {
    for (const s of settings) {
      const qh = optimiseLateDelay({ model: { id: 'quasi-hyperbolic', presentBias: 1 }, ...s })!;
      const ex = optimiseLateDelay({ model: { id: 'exponential' }, ...s })!;
      expect(qh.lateDelay).toBeCloseTo(ex.lateDelay, 9);
    }
  });

  it('quasi-hyperbolic with β ≤ x and k = K: C is largest as D → d⁺, so the late delay is the first plannable one, d + 1 day', () => {
    // C is linear-times-linear in u = exp(−KD) with the vertex outside the zone here; D = d itself is no pair
    const input = { model: { id: 'quasi-hyperbolic', presentBias: 0.3 } as ModelSpec, ratio: 0.5, soonDelay: 10, kSmall: 0.01, kLarge: 0.01 };
    const o = optimiseLateDelay(input)!;
    expect(o.lateDelay).toBe(11);
    // direct evaluation at D = 11: A = 0.3(e^−0.11 − 0.5e^−0.1), B = 0.5 − 0.3e^−0.01
    expect(o.gapProduct).toBeCloseTo(0.3 * (Math.exp(-0.11) - 0.5 * Math.exp(-0.1)) * (0.5 - 0.3 * Math.exp(-0.01)), 14);
    expect(gapProduct(input, 10.5)).toBeGreaterThan(o.gapProduct);
    expect(gapProduct(input, 11.0001)).toBeLessThan(o.gapProduct);
  });
});

describe('optimal late delay: second opinions from fmin', () => {
  const models: ModelSpec[] = [
    { id: 'hyperbolic' },
    { id: 'exponential' },
    { id: 'quasi-hyperbolic', presentBias: 0.8 },
    { id: 'hyperboloid', sensitivity: 0.6 },
    { id: 'power-delay', sensitivity: 0.7 },
    { id: 'exponential-power', sensitivity: 0.5 },
  ];
  for (const model of models) {
    it(`${model.id}: C′ = 0 at the optimum agrees with fmin.bisect on a central-difference derivative`, () => {
      for (const s of settings) {
        const input = { model, ...s };
        const o = optimiseLateDelay(input);
        // skip zones that start at d (quasi-hyperbolic with β ≤ x): ln(D − d) is unbounded below there
        if (o === null || o.lower === s.soonDelay) continue;
        const d = s.soonDelay;
        // second opinion: fmin.bisect on the sign of a finite-difference slope of C in ln(D − d)
        const slope = (t: number) => {
          const h = 1e-6;
          return gapProduct(input, d + Math.exp(t + h)) - gapProduct(input, d + Math.exp(t - h));
        };
        const lo = Math.log(o.lower - d) + 1e-6;
        const hi = Math.log(o.upper - d) - 1e-6;
        const t = bisect(slope, lo, hi, { tolerance: 1e-12, maxIterations: 200 });
        // the difference quotient carries rounding ~1e-16/1e-6 relative in the slope;
        // near the optimum that moves the sign change by ~1e-7 in t
        expect(Math.abs(d + Math.exp(t) - o.lateDelay) / o.lateDelay, `${model.id} ${JSON.stringify(s)}`).toBeLessThan(1e-6);
      }
    });

    it(`${model.id}: the gap product at the optimum is at least fmin.nelderMead's maximum`, () => {
      for (const s of settings) {
        const input = { model, ...s };
        const o = optimiseLateDelay(input);
        if (o === null) continue;
        const d = s.soonDelay;
        const mid = 0.5 * (Math.log(o.lower - d) + Math.log(o.upper - d));
        const inZone = (t: number) => d + Math.exp(t) > o.lower && d + Math.exp(t) < o.upper;
        const r = nelderMead((v) => (inZone(v[0]) ? -gapProduct(input, d + Math.exp(v[0])) : 1), [mid], { maxIterations: 2000, minErrorDelta: 1e-15, minTolerance: 1e-12 });
        // second opinion: fmin.nelderMead; allow 1e-12 relative for rounding in C
        expect(o.gapProduct).toBeGreaterThanOrEqual(-r.fx * (1 - 1e-12));
        expect(o.gapProduct).toBeCloseTo(gapProduct(input, o.lateDelay), 15);
      }
    });
  }
});

describe('optimal late delay: a 40-digit reference from mathjs BigNumber', () => {
  // second opinion: mathjs (decimal.js underneath) at 40 significant digits, bisecting the sign of
  // C′(D) = f_K′(D)·B − f_K′(D − d)·A in ln(D − d) until the bracket is below 1e-30 of its width
  const big = create(all, { number: 'BigNumber', precision: 40 });
  const num = (v: number): BigNumber => big.bignumber(v);
  const one = num(1);
  // f and f′ at delay z: hyperboloid (1 + rz)^(−s); power-delay 1/(1 + r·z^s); exponential-power exp(−r·z^s)
  const factor = (model: ModelSpec, rate: BigNumber, z: BigNumber): [BigNumber, BigNumber] => {
    const s = num(model.sensitivity ?? 1);
    if (model.id === 'hyperboloid') {
      const q = one.plus(rate.times(z));
      const f = q.pow(s.neg());
      return [f, s.times(rate).times(f).div(q).neg()];
    }
    const u = rate.times(z.pow(s));
    const du = s.times(u).div(z);
    if (model.id === 'power-delay') {
      const f = one.div(one.plus(u));
      return [f, du.times(f).times(f).neg()];
    }
    const f = u.neg().exp();
    return [f, du.times(f).neg()];
  };
  const reference = (input: PairInput, lower: number, upper: number) => {
    const x = num(input.ratio);
    const d = num(input.soonDelay);
    const K = num(input.kLarge);
    const farSoon = x.times(factor(input.model, num(input.kSmall), d)[0]);
    const gaps = (D: BigNumber) => {
      const [f1, g1] = factor(input.model, K, D);
      const [f2, g2] = factor(input.model, K, D.minus(d));
      return { far: f1.minus(farSoon), near: x.minus(f2), g1, g2 };
    };
    const rising = (t: BigNumber) => {
      const g = gaps(d.plus(t.exp()));
      return g.g1.times(g.near).minus(g.g2.times(g.far)).isPositive();
    };
    let lo = num(Math.log(lower - input.soonDelay) + 1e-9);
    let hi = num(Math.log(upper - input.soonDelay) - 1e-9);
    for (let i = 0; i < 110; i++) {
      const mid = lo.plus(hi).div(2);
      if (rising(mid)) lo = mid;
      else hi = mid;
    }
    return {
      lateDelay: d.plus(lo.exp()),
      gapProduct: (D: number) => {
        const g = gaps(num(D));
        return g.far.times(g.near);
      },
    };
  };
  const relative = (value: number, exact: BigNumber) => Math.abs(num(value).div(exact).minus(1).toNumber());

  for (const model of [
    { id: 'hyperboloid', sensitivity: 0.6 },
    { id: 'power-delay', sensitivity: 0.7 },
    { id: 'exponential-power', sensitivity: 0.5 },
  ] as ModelSpec[]) {
    it(`${model.id}: the optimal late delay and its gap product match the 40-digit values to 1e-13`, () => {
      for (const s of settings) {
        const input = { model, ...s };
        const o = optimiseLateDelay(input)!;
        const exact = reference(input, o.lower, o.upper);
        // these zones are wide (width over a twentieth of D_upper), so D* and C carry only a few
        // roundings (about 1e-15 relative): 1e-13 is honest, and a thousand times inside 1e-10
        expect(relative(o.lateDelay, exact.lateDelay), `${model.id} ${JSON.stringify(s)}`).toBeLessThan(1e-13);
        expect(relative(o.gapProduct, exact.gapProduct(o.lateDelay)), `${model.id} ${JSON.stringify(s)}`).toBeLessThan(1e-13);
      }
    });
  }

  it('finds the optimum when the far discount factor underflows over most of the zone', () => {
    // exponential-power with K·D^s > 745 above D ≈ 300: f_K(D) is 0 in doubles over three quarters of
    // the zone (190.5, 597.6), and x·f_k(d) underflows too; C is representable only near D_lower
    const input: PairInput = { model: { id: 'exponential-power', sensitivity: 1.597 }, ratio: 0.4055, soonDelay: 186.11, kSmall: 0.55, kLarge: 0.0854 };
    const o = optimiseLateDelay(input)!;
    const exact = reference(input, o.lower, o.upper);
    expect(o.gapProduct).toBeGreaterThan(0);
    // f_K(D*) ≈ 1e-162 is still a normal double; exp of an argument near 370 adds ~370 eps: 1e-12 is honest
    expect(relative(o.lateDelay, exact.lateDelay)).toBeLessThan(1e-12);
    expect(relative(o.gapProduct, exact.gapProduct(o.lateDelay))).toBeLessThan(1e-12);
  });
});

describe('optimal late delay: edges', () => {
  it('is null when the zone is empty', () => {
    expect(optimiseLateDelay({ model: { id: 'exponential' }, ratio: 0.5, soonDelay: 10, kSmall: 0.01, kLarge: 0.02 })).toBeNull();
    expect(optimiseLateDelay({ model: { id: 'hyperboloid', sensitivity: 0.5 }, ratio: 0.5, soonDelay: 0, kSmall: 0.1, kLarge: 0.02 })).toBeNull();
  });

  it('returns the same bounds as reversalZone', () => {
    for (const s of settings) {
      for (const model of [{ id: 'hyperbolic' }, { id: 'power-delay', sensitivity: 0.7 }] as ModelSpec[]) {
        const o = optimiseLateDelay({ model, ...s })!;
        const z = reversalZone({ model, ...s })!;
        expect(o.lower).toBeCloseTo(z.lower, 10);
        expect(o.upper).toBeCloseTo(z.upper, 10);
      }
    }
  });

  it('stays inside the zone for ratios near 0 and 1 and for tiny and huge rates', () => {
    const extremes = [
      { ratio: 1e-6, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 },
      { ratio: 1 - 1e-6, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 },
      { ratio: 0.5, soonDelay: 10, kSmall: 2e-8, kLarge: 1e-8 },
      { ratio: 0.5, soonDelay: 10, kSmall: 2e4, kLarge: 1e4 },
    ];
    for (const id of ['hyperbolic', 'exponential', 'hyperboloid', 'power-delay', 'exponential-power'] as const) {
      for (const s of extremes) {
        const o = optimiseLateDelay({ model: { id, sensitivity: id === 'hyperbolic' || id === 'exponential' ? undefined : 0.8 }, ...s });
        if (o === null) continue;
        expect(o.lateDelay, `${id} ${JSON.stringify(s)}`).toBeGreaterThanOrEqual(o.lower);
        expect(o.lateDelay).toBeLessThan(o.upper);
        // when every discount factor underflows the criterion is flat 0 and the zone edge is as good as any point
        if (o.gapProduct > 0) expect(o.lateDelay).toBeGreaterThan(o.lower);
        // exp(−K·D) underflows for K = 1e4: the true product is below the smallest double
        expect(o.gapProduct).toBeGreaterThanOrEqual(0);
        if (s.kLarge < 1e3) expect(o.gapProduct, `${id} ${JSON.stringify(s)}`).toBeGreaterThan(0);
      }
    }
  });

  it('copes with an upper bound beyond the largest double', () => {
    const o = optimiseLateDelay({ model: { id: 'power-delay', sensitivity: 0.001 }, ratio: 0.5, soonDelay: 10, kSmall: 1, kLarge: 0.5 })!;
    expect(o.upper).toBe(Infinity);
    expect(o.lateDelay).toBeGreaterThan(o.lower);
  });
});
