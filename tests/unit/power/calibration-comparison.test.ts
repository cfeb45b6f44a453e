import { describe, expect, it } from 'vitest';
import { calibrationVariant, createPowerSimulator, summarisePower } from '@/lib/design';
import { buildScenarios, extrapolationRisk, runResult } from '@/lib/shared/power-scenario';
import { assumedTruth, powerRunSpecSchema } from '@/lib/shared/validations/power';
import { powerDesign } from '../../support/frozen-design';

const content = powerDesign({ choiceSensitivity: 30, calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30 } });
const stress = [{ kind: 'delay-sensitivity' as const, low: 0.4, high: 0.9 }];
const runSpec = powerRunSpecSchema.parse({
  designVersionId: 1,
  truth: assumedTruth(content),
  calibration: 'simulated',
  stress,
  compareCalibration: true,
  test: { kind: 'sign', alpha: 0.05, alternative: 'greater' },
  sampleSizes: [20, 60],
  replications: 12,
  seed: 4,
});

describe('a power run that compares the design’s calibration with the other one', () => {
  const scenarios = buildScenarios(runSpec, content);
  const outcomes = scenarios.map((s) => {
    const simulator = createPowerSimulator(s);
    return { tally: simulator.run(0, s.replications), longestCalibrationDelay: simulator.longestCalibrationDelay };
  });
  const result = runResult(scenarios, outcomes, { number: 2, hash: 'e'.repeat(64), content }, stress);

  it('simulates every truth twice, the second time with calibration spanning the probes and s estimated', () => {
    expect(scenarios).toHaveLength(4);
    expect(scenarios.slice(2).map((s) => s.design.spec.calibration)).toEqual([
      { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30, placement: 'span-probes', fit: 'power-delay' },
      { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30, placement: 'span-probes', fit: 'power-delay' },
    ]);
    expect(scenarios[3].truth).toEqual(scenarios[1].truth);
    // the other calibration reaches further than the design's 30 days
    expect(outcomes[2].longestCalibrationDelay!).toBeGreaterThan(outcomes[0].longestCalibrationDelay!);
  });

  it('stores both calibrations side by side per truth, and says so in the method paragraph with the figures', () => {
    const c = result.calibrationComparison!;
    expect(c.rows.map((r) => r.truth)).toEqual(['the assumed truth', 'delay sensitivity s drawn per participant from U(0.4, 0.9)']);
    const other = summarisePower(scenarios[3], outcomes[3].tally, outcomes[3].longestCalibrationDelay);
    expect(c.rows[1].other.points.at(-1)!.probesInTrueZone).toBe(other.points.at(-1)!.probesInTrueZone);
    expect(c.other).toMatch(/^later delays from 1 days up to the late delays the probes will use .* power-delay hyperbola/);
    const pct = (v: number) => `${(Math.round(v * 1000) / 10).toFixed(1)} %`;
    expect(result.methodText).toContain(
      `under delay sensitivity s drawn per participant from U(0.4, 0.9), power ${pct(c.rows[1].own.points[1].power)} against ${pct(c.rows[1].other.points[1].power)} ` +
        `and probes inside the true zone ${pct(c.rows[1].own.points[1].probesInTrueZone)} against ${pct(c.rows[1].other.points[1].probesInTrueZone)}`,
    );
  });

  it('compares a design that already spans the probes with today’s block', () => {
    const spanning = powerDesign({ calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30, placement: 'span-probes', fit: 'hyperboloid' } });
    const [first] = buildScenarios({ ...runSpec, stress: [] }, spanning);
    expect(calibrationVariant(first).design.spec.calibration).toEqual({ itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30 });
  });

  it('is left out when not asked for, and refused without a simulated calibration block', () => {
    expect(buildScenarios({ ...runSpec, compareCalibration: undefined }, content)).toHaveLength(2);
    const refused = powerRunSpecSchema.safeParse({ ...runSpec, calibration: 'known' });
    expect(refused.success).toBe(false);
    expect(refused.error!.issues[0].path).toEqual(['compareCalibration']);
  });

  it('quantifies the extrapolation risk of the design as configured: spanning the probes with s estimated leaves fewer probes outside the zone', () => {
    const today = extrapolationRisk(content, { participants: 400, seed: 5 })!;
    const spanning = extrapolationRisk(powerDesign({ choiceSensitivity: 30, calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30, placement: 'span-probes', fit: 'power-delay' } }), { participants: 400, seed: 5 })!;
    expect(spanning.outside).toBeLessThan(today.outside);
    expect(spanning.message).toMatch(/^Under delay sensitivity drawn from U\(0\.4, 0\.9\), \d+\.\d % of probe pairs would fall outside the true reversal zone/);
  });
});
