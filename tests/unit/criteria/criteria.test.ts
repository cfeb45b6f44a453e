import { describe, expect, it } from 'vitest';
import { expectedReversalRate, gapProduct, maximinGap, optimisePopulationDesign, priorScenarios } from '@/lib/criteria';
import { createRandom, DesignInputError, optimiseLateDelay, predictPattern, preferenceGaps, priorPoints, type ModelSpec, type RatePrior } from '@/lib/design';

const hyperbolic: ModelSpec = { id: 'hyperbolic' };
const prior: RatePrior = { medianSmall: 0.02, medianLarge: 0.005, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };

describe('gap product', () => {
  it('keeps the TSDoc example: (1/3 − 1/4)·(1/2 − 2/5) = 1/120 (direct evaluation)', () => {
    expect(gapProduct({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05 })).toBeCloseTo(1 / 120, 15);
  });
  it('is 0 outside the zone, including where both gaps are negative (SL)', () => {
    expect(gapProduct({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 20, kSmall: 0.1, kLarge: 0.05 })).toBe(0);
    expect(gapProduct({ model: hyperbolic, ratio: 0.9, soonDelay: 1, lateDelay: 1.05, kSmall: 0.001, kLarge: 1 })).toBe(0);
  });
  it('peaks at optimiseLateDelay', () => {
    const input = { model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 };
    const o = optimiseLateDelay(input)!;
    expect(gapProduct({ ...input, lateDelay: o.lateDelay })).toBeCloseTo(o.gapProduct, 15);
    expect(gapProduct({ ...input, lateDelay: o.lateDelay * 1.01 })).toBeLessThan(o.gapProduct);
  });
});

describe('expected reversal rate', () => {
  const setting = { model: hyperbolic, ratio: 0.5, soonDelay: 14, lateDelay: 120 };

  it('keeps the TSDoc example: a near-noiseless chooser inside the zone reverses with probability 1', () => {
    const one = { kSmall: new Float64Array([0.1]), kLarge: new Float64Array([0.05]), weights: null };
    expect(expectedReversalRate({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, choice: { sensitivity: 1e6 }, points: one })).toBeCloseTo(1, 12);
  });

  it('matches direct evaluation of P(LL far)·P(SS near) = σ(γA)·σ(γB) at one rate pair, with lapse', () => {
    const one = { kSmall: new Float64Array([0.03]), kLarge: new Float64Array([0.01]), weights: null };
    const g = preferenceGaps({ ...setting, kSmall: 0.03, kLarge: 0.01 });
    const s = (z: number) => 0.05 / 2 + 0.95 / (1 + Math.exp(-z));
    expect(expectedReversalRate({ ...setting, choice: { sensitivity: 15, lapse: 0.05 }, points: one })).toBeCloseTo(s(15 * g.far) * s(15 * g.near), 15);
  });

  it('with a very sharp choice rule equals the share of draws whose predicted pattern is LS (independent count via predictPattern)', () => {
    const points = priorPoints(prior, { method: 'monte-carlo', count: 3000, random: createRandom({ seed: 4 }) });
    let ls = 0;
    for (let i = 0; i < 3000; i++) if (predictPattern({ ...setting, kSmall: points.kSmall[i], kLarge: points.kLarge[i] }) === 'LS') ls++;
    // γ = 1e7: only draws with a gap below ~1e-6 are not decided; a handful of 3,000 at most
    expect(Math.abs(expectedReversalRate({ ...setting, choice: { sensitivity: 1e7 }, points }) - ls / 3000)).toBeLessThan(2 / 3000);
  });

  it('Monte Carlo and Gauss–Hermite quadrature agree', () => {
    const mc = priorPoints(prior, { method: 'monte-carlo', count: 200_000, random: createRandom({ seed: 8 }) });
    const quad = priorPoints(prior, { method: 'quadrature', nodes: 48 });
    for (const lateDelay of [40, 120, 400]) {
      const a = expectedReversalRate({ ...setting, lateDelay, choice: { sensitivity: 20 }, points: mc });
      const b = expectedReversalRate({ ...setting, lateDelay, choice: { sensitivity: 20 }, points: quad });
      // Monte Carlo SE ≤ 0.5/√2e5 ≈ 1.1e-3: 4 SE
      expect(Math.abs(a - b), `D = ${lateDelay}`).toBeLessThan(4.5e-3);
    }
  });

  it('is reproducible for a given seed', () => {
    const run = () => expectedReversalRate({ ...setting, choice: { sensitivity: 20 }, points: priorPoints(prior, { method: 'monte-carlo', count: 500, random: createRandom({ seed: 99 }) }) });
    expect(run()).toBe(run());
  });
});

describe('maximin gap', () => {
  it('keeps the TSDoc example: min(1/12, 1/10) = 1/12', () => {
    expect(maximinGap({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, scenarios: [{ kSmall: 0.1, kLarge: 0.05 }] })).toBeCloseTo(1 / 12, 15);
  });
  it('is the smallest gap over scenarios and turns negative when one scenario leaves its zone', () => {
    const scenarios = [{ kSmall: 0.1, kLarge: 0.05 }, { kSmall: 0.1, kLarge: 0.2 }];
    const v = maximinGap({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, scenarios });
    const g = preferenceGaps({ model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.2 });
    expect(v).toBeCloseTo(Math.min(g.far, g.near), 15);
    expect(v).toBeLessThan(0);
  });
});

