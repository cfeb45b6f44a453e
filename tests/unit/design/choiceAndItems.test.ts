import { describe, expect, it } from 'vitest';
import {
  calibrationItems,
  choiceProbability,
  discountFactor,
  DesignInputError,
  extrapolationWarning,
  indifferenceRate,
  type ModelSpec,
} from '@/lib/design';

describe('choice probability (logistic with lapse)', () => {
  it('keeps the TSDoc example: a zero value gap is a coin flip', () => {
    expect(choiceProbability({ sensitivity: 10, lapse: 0.1 }, 0)).toBe(0.5);
  });

  it('matches direct evaluation of ε/2 + (1 − ε)/(1 + exp(−γΔ))', () => {
    for (const [g, e, gap] of [[5, 0, 0.1], [20, 0.04, -0.2], [1, 0.5, 3]]) {
      expect(choiceProbability({ sensitivity: g, lapse: e }, gap)).toBeCloseTo(e / 2 + (1 - e) / (1 + Math.exp(-g * gap)), 15);
    }
  });

  it('is symmetric: P(LL | Δ) + P(LL | −Δ) = 1', () => {
    for (const gap of [1e-9, 0.01, 0.3, 5]) {
      const c = { sensitivity: 12, lapse: 0.05 };
      expect(choiceProbability(c, gap) + choiceProbability(c, -gap)).toBeCloseTo(1, 15);
    }
  });

  it('stays finite and in [ε/2, 1 − ε/2] for huge |γΔ| and infinite gaps', () => {
    const c = { sensitivity: 1e6, lapse: 0.02 };
    expect(choiceProbability(c, 1e6)).toBeCloseTo(0.99, 15);
    expect(choiceProbability(c, -1e6)).toBeCloseTo(0.01, 15);
    expect(choiceProbability(c, Infinity)).toBeCloseTo(0.99, 15);
    expect(choiceProbability(c, -Infinity)).toBeCloseTo(0.01, 15);
    // without lapse the small tail keeps relative accuracy: σ(−800) = e^−800/(1 + e^−800) underflows to 0, σ(−700) does not
    expect(choiceProbability({ sensitivity: 1 }, -700)).toBeCloseTo(Math.exp(-700), 310);
    expect(choiceProbability({ sensitivity: 1 }, -700)).toBeGreaterThan(0);
  });
});

describe('indifference rates of fixed choice items', () => {
  // Kirby, Petry & Bickel (1999), J Exp Psychol Gen 128:78–87, monetary choice questionnaire
  // items "S today vs L in D days" with k = (L/S − 1)/D, printed rounded to two significant
  // figures (items recalled from memory).
  const kirby: [number, number, number, number][] = [
    [54, 55, 117, 0.00016],
    [55, 75, 61, 0.006],
    [19, 25, 53, 0.006],
    [31, 85, 7, 0.25],
    [14, 25, 19, 0.041],
    [47, 50, 160, 0.0004],
    [25, 60, 14, 0.1],
    [78, 80, 162, 0.00016],
  ];
  for (const [S, L, D, printed] of kirby) {
    it(`hyperbolic: $${S} today vs $${L} in ${D} days ties at k ≈ ${printed} (Kirby, Petry & Bickel 1999, from memory)`, () => {
      const k = indifferenceRate({ id: 'hyperbolic' }, { soonerAmount: S, laterAmount: L, laterDelay: D });
      expect(Number(k.toPrecision(2))).toBeCloseTo(printed, 12);
    });
  }

  it('keeps the TSDoc example: (55/54 − 1)/117', () => {
    expect(indifferenceRate({ id: 'hyperbolic' }, { soonerAmount: 54, laterAmount: 55, laterDelay: 117 })).toBeCloseTo(1 / 54 / 117, 15);
  });

  it('exponential: implied annual rates 345 %, 120 % and 19 % for $15 now vs $20 in 1 month, $50 in 1 year, $100 in 10 years (Thaler 1981, Econ Lett 8:201–207, from memory)', () => {
    const annual = (L: number, years: number) => 365 * indifferenceRate({ id: 'exponential' }, { soonerAmount: 15, laterAmount: L, laterDelay: 365 * years });
    expect(Math.round(annual(20, 1 / 12) * 100)).toBe(345);
    expect(Math.round(annual(50, 1) * 100)).toBe(120);
    expect(Math.round(annual(100, 10) * 100)).toBe(19);
  });

  it('every model: at its indifference rate the two options have equal value (direct evaluation through discountFactor)', () => {
    const models: ModelSpec[] = [
      { id: 'exponential' },
      { id: 'hyperbolic' },
      { id: 'hyperboloid', sensitivity: 0.5 },
      { id: 'power-delay', sensitivity: 0.7 },
      { id: 'exponential-power', sensitivity: 0.6 },
      { id: 'quasi-hyperbolic', presentBias: 0.9 },
    ];
    for (const model of models) {
      for (const d of [0, 14]) {
        const item = { soonerAmount: 40, soonerDelay: d, laterAmount: 100, laterDelay: 90 };
        const k = indifferenceRate(model, item);
        const v = 100 * discountFactor(model, k, 90) - 40 * discountFactor(model, k, d);
        // values are O(100); root found to 1e-13 in ln k
        expect(Math.abs(v), `${model.id} d=${d}`).toBeLessThan(1e-9);
      }
    }
  });

  it('quasi-hyperbolic has no indifference rate when S ≥ βL', () => {
    expect(() => indifferenceRate({ id: 'quasi-hyperbolic', presentBias: 0.5 }, { soonerAmount: 60, laterAmount: 100, laterDelay: 30 })).toThrow(DesignInputError);
  });
});

