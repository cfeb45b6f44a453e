import { describe, expect, it } from 'vitest';
import { expectedReversalRate, modelDiscrimination, modelRecovery, optimisePopulationDesign, type ProbePlacement } from '@/lib/criteria';
import { DesignInputError, discriminationLateDelay, optimiseLateDelay, type BankDesign, type ModelSpec } from '@/lib/design';
import { pairDelaysAround } from '@/lib/design/item-bank/pairDelays';

// docs/mathematics.md, "Model discrimination"

/** Direct textbook computation: logistic P(LL) per model, then KL(p‖q) + KL(q‖p) of two Bernoulli variables term by term. */
function directJeffreys(x: number, d: number, D: number, k: number, K: number, gamma: number, lapse: number): number {
  const logistic = (v: number) => lapse / 2 + (1 - lapse) / (1 + Math.exp(-gamma * v));
  const hyp = (r: number, t: number) => 1 / (1 + r * t);
  const exp = (r: number, t: number) => Math.exp(-r * t);
  const kl = (p: number, q: number) => p * Math.log(p / q) + (1 - p) * Math.log((1 - p) / (1 - q));
  const farH = logistic(hyp(K, D) - x * hyp(k, d));
  const farE = logistic(exp(K, D) - x * exp(k, d));
  const nearH = logistic(hyp(K, D - d) - x);
  const nearE = logistic(exp(K, D - d) - x);
  return kl(farH, farE) + kl(farE, farH) + kl(nearH, nearE) + kl(nearE, nearH);
}

const hyperbolic: ModelSpec = { id: 'hyperbolic' };

describe('modelDiscrimination', () => {
  it('equals the symmetric KL divergence computed directly from both models’ choice probabilities, over a sweep', () => {
    let checked = 0;
    for (const gamma of [1, 5, 10, 40]) {
      for (const lapse of [0, 0.05]) {
        for (const [k, K] of [[0.1, 0.05], [0.01, 0.004], [0.002, 0.002]]) {
          for (const d of [0, 7, 30]) {
            for (const span of [1, 20, 200, 2000]) {
              const D = d + span;
              const got = modelDiscrimination({ model: hyperbolic, ratio: 0.6, soonDelay: d, lateDelay: D, kSmall: k, kLarge: K, choice: { sensitivity: gamma, lapse } }).divergence;
              const want = directJeffreys(0.6, d, D, k, K, gamma, lapse);
              expect(got).toBeCloseTo(want, 10);
              expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, want));
              checked++;
            }
          }
        }
      }
    }
    expect(checked).toBe(4 * 2 * 3 * 3 * 4);
  });

  it('adds the reversal term with the team’s weight, the expected reversal rate at the estimates', () => {
    const pair = { model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05, choice: { sensitivity: 10 } };
    const pure = modelDiscrimination(pair);
    const weighted = modelDiscrimination({ ...pair, reversalWeight: 3 });
    const reversal = expectedReversalRate({ ...pair, points: { kSmall: new Float64Array([0.1]), kLarge: new Float64Array([0.05]), weights: null } });
    expect(pure.value).toBe(pure.divergence);
    expect(weighted.reversal).toBeCloseTo(reversal, 14);
    expect(weighted.value).toBeCloseTo(pure.divergence + 3 * reversal, 14);
  });

  it('refuses a bad weight or rate naming the field', () => {
    const pair = { model: hyperbolic, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05, choice: { sensitivity: 10 } };
    expect(() => modelDiscrimination({ ...pair, reversalWeight: -1 })).toThrow(DesignInputError);
    expect(() => modelDiscrimination({ ...pair, reversalWeight: -1 })).toThrow(/reversalWeight/);
    expect(() => modelDiscrimination({ ...pair, kLarge: 0 })).toThrow(/kLarge/);
  });

  it('the optimiser’s late delay beats every late delay of a fine grid', () => {
    const rates = { kSmall: 0.02, kLarge: 0.01 };
    const choice = { sensitivity: 10 };
    const best = optimisePopulationDesign({ model: hyperbolic, ratio: 0.6, criterion: { kind: 'model-discrimination', ...rates, choice }, soonDelay: { min: 14, max: 14 }, lateDelayMax: 730 });
    for (let i = 0; i <= 400; i++) {
      const D = 14 + Math.exp(Math.log(1) + (i / 400) * Math.log(716));
      const v = modelDiscrimination({ model: hyperbolic, ratio: 0.6, soonDelay: 14, lateDelay: D, ...rates, choice }).value;
      expect(v).toBeLessThanOrEqual(best.value + 1e-9);
    }
  });
});