describe('prior scenarios', () => {
  it('keeps the TSDoc example: the median plus 4 ellipse points', () => {
    expect(priorScenarios({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 }, { count: 4 }).length).toBe(5);
  });
  it('puts every point at the stated Mahalanobis radius', () => {
    const pts = priorScenarios(prior, { radius: 2, count: 12 });
    const [s1, s2, r] = [0.8, 0.8, 0.6];
    for (const p of pts.slice(1)) {
      const a = Math.log(p.kSmall / prior.medianSmall);
      const b = Math.log(p.kLarge / prior.medianLarge);
      const m2 = (a * a / (s1 * s1) - (2 * r * a * b) / (s1 * s2) + (b * b) / (s2 * s2)) / (1 - r * r); // quadratic form of the inverse covariance
      expect(Math.sqrt(m2)).toBeCloseTo(2, 12);
    }
  });
});

describe('population design optimiser', () => {
  it('keeps the TSDoc example: with d fixed and one rate pair it finds optimiseLateDelay’s closed form', () => {
    const r = optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { kind: 'gap-product', kSmall: 0.1, kLarge: 0.05 }, soonDelay: { min: 10, max: 10 } });
    const o = optimiseLateDelay({ model: hyperbolic, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })!;
    // Brent on function values: ~sqrt(eps) in ln(D − d), so 1e-6 relative
    expect(Math.abs(r.lateDelay / o.lateDelay - 1)).toBeLessThan(1e-6);
    expect(r.value).toBeCloseTo(o.gapProduct, 12);
  });

  it('maximises the expected reversal rate within bounds and beats a dense independent grid', () => {
    const points = priorPoints(prior, { method: 'quadrature', nodes: 16 });
    const choice = { sensitivity: 20 };
    const r = optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { kind: 'expected-reversal-rate', choice, points }, soonDelay: { min: 0, max: 60 }, lateDelayMax: 730 });
    expect(r.soonDelay).toBeGreaterThanOrEqual(0);
    expect(r.soonDelay).toBeLessThanOrEqual(60);
    expect(r.lateDelay).toBeLessThanOrEqual(730);
    expect(r.lateDelay - r.soonDelay).toBeGreaterThanOrEqual(1);
    expect(r.value).toBeGreaterThanOrEqual(r.gridValue);
    expect(r.value).toBeCloseTo(expectedReversalRate({ model: hyperbolic, ratio: 0.5, soonDelay: r.soonDelay, lateDelay: r.lateDelay, choice, points }), 14);
    let best = -Infinity;
    for (let d = 0; d <= 60; d += 2) for (let D = d + 1; D <= 730; D *= 1.05) best = Math.max(best, expectedReversalRate({ model: hyperbolic, ratio: 0.5, soonDelay: d, lateDelay: D, choice, points }));
    // the refined optimum must not lose to a 31 × ~130 grid by more than rounding
    expect(r.value).toBeGreaterThanOrEqual(best - 1e-9);
  });

  it('maximises the maximin gap so that every scenario falls in its zone when that is possible', () => {
    const scenarios = priorScenarios({ ...prior, sdLogSmall: 0.3, sdLogLarge: 0.3 }, { count: 8 });
    const r = optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { kind: 'maximin-gap', scenarios } });
    expect(r.value).toBeGreaterThan(0);
    for (const s of scenarios) expect(predictPattern({ model: hyperbolic, ratio: 0.5, soonDelay: r.soonDelay, lateDelay: r.lateDelay, ...s })).toBe('LS');
  });

  it('rejects bad bounds, grids and criteria naming the field', () => {
    const criterion = { kind: 'gap-product' as const, kSmall: 0.1, kLarge: 0.05 };
    const cases: [string, () => unknown][] = [
      ['soonDelay.min', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, soonDelay: { min: -1, max: 3 } })],
      ['soonDelay.max', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, soonDelay: { min: 5, max: NaN } })],
      ['lateDelayMax', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, lateDelayMax: Infinity })],
      ['minSeparation', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, minSeparation: 0 })],
      ['grid.late', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, grid: { soon: 4, late: 1 } })],
      ['refinementRounds', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion, refinementRounds: -1 })],
      ['criterion.kind', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { kind: 'nope' } as never })],
      ['criterion.kSmall', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { ...criterion, kSmall: Infinity } })],
      ['criterion.choice.sensitivity', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0.5, criterion: { kind: 'expected-reversal-rate', choice: { sensitivity: NaN }, points: priorPoints(prior, { method: 'quadrature', nodes: 2 }) } })],
      ['ratio', () => optimisePopulationDesign({ model: hyperbolic, ratio: 0, criterion })],
    ];
    for (const [field, call] of cases) {
      try {
        call();
        expect.unreachable(`${field} should throw`);
      } catch (e) {
        expect(e, field).toBeInstanceOf(DesignInputError);
        expect((e as DesignInputError).field).toBe(field);
      }
    }
  });
});
