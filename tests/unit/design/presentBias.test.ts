import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { optimiseLateDelay, optimiseLateDelayBatch, pairDelays, preferenceGaps } from '@/lib/design';
import { createPowerSimulator } from '@/lib/design/power';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { buildScenario } from '@/lib/shared/power-scenario';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { powerRunSpecSchema } from '@/lib/shared/validations/power';
import { frozenDesignSchema } from '@/lib/shared/validations/planner';

// Quasi-hyperbolic optimum over the whole range of present bias β the schema accepts, (0, 1].
// Reference values: tests/unit/design/fixtures/present-bias/generate.py (scipy brentq and bounded Brent on the
// gaps written from the model's definition; docs/mathematics.md "Closed forms").
type Case = { presentBias: number; ratio: number; soonDelay: number; kSmall: number; kLarge: number; lower: number; upper: number; lateDelay: number; gapProduct: number };
const fixture = JSON.parse(readFileSync(path.join(__dirname, 'fixtures/present-bias/present-bias.json'), 'utf8')) as { cases: Case[] };
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('quasi-hyperbolic optimal late delay against scipy, β from 0.01 to 1', () => {
  it(`matches every one of the ${fixture.cases.length} reference optima, late delay always after the soon delay`, () => {
    expect(fixture.cases.length).toBeGreaterThan(500);
    for (const c of fixture.cases) {
      const input = { model: { id: 'quasi-hyperbolic' as const, presentBias: c.presentBias }, ratio: c.ratio, soonDelay: c.soonDelay, kSmall: c.kSmall, kLarge: c.kLarge };
      const o = optimiseLateDelay(input)!;
      const label = JSON.stringify(input);
      expect(o, label).not.toBeNull();
      expect(o.lateDelay, label).toBeGreaterThan(c.soonDelay);
      expect(rel(o.lower, c.lower), label).toBeLessThan(1e-9);
      expect(rel(o.upper, c.upper), label).toBeLessThan(1e-9);
      // bounded Brent places a smooth interior maximum to about √ε relative: 1e-6 is honest
      expect(rel(o.lateDelay, c.lateDelay), label).toBeLessThan(1e-6);
      // the reference evaluates A = β(e^(−KD) − x·e^(−kd)) directly, losing digits where the two terms nearly cancel
      expect(rel(o.gapProduct, c.gapProduct), label).toBeLessThan(1e-7);
      const g = preferenceGaps({ ...input, lateDelay: o.lateDelay });
      expect(rel(o.gapProduct, g.far * g.near), label).toBeLessThan(1e-12);
    }
  });

  it('the batch solver agrees with the single solve to the last bit', () => {
    const cs = fixture.cases.filter((c) => c.presentBias < 0.3);
    const out = optimiseLateDelayBatch(
      { id: 'quasi-hyperbolic', presentBias: 0.1 },
      { ratio: new Float64Array(cs.length).fill(0.6), soonDelay: Float64Array.from(cs.map((c) => c.soonDelay)), kSmall: Float64Array.from(cs.map((c) => c.kSmall)), kLarge: Float64Array.from(cs.map((c) => c.kLarge)) },
    );
    cs.forEach((c, i) => {
      const o = optimiseLateDelay({ model: { id: 'quasi-hyperbolic', presentBias: 0.1 }, ratio: 0.6, soonDelay: c.soonDelay, kSmall: c.kSmall, kLarge: c.kLarge });
      expect(out.lateDelay[i]).toBe(o ? o.lateDelay : NaN);
    });
  });

  it('a zone shorter than two days gets its middle, not its start', () => {
    // d = 14, x = 0.6, β = 0.1: the zone (14, D_upper) with D_upper − 14 = ln(1/0.6)/K + (k − K)·14/K, K = 1 per day
    const input = { model: { id: 'quasi-hyperbolic' as const, presentBias: 0.1 }, ratio: 0.6, soonDelay: 14, kSmall: 1.001, kLarge: 1 };
    const o = optimiseLateDelay(input)!;
    expect(o.upper - 14).toBeLessThan(2);
    expect(o.lateDelay).toBeCloseTo(14 + (o.upper - 14) / 2, 12);
  });
});

describe("the planner's default design over the whole present-bias range", () => {
  const prior = { name: 'Sweep', medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
  const betas = [Number.MIN_VALUE, 1e-300, 1e-10, 1e-3, 0.008, 0.0084, 0.01, 0.015, 0.02, 0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.9, 1];
  for (const beta of betas) {
    it(`β = ${beta}: a valid item bank and power run, or a save-time refusal naming spec.model.presentBias`, () => {
      const spec = { ...defaultSpec('Sweep', 1), model: { id: 'quasi-hyperbolic', presentBias: beta } };
      const parsed = frozenDesignSchema.safeParse({ spec, prior });
      if (!parsed.success) {
        expect(parsed.error.issues.map((i) => i.path.join('.'))).toEqual(['spec.model.presentBias']);
        expect(parsed.error.issues[0].message).toMatch(/no choice could reveal a discount rate/);
        // refused only where the small later reward is worth at most one amount unit (0.5 EUR) today: β·60 ≤ 0.5
        expect(beta * 60).toBeLessThanOrEqual(0.5);
        return;
      }
      expect(beta * 60).toBeGreaterThan(0.5);
      const design = parsed.data;
      const point = { soonDelay: 14, lateDelay: optimiseLateDelay({ model: design.spec.model, ratio: design.spec.ratio, soonDelay: 14, kSmall: prior.medianSmall, kLarge: prior.medianLarge })!.lateDelay };
      const delays = pairDelays(design, point, { kSmall: prior.medianSmall, kLarge: prior.medianLarge })!;
      for (const D of [...delays.probes, ...delays.lateAnchors, ...delays.soonAnchors]) {
        expect(Number.isFinite(D) && D > 14, `delay ${D}`).toBe(true);
      }
      for (const D of delays.probes) expect(D > delays.zone.lower && D < delays.zone.upper, `probe ${D}`).toBe(true);
      const { bank } = bankFor({ hash: `present-bias-${beta}`, content: design }, { seed: 1 });
      for (const item of bank.items) {
        expect(Number.isFinite(item.laterDelay) && item.laterDelay > item.soonerDelay, item.id).toBe(true);
        expect(Number.isFinite(item.soonerAmount) && Number.isFinite(item.laterAmount), item.id).toBe(true);
      }
      const { name: _name, ...rates } = prior;
      const truth = { model: design.spec.model, prior: rates, gamma: 10, lapse: 0.02 };
      const run = powerRunSpecSchema.parse({ designVersionId: 1, truth, calibration: 'simulated', test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' }, sampleSizes: [5], replications: 10, seed: 1 });
      const result = createPowerSimulator(buildScenario(run, design)).run(0, 10);
      expect(result).toBeTruthy();
    });
  }
});
