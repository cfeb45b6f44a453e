import { describe, expect, it } from 'vitest';
import { anchorDelays, DesignInputError, optimiseLateDelay, predictPattern, preferenceGaps, type ModelSpec, type PairInput } from '@/lib/design';

const base: PairInput = { model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 };

describe('anchor delays', () => {
  it('keeps the TSDoc example: the late anchor reaches the probe clarity', () => {
    expect(anchorDelays(base)?.late?.reachesTarget).toBe(true);
  });

  const models: ModelSpec[] = [
    { id: 'hyperbolic' },
    { id: 'exponential' },
    { id: 'hyperboloid', sensitivity: 0.6 },
    { id: 'power-delay', sensitivity: 0.8 },
    { id: 'exponential-power', sensitivity: 0.7 },
    { id: 'quasi-hyperbolic', presentBias: 0.95 },
  ];
  for (const model of models) {
    it(`${model.id}: anchors sit outside the zone, give LL and SS, and are exactly as clear-cut as the probe`, () => {
      const input = { ...base, model, kLarge: 0.02 };
      const probe = optimiseLateDelay(input)!;
      const a = anchorDelays(input)!;
      expect(a.probe).toBe(probe.gapProduct);
      expect(a.target).toBe(probe.gapProduct);
      const late = a.late!;
      const soon = a.soon!;
      expect(late.lateDelay).toBeLessThan(probe.lower);
      expect(late.lateDelay).toBeGreaterThan(input.soonDelay);
      expect(soon.lateDelay).toBeGreaterThan(probe.upper);
      expect(predictPattern({ ...input, lateDelay: late.lateDelay })).toBe('LL');
      expect(predictPattern({ ...input, lateDelay: soon.lateDelay })).toBe('SS');
      // gaps recomputed independently through preferenceGaps; root found to 1e-12 in ln(D − d)
      const gl = preferenceGaps({ ...input, lateDelay: late.lateDelay });
      const gs = preferenceGaps({ ...input, lateDelay: soon.lateDelay });
      expect(late.far).toBeCloseTo(gl.far, 12);
      expect(late.near).toBeCloseTo(gl.near, 12);
      if (late.reachesTarget) expect(Math.abs((gl.far * -gl.near) / a.target - 1)).toBeLessThan(1e-8);
      if (soon.reachesTarget) expect(Math.abs((-gs.far * gs.near) / a.target - 1)).toBeLessThan(1e-8);
      // the distance bound: within a factor 4 of the zone edge in D − d
      expect(late.lateDelay - input.soonDelay).toBeGreaterThanOrEqual((probe.lower - input.soonDelay) / 4 - 1e-9);
      expect(soon.lateDelay - input.soonDelay).toBeLessThanOrEqual((probe.upper - input.soonDelay) * 4 + 1e-9);
    });
  }

  it('stops at the distance bound and says so when the target clarity is out of reach', () => {
    const a = anchorDelays(base, { target: 0.2, maxFactor: 2 })!;
    expect(a.late!.reachesTarget).toBe(false);
    expect(a.late!.lateDelay).toBeCloseTo(10 + (30 - 10) / 2, 9); // zone (30, 60): bound d + (D_lower − d)/2
    expect(a.soon!.reachesTarget).toBe(false);
    expect(a.soon!.lateDelay).toBeCloseTo(10 + (60 - 10) * 2, 9);
  });

  it('has no late anchor when the zone starts at the soon delay (quasi-hyperbolic, β ≤ x)', () => {
    const a = anchorDelays({ ...base, model: { id: 'quasi-hyperbolic', presentBias: 0.4 }, kSmall: 0.01, kLarge: 0.01 })!;
    expect(a.late).toBeNull();
    expect(a.soon).not.toBeNull();
  });

  it('has no soon anchor when the zone has no finite end', () => {
    const a = anchorDelays({ ...base, model: { id: 'power-delay', sensitivity: 0.001 }, kSmall: 1, kLarge: 0.5 })!;
    expect(a.soon).toBeNull();
  });

  it('places anchors in a zone only a few ulps wide (S/L a hair below 1, equal rates) without a root-finder error', () => {
    // Rounding can leave the clarity at the zone edge at or above the target: the edge is then the anchor.
    for (const kSmall of [0.00012, 0.000144, 0.00020736, 0.02]) {
      const anchors = anchorDelays({ model: { id: 'hyperbolic' }, ratio: 0.9999999999999999, soonDelay: 14, kSmall, kLarge: kSmall });
      for (const side of [anchors?.late, anchors?.soon]) {
        if (!side) continue;
        expect(Number.isFinite(side.lateDelay)).toBe(true);
        expect(side.lateDelay).toBeGreaterThan(14);
      }
    }
  });

  it('is null when the zone is empty', () => {
    expect(anchorDelays({ ...base, kSmall: 0.01 })).toBeNull();
  });

  it('rejects a distance bound of 1 or less and a non-positive target', () => {
    for (const maxFactor of [1, 0.5, NaN, Infinity]) expect(() => anchorDelays(base, { maxFactor })).toThrow(expect.objectContaining({ field: 'maxFactor' }));
    for (const target of [0, -1, NaN, Infinity]) expect(() => anchorDelays(base, { target })).toThrow(expect.objectContaining({ field: 'target' }));
    expect(() => anchorDelays({ ...base, ratio: 1 })).toThrow(DesignInputError);
  });
});
