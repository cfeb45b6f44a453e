import { describe, expect, it } from 'vitest';
import { anchorDelays, discountFactor, indifferenceRate, optimiseLateDelay, preferenceGaps, reversalZone, type ModelSpec, type PairInput } from '@/lib/design';
import fixture from './fixtures/models/models.json';

// Reference values: tests/unit/design/fixtures/models/generate.py (mpmath at 60 digits; zone bounds, optimum and
// anchors found as roots of the gaps, of d ln C/dD and of clarity − target, never from the closed forms).
// Tolerances are in units of machine epsilon ε = 2^−52, scaled by the condition of the quantity where stated.
const EPS = Number.EPSILON;

type Case = PairInput & {
  zone: { lower: number; upper: number | null } | null;
  optimum?: { lateDelay: number; gapProduct: number };
  anchors?: { late: { lateDelay: number; reachesTarget: boolean }; soon: { lateDelay: number; reachesTarget: boolean } };
};
const cases = fixture.cases as Case[];
const rel = (got: number, want: number) => Math.abs(got - want) / Math.abs(want);
const label = (c: Case) => `${c.model.id} s=${c.model.sensitivity ?? 1} β=${c.model.presentBias ?? 1} x=${c.ratio} d=${c.soonDelay} k=${c.kSmall} K=${c.kLarge}`;
/** the exponent 1/s through which the power models' bounds amplify the relative error of their argument */
const power = (m: ModelSpec) => (m.id === 'power-delay' || m.id === 'exponential-power' ? 1 / (m.sensitivity ?? 1) : 1);

describe('discount factors against mpmath, every model, rates 1e-9 to 1e4 per day, delays 0 to 1e12 days', () => {
  it('are within 8 ε·(1 + |ln f|)·(1 + s) relative wherever f is a normal double, and vanish where it is not', () => {
    // exp(−u) turns the rounding of u = k·D^s (about (1 + s) roundings) into |u|·ε relative: |ln f| = u
    for (const [model, k, D, want] of fixture.discountFactor as [ModelSpec, number, number, number][]) {
      const got = discountFactor(model, k, D);
      if (want < 1e-300) {
        expect(got, `${model.id} k=${k} D=${D}`).toBeLessThan(1e-290);
        continue;
      }
      const tol = 8 * EPS * (1 + Math.abs(Math.log(want))) * (1 + (model.sensitivity ?? 1));
      expect(rel(got, want), `${model.id} s=${model.sensitivity} k=${k} D=${D}`).toBeLessThanOrEqual(tol);
    }
  });
});

describe('reversal zones against the roots of the two gaps', () => {
  it('finds a zone exactly when the reference does, and its bounds within 32 ε·(1 + 1/s) relative', () => {
    for (const c of cases) {
      const zone = reversalZone(c);
      if (c.zone === null) {
        expect(zone, label(c)).toBeNull();
        continue;
      }
      expect(zone, label(c)).not.toBeNull();
      const tol = 32 * EPS * (1 + power(c.model));
      expect(rel(zone!.lower, c.zone.lower), `lower, ${label(c)}`).toBeLessThanOrEqual(tol);
      if (c.zone.upper === null) expect(zone!.upper).toBe(Infinity);
      else expect(rel(zone!.upper, c.zone.upper), `upper, ${label(c)}`).toBeLessThanOrEqual(tol);
    }
  });
});

