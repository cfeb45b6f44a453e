import { describe, expect, it } from 'vitest';
import { EXPECTED_RATE_TARGET, expectedRateNodes, expectedReversalRate } from '@/lib/criteria';
import { DesignInputError, priorPoints, type ModelSpec, type RatePrior } from '@/lib/design';
import fixture from './fixtures/expected-rate.json';

// References: tests/unit/criteria/fixtures/generate.py, the trapezoid rule on a fine grid over [−9, 9]²
// (each checked there against half the step to 1e-9), for seven models, two priors and three late delays
// at each sharpness γ·max σ of the node table.
type Case = { model: ModelSpec; prior: RatePrior; ratio: number; soonDelay: number; lateDelay: number; sensitivity: number; rate: number };
const cases = fixture.cases as Case[];

describe('expected reversal rates on the node count chosen for the 1e-4 target', () => {
  it('is within 1e-4 absolute of the fine-grid reference on every case the table covers', () => {
    let worst = 0;
    for (const c of cases) {
      const choice = { sensitivity: c.sensitivity };
      const { nodes, withinTarget } = expectedRateNodes({ choice, prior: c.prior });
      expect(withinTarget).toBe(true);
      const points = priorPoints(c.prior, { method: 'quadrature', nodes });
      const rate = expectedReversalRate({ model: c.model, ratio: c.ratio, soonDelay: c.soonDelay, lateDelay: c.lateDelay, choice, points });
      const error = Math.abs(rate - c.rate);
      worst = Math.max(worst, error);
      expect(error, `${c.model.id} γ=${c.sensitivity} D=${c.lateDelay}`).toBeLessThanOrEqual(EXPECTED_RATE_TARGET);
    }
    expect(worst).toBeGreaterThan(0); // the references are independent of the rule
  }, 60_000);

  it('uses the node table the generator found (a table edited by hand would fail here)', () => {
    const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 };
    for (const [sharpness, nodes] of Object.entries(fixture.nodesForSharpness)) {
      expect(expectedRateNodes({ choice: { sensitivity: Number(sharpness) }, prior }).nodes, `h = ${sharpness}`).toBe(nodes);
    }
  });

  it('misses the target with the old fixed 12-node rule on an ordinary prior (γ = 20, spread 0.8): the error the table removes', () => {
    let worst = 0;
    for (const c of cases) {
      if (c.sensitivity * Math.max(c.prior.sdLogSmall, c.prior.sdLogLarge) !== 16) continue;
      const points = priorPoints(c.prior, { method: 'quadrature', nodes: 12 });
      const rate = expectedReversalRate({ model: c.model, ratio: c.ratio, soonDelay: c.soonDelay, lateDelay: c.lateDelay, choice: { sensitivity: c.sensitivity }, points });
      worst = Math.max(worst, Math.abs(rate - c.rate));
    }
    expect(worst).toBeGreaterThan(1e-3);
  });

  it('keeps the TSDoc example and flags a sharpness beyond the table instead of claiming the target', () => {
    const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
    expect(expectedRateNodes({ choice: { sensitivity: 20 }, prior }).nodes).toBe(40);
    expect(expectedRateNodes({ choice: { sensitivity: 1000 }, prior })).toEqual({ nodes: 128, sharpness: 800, withinTarget: false });
    expect(expectedRateNodes({ choice: { sensitivity: 20 }, prior: { ...prior, sdLogSmall: 0, sdLogLarge: 0 } }).nodes).toBe(12);
    expect(() => expectedRateNodes({ choice: { sensitivity: NaN }, prior })).toThrow(DesignInputError);
    expect(() => expectedRateNodes({ choice: { sensitivity: 20 }, prior: { ...prior, sdLogLarge: Infinity } })).toThrow(DesignInputError);
  });
});