describe('discriminationLateDelay (the power simulation’s and planner’s fixed-d search)', () => {
  it('agrees with the population optimiser at one soon delay over a sweep of rates and weights', () => {
    for (const [k, K] of [[0.02, 0.01], [0.005, 0.003], [0.08, 0.04], [0.3, 0.1]]) {
      for (const w of [0, 1, 5]) {
        const choice = { sensitivity: 10 };
        const best = optimisePopulationDesign({ model: hyperbolic, ratio: 0.6, criterion: { kind: 'model-discrimination', kSmall: k, kLarge: K, choice, reversalWeight: w }, soonDelay: { min: 14, max: 14 }, lateDelayMax: 730 });
        const D = discriminationLateDelay(hyperbolic, 0.6, 14, k, K, 10, 0, w, 730);
        const value = modelDiscrimination({ model: hyperbolic, ratio: 0.6, soonDelay: 14, lateDelay: D, kSmall: k, kLarge: K, choice, reversalWeight: w }).value;
        expect(value).toBeGreaterThanOrEqual(best.value - 1e-8);
      }
    }
  });
});

describe('modelRecovery: model discrimination against the gap product (seeded)', () => {
  const prior = { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.7 };
  const spec = {
    model: hyperbolic,
    ratio: 0.6,
    largeAmount: 100,
    currency: 'EUR',
    mode: 'personalised' as const,
    soonDelay: { mode: 'fixed' as const, days: 14 },
    lateDelayLimit: 730,
    probePairs: 4,
    lateAnchors: 0,
    soonAnchors: 0,
    calibration: { itemsPerMagnitude: 10, minDelay: 7, maxDelay: 365 },
    choiceSensitivity: 10,
  };
  const choice = { sensitivity: 10 };
  const d = 14;
  const gapDesign: BankDesign = { spec: { ...spec, criterion: 'gap-product' }, prior };
  const klDesign: BankDesign = { spec: { ...spec, criterion: 'model-discrimination' }, prior };
  const byGap = (rates: { kSmall: number; kLarge: number }): ProbePlacement => {
    const optimum = optimiseLateDelay({ model: hyperbolic, ratio: 0.6, soonDelay: d, ...rates });
    const delays = optimum && pairDelaysAround(gapDesign, { soonDelay: d, lateDelay: optimum.lateDelay }, rates, optimum);
    return delays ? { soonDelay: d, lateDelays: delays.probes } : null;
  };
  const byDivergence = (rates: { kSmall: number; kLarge: number }): ProbePlacement => {
    const best = optimisePopulationDesign({ model: hyperbolic, ratio: 0.6, criterion: { kind: 'model-discrimination', ...rates, choice }, soonDelay: { min: d, max: d }, lateDelayMax: 730, grid: { soon: 1, late: 24 }, refinementRounds: 3 });
    const delays = pairDelaysAround(klDesign, { soonDelay: d, lateDelay: best.lateDelay }, rates);
    return delays ? { soonDelay: d, lateDelays: delays.probes } : null;
  };

  // 5 replicates × 2,000 simulated participants per true model (seeds 1–5), γ = 10, 4 probe pairs, d = 14, limit 730 days;
  // both designs see the same participants (common random numbers). Share = better-fitting model (likelihood at the rates) is the true one.
  it('recovers the true model more often, with hyperbolic and with exponential truth', () => {
    const rows: string[] = [];
    const sums = { gap: 0, kl: 0, gapH: 0, klH: 0, gapE: 0, klE: 0 };
    for (let seed = 1; seed <= 5; seed++) {
      const gap = modelRecovery({ ratio: 0.6, choice, prior, place: byGap, participants: 2000, seed });
      const kl = modelRecovery({ ratio: 0.6, choice, prior, place: byDivergence, participants: 2000, seed });
      rows.push(`seed ${seed}: gap product ${gap.hyperbolic.toFixed(3)}/${gap.exponential.toFixed(3)}, model discrimination ${kl.hyperbolic.toFixed(3)}/${kl.exponential.toFixed(3)}`);
      expect(kl.overall).toBeGreaterThan(gap.overall);
      sums.gap += gap.overall;
      sums.kl += kl.overall;
      sums.gapH += gap.hyperbolic;
      sums.klH += kl.hyperbolic;
      sums.gapE += gap.exponential;
      sums.klE += kl.exponential;
    }
    // measured (seeds 1–5): overall 0.740 → 0.765; hyperbolic truth 0.729 → 0.777; exponential truth 0.751 → 0.752
    expect(sums.kl / 5 - sums.gap / 5).toBeGreaterThan(0.015);
    expect(sums.klH / 5).toBeGreaterThan(sums.gapH / 5 + 0.03);
    expect(sums.klE / 5).toBeGreaterThanOrEqual(sums.gapE / 5 - 0.005);
    rows.push(`mean: gap product ${(sums.gap / 5).toFixed(4)} (${(sums.gapH / 5).toFixed(4)}/${(sums.gapE / 5).toFixed(4)}), model discrimination ${(sums.kl / 5).toFixed(4)} (${(sums.klH / 5).toFixed(4)}/${(sums.klE / 5).toFixed(4)})`);
    console.log(rows.join('\n'));
  });
});