describe('optimal late delays against the root of d ln C/dD', () => {
  it('returns the same zone bounds as reversalZone and null for every empty zone', () => {
    for (const c of cases) {
      const o = optimiseLateDelay(c);
      const zone = reversalZone(c);
      if (zone === null) {
        expect(o, label(c)).toBeNull();
        continue;
      }
      // the power models' lower bound is d + exp(p·ln(a/K)) in the solver and d + (a/K)^p in reversalZone
      // (documented in numericalOptimum.ts): each is within 32 ε·(1 + p) of the reference, so within twice that of each other
      const tol = 64 * EPS * (1 + power(c.model));
      expect(rel(o!.lower, zone.lower), label(c)).toBeLessThanOrEqual(tol);
      expect(o!.upper === zone.upper || rel(o!.upper, zone.upper) <= tol, label(c)).toBe(true);
    }
  });

  it('places D* within 1e-10 relative (the accuracy its documentation promises) and its gap product within 64 ε times the gaps’ condition', () => {
    let checked = 0;
    for (const c of cases) {
      if (!c.optimum) continue;
      const o = optimiseLateDelay(c)!;
      if (c.optimum.gapProduct < 1e-300) {
        // f_K(D) below the smallest double (K·D^s beyond 745 for the exponential models): the product underflows,
        // and the documented answer is a point of the zone (closed forms still place D* exactly)
        expect(o.gapProduct, label(c)).toBeLessThan(1e-290);
        expect(o.lateDelay >= o.lower && o.lateDelay <= o.upper, label(c)).toBe(true);
        if (c.model.id === 'exponential') expect(rel(o.lateDelay, c.optimum.lateDelay), `D*, ${label(c)}`).toBeLessThanOrEqual(1e-10);
        continue;
      }
      expect(rel(o.lateDelay, c.optimum.lateDelay), `D*, ${label(c)}`).toBeLessThanOrEqual(1e-10);
      // A = f_K(D) − x·f_k(d) and B = x − f_K(D − d) are differences: their relative rounding is ε times
      // (sum of magnitudes)/|difference|, which is large only for zones that are barely open
      const g = preferenceGaps({ ...c, lateDelay: c.optimum.lateDelay });
      const condition = (g.far + 2 * c.ratio) / g.far + (2 * c.ratio) / g.near;
      expect(rel(o.gapProduct, c.optimum.gapProduct), `C*, ${label(c)}`).toBeLessThanOrEqual(64 * EPS * condition * (1 + power(c.model)));
      checked++;
    }
    expect(checked).toBeGreaterThan(200);
  });
});

describe('anchors against the roots of clarity − target', () => {
  it('places both anchors within 1e-9 relative and agrees on whether each reaches the target', () => {
    // anchorDelays solves in ln(D − d) to 1e-12 absolute (its findRoot tolerance); the clarity's own rounding
    // near the zone edge moves the root by about ε·(gap magnitudes)/(clarity slope), far inside 1e-9
    for (const c of cases) {
      // where the gap product underflows a double no anchor target can be represented (see the optimum test)
      if (!c.anchors || c.optimum!.gapProduct < 1e-300) continue;
      const a = anchorDelays(c)!;
      for (const side of ['late', 'soon'] as const) {
        const want = c.anchors[side];
        const got = a[side];
        if (got === null) continue; // no room on that side (zone at d, or an upper bound beyond a double)
        expect(got.reachesTarget, `${side}, ${label(c)}`).toBe(want.reachesTarget);
        expect(rel(got.lateDelay, want.lateDelay), `${side}, ${label(c)}`).toBeLessThanOrEqual(1e-9);
      }
    }
  });
});

describe('indifference rates against the root of L·f(D; k) − S·f(d; k)', () => {
  it('are within 64 ε·(1 + 1/s) relative for the closed forms and 1e-12 for the models solved by root finding', () => {
    for (const { model, item, rate } of fixture.indifference as { model: ModelSpec; item: Parameters<typeof indifferenceRate>[1]; rate: number }[]) {
      const got = indifferenceRate(model, item);
      // hyperboloid and power-delay with d > 0 are found by Brent–Dekker to 1e-13 absolute in ln k
      const solved = item.soonerDelay! > 0 && (model.id === 'hyperboloid' || model.id === 'power-delay');
      const tol = solved ? 1e-12 : 64 * EPS * (1 + 1 / (model.sensitivity ?? 1));
      expect(rel(got, rate), `${model.id} ${JSON.stringify(item)}`).toBeLessThanOrEqual(tol);
    }
  });
});
