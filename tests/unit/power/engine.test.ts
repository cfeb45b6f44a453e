import { describe, expect, it } from 'vitest';
import {
  createPowerSimulator,
  createRandom,
  estimateRates,
  mergeTallies,
  replicateSeed,
  summarisePower,
  type CalibrationItem,
  type PowerScenario,
} from '@/lib/design';
import { FastRateEstimator } from '@/lib/design/power/fastRateEstimate';
import { calibrationItems } from '@/lib/design';
import { POWER_PRIOR, powerDesign } from '../../support/frozen-design';

const prior = POWER_PRIOR;
const spec = powerDesign().spec;

function scenario(overrides: Partial<PowerScenario> = {}): PowerScenario {
  return {
    design: { spec, prior, soonDelay: 30 },
    truth: { model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
    sampleSizes: [5, 10, 20],
    replications: 40,
    seed: 1,
    ...overrides,
  };
}

describe('reproducibility', () => {
  it('gives identical tallies for the same spec and seed however the replicates are split', () => {
    const s = scenario();
    const whole = createPowerSimulator(s).run(0, 40);
    // two "workers", each with its own simulator and caches, splitting the replicates unevenly
    const a = createPowerSimulator(s).run(0, 13);
    const b = createPowerSimulator(s).run(13, 40);
    expect(mergeTallies([b, a])).toEqual(whole);
  });

  it('gives different results for a different seed', () => {
    const one = createPowerSimulator(scenario()).run(0, 40);
    const two = createPowerSimulator(scenario({ seed: 2 })).run(0, 40);
    expect(two.probeReversals).not.toEqual(one.probeReversals);
  });

  it('derives distinct replicate seeds from a run seed', () => {
    const seeds = new Set(Array.from({ length: 10000 }, (_, r) => replicateSeed(1, r)));
    expect(seeds.size).toBe(10000);
    expect(replicateSeed(1, 5)).toBe(replicateSeed(1, 5));
    expect(replicateSeed(2, 5)).not.toBe(replicateSeed(1, 5));
  });
});

describe('simulation sanity', () => {
  it('reaches power near 1 as N grows with a noise-free truth equal to the design and known rates', () => {
    const s = scenario({
      truth: { model: { id: 'hyperbolic' }, prior, gamma: 10000, lapse: 0 },
      calibration: 'known',
      sampleSizes: [1, 2, 5, 20],
      replications: 50,
    });
    const summary = summarisePower(s, createPowerSimulator(s).run(0, 50), null);
    const powers = summary.points.map((p) => p.power);
    expect(powers[powers.length - 1]).toBe(1);
    for (let i = 1; i < powers.length; i++) expect(powers[i]).toBeGreaterThanOrEqual(powers[i - 1]);
    // known rates under the true model: every participant with a zone gets probes inside it (the
    // rest, about 4 %, have no zone and get the fallback set), and noise-free choices there are LS
    const last = summary.points[3];
    expect(last.probesInTrueZone).toBeCloseTo(1 - last.fallbackShare, 12);
    expect(last.probesInTrueZone).toBeGreaterThan(0.9);
    expect(last.patterns.probe.SL).toBe(0);
    // γ = 10⁴ still leaves a coin flip for a pair a hair inside the zone edge: 0.5 % of pairs is generous
    expect(Math.abs(last.patterns.probe.LS - last.probesInTrueZone)).toBeLessThan(0.005);
    expect(summary.warnings.map((w) => w.kind)).not.toContain('model-mismatch');
  });

  it('loses power with probes built for the wrong model, and says so', () => {
    const base = scenario({ sampleSizes: [10, 20], replications: 60, test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' } });
    const right = summarisePower(base, createPowerSimulator(base).run(0, 60), null);
    // truth: exponential discounting with small rewards discounted no faster than large ones has no reversal zone at all
    const equalRates = { ...prior, medianSmall: 0.008, correlation: 0.99, sdLogSmall: 1 };
    const wrong = { ...base, truth: { ...base.truth, model: { id: 'exponential' as const }, prior: equalRates } };
    const wrongSummary = summarisePower(wrong, createPowerSimulator(wrong).run(0, 60), null);
    expect(wrongSummary.points[1].power).toBeLessThan(right.points[1].power - 0.5);
    const kinds = wrongSummary.warnings.map((w) => w.kind);
    expect(kinds).toContain('model-mismatch');
    expect(kinds).toContain('misplaced-probes');
  });

  it('refuses a design whose prior medians have no reversal zone', () => {
    const flat = { ...prior, medianSmall: 0.001, medianLarge: 0.01 };
    expect(() => createPowerSimulator(scenario({ design: { spec, prior: flat, soonDelay: 30 } }))).toThrow(/prior/);
  });

  it('names the field of a bad scenario', () => {
    expect(() => createPowerSimulator(scenario({ sampleSizes: [20, 10] }))).toThrow(/sampleSizes\[1\]/);
    expect(() => createPowerSimulator(scenario({ replications: 0 }))).toThrow(/replications/);
  });
});

describe('fast rate estimate', () => {
  it('matches estimateRates (the core estimator) on simulated calibration answers', () => {
    const items = calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 12, delayRange: { min: 1, max: 365 }, rateRange: { min: 1e-4, max: 0.5 } });
    const large = items.filter((i) => i.magnitude === 'large');
    const fast = new FastRateEstimator({ id: 'hyperbolic' }, large, 10, 0.02);
    const random = createRandom({ seed: 7 });
    for (let trial = 0; trial < 60; trial++) {
      const k = Math.exp(Math.log(0.01) + 1.5 * random.normal());
      const bits = large.map((item) => (random.uniform() < 1 / (1 + Math.exp(-10 * (1 / (1 + k * item.laterDelay) - item.soonerAmount / item.laterAmount))) ? 1 : 0));
      const responses = items.map((item) => (item.magnitude === 'large' ? (bits[large.indexOf(item as CalibrationItem)] ? 'LL' : 'SS') : 'SS'));
      const reference = estimateRates(responses, items, { id: 'hyperbolic' }, { sensitivity: 10, lapse: 0.02 }).large;
      const mine = fast.estimate(bits);
      // Brent's maximiser places a smooth maximum to ~1e-8 relative; 1e-6 in ln k is honest
      expect(Math.abs(Math.log(mine.rate) - reference.logRate)).toBeLessThan(1e-6);
      expect(mine.flags).toEqual(reference.flags);
    }
  });
});