describe('calibration block', () => {
  it('keeps the TSDoc example: two items per magnitude give four items', () => {
    expect(calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 2 }).length).toBe(4);
  });

  it('targets a log-spaced grid of rates, each item an exact tie at its target rate', () => {
    const model: ModelSpec = { id: 'hyperboloid', sensitivity: 0.8 };
    const items = calibrationItems({ model, countPerMagnitude: 12, rateRange: { min: 1e-3, max: 0.5 }, delayRange: { min: 2, max: 180 }, amounts: { small: 30, large: 600 } });
    for (const magnitude of ['small', 'large'] as const) {
      const block = items.filter((i) => i.magnitude === magnitude);
      expect(block).toHaveLength(12);
      const logs = block.map((i) => Math.log(i.targetRate));
      const step = (Math.log(0.5) - Math.log(1e-3)) / 11;
      // Each item's delay is a whole day and its sooner amount whole cents, and targetRate is the
      // exact tie of the rounded item, so it leaves the grid only by the cent rounding: half a cent
      // on a later amount of 30 moves ln k by less than 1e-3 here (measured worst: 8.6e-4).
      logs.forEach((l, j) => expect(Math.abs(l - (Math.log(1e-3) + j * step))).toBeLessThan(1e-3));
      for (const item of block) {
        expect(item.soonerDelay).toBe(0);
        expect(item.soonerAmount).toBeGreaterThan(0);
        expect(item.soonerAmount).toBeLessThan(item.laterAmount);
        expect(item.laterDelay).toBeGreaterThanOrEqual(2);
        expect(item.laterDelay).toBeLessThanOrEqual(180);
        const tie = item.laterAmount * discountFactor(model, item.targetRate, item.laterDelay) - item.soonerAmount;
        expect(Math.abs(tie)).toBeLessThan(1e-9 * item.laterAmount);
      }
    }
  });

  it('rejects bad options naming the field', () => {
    const m: ModelSpec = { id: 'hyperbolic' };
    const cases: [string, () => unknown][] = [
      ['countPerMagnitude', () => calibrationItems({ model: m, countPerMagnitude: 1 })],
      ['countPerMagnitude', () => calibrationItems({ model: m, countPerMagnitude: NaN })],
      ['delayRange.min', () => calibrationItems({ model: m, delayRange: { min: 0, max: 10 } })],
      ['delayRange.max', () => calibrationItems({ model: m, delayRange: { min: 5, max: Infinity } })],
      ['rateRange.max', () => calibrationItems({ model: m, rateRange: { min: 0.1, max: 0.01 } })],
      ['amounts.large', () => calibrationItems({ model: m, amounts: { small: 10, large: NaN } })],
      ['roundTo', () => calibrationItems({ model: m, roundTo: -1 })],
    ];
    for (const [field, call] of cases) expect(call).toThrow(expect.objectContaining({ field }));
  });
});

describe('extrapolation warning', () => {
  it('keeps the TSDoc example: probes within 3× the longest calibration delay give no warning', () => {
    expect(extrapolationWarning({ calibrationDelays: [7, 30], probeDelays: [60] })).toBeNull();
  });

  it('flags probes beyond the factor with a structured warning and a human message', () => {
    const w = extrapolationWarning({ calibrationDelays: [7, 30], probeDelays: [60, 120] });
    expect(w).toMatchObject({ kind: 'extrapolation', longestCalibrationDelay: 30, longestProbeDelay: 120, factor: 3 });
    expect(w!.message).toContain('120 days');
    expect(w!.message).toContain('4 times');
    expect(extrapolationWarning({ calibrationDelays: [30], probeDelays: [90] })).toBeNull(); // exactly at the factor
    expect(extrapolationWarning({ calibrationDelays: [30], probeDelays: [61], factor: 2 })).not.toBeNull();
  });

  it('rejects empty lists, non-positive delays and a factor below 1', () => {
    expect(() => extrapolationWarning({ calibrationDelays: [], probeDelays: [1] })).toThrow(expect.objectContaining({ field: 'calibrationDelays' }));
    expect(() => extrapolationWarning({ calibrationDelays: [1], probeDelays: [NaN] })).toThrow(expect.objectContaining({ field: 'probeDelays[0]' }));
    expect(() => extrapolationWarning({ calibrationDelays: [1], probeDelays: [1], factor: 0.5 })).toThrow(expect.objectContaining({ field: 'factor' }));
  });
});
