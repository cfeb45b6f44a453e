import { describe, expect, it } from 'vitest';
import { applyStress, createPowerSimulator, stressScenarios, summarisePower, type PowerScenario, type PowerTruth } from '@/lib/design';
import { buildScenarios, runResult } from '@/lib/shared/power-scenario';
import { monteCarloNote, runNotes, runSeries } from '@/lib/shared/power-figure';

const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.8 };
const truth: PowerTruth = { model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0.02 };
const spec = {
  model: { id: 'hyperbolic' as const },
  ratio: 0.82,
  largeAmount: 100,
  currency: 'EUR',
  mode: 'personalised' as const,
  soonDelay: { mode: 'fixed' as const, days: 30 },
  lateDelayLimit: 9131,
  probePairs: 4,
  lateAnchors: 2,
  soonAnchors: 2,
  calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 365 },
};
const base: PowerScenario = {
  design: { spec, prior, soonDelay: 30 },
  truth,
  calibration: 'simulated',
  test: { kind: 'sign', alpha: 0.05, alternative: 'greater' },
  sampleSizes: [10, 20, 40],
  replications: 60,
  seed: 7,
};

describe('stress truths: named deviations from the assumed truth', () => {
  it('each changes exactly what its name says', () => {
    expect(applyStress(truth, { kind: 'choice-noise', factor: 0.5 })).toEqual({ ...truth, gamma: 5 });
    expect(applyStress(truth, { kind: 'no-magnitude-effect' })).toEqual({ ...truth, magnitudeEffect: false });
    expect(applyStress(truth, { kind: 'present-bias', beta: 0.8 })).toEqual({ ...truth, presentBias: 0.8 });
    expect(applyStress(truth, { kind: 'other-model' }).model).toEqual({ id: 'exponential' });
    expect(applyStress({ ...truth, model: { id: 'exponential' } }, { kind: 'other-model' }).model).toEqual({ id: 'hyperbolic' });
    const s = applyStress(truth, { kind: 'delay-sensitivity', low: 0.4, high: 0.9 });
    expect(s.model.id).toBe('power-delay');
    expect(s.sensitivityRange).toEqual({ low: 0.4, high: 0.9 });
    expect(applyStress({ ...truth, model: { id: 'exponential' } }, { kind: 'delay-sensitivity', low: 0.4, high: 0.9 }).model.id).toBe('exponential-power');
  });

  it('refuses parameters out of range and a kind listed twice, naming the field', () => {
    expect(() => applyStress(truth, { kind: 'delay-sensitivity', low: 0.9, high: 0.4 })).toThrow(/stress\.high/);
    expect(() => applyStress(truth, { kind: 'present-bias', beta: 1 })).toThrow(/stress\.beta/);
    expect(() => applyStress(truth, { kind: 'choice-noise', factor: 0 })).toThrow(/stress\.factor/);
    expect(() => stressScenarios(base, [{ kind: 'other-model' }, { kind: 'other-model' }])).toThrow(/stress\[1\]\.kind/);
  });

  it('keep the assumed scenario first and otherwise only change the truth', () => {
    const all = stressScenarios(base, [{ kind: 'choice-noise', factor: 0.5 }, { kind: 'other-model' }]);
    expect(all).toHaveLength(3);
    expect(all[0]).toBe(base);
    for (const s of all.slice(1)) expect({ ...s, truth: base.truth }).toEqual(base);
  });

  it('put fewer probe pairs inside the true zone when delay sensitivity is below 1 and the design assumes 1', () => {
    // the known way to miss the zone: rates estimated on calibration delays under s = 1, probes at long delays
    const [assumed, stressed] = stressScenarios(base, [{ kind: 'delay-sensitivity', low: 0.4, high: 0.6 }]);
    const a = createPowerSimulator(assumed).run(0, 30);
    const b = createPowerSimulator(stressed).run(0, 30);
    const share = (t: typeof a) => t.probesInTrueZone[2] / t.patterns.probe[2].reduce((x, y) => x + y, 0);
    expect(share(a)).toBeGreaterThan(0.5); // 0.55 on this seed; 0.21 under the stress
    expect(share(b)).toBeLessThan(share(a) - 0.2);
  });

  it('with noisier choices give fewer LS patterns among probes than the assumed truth, same seed', () => {
    const [assumed, noisy] = stressScenarios(base, [{ kind: 'choice-noise', factor: 0.3 }]);
    const a = summarisePower(assumed, createPowerSimulator(assumed).run(0, 30), null);
    const b = summarisePower(noisy, createPowerSimulator(noisy).run(0, 30), null);
    expect(b.points[2].patterns.probe.LS).toBeLessThan(a.points[2].patterns.probe.LS);
  });
});

describe('a run with stress truths, as stored and shown', () => {
  const stress = [{ kind: 'delay-sensitivity' as const, low: 0.4, high: 0.6 }, { kind: 'choice-noise' as const, factor: 0.5 }];
  const scenarios = stressScenarios(base, stress);
  const outcomes = scenarios.map((s) => {
    const simulator = createPowerSimulator(s);
    return { tally: simulator.run(0, s.replications), longestCalibrationDelay: simulator.longestCalibrationDelay };
  });
  const content = { spec: { ...spec, name: 'Stress design', priorSetId: 1, criterion: 'gap-product' as const }, prior: { ...prior, name: 'Prior' } };
  const result = runResult(scenarios, outcomes, { number: 3, hash: 'f'.repeat(64), content }, stress);

  it('reports power under each stress truth next to the assumed one', () => {
    expect(result.stress.map((s) => s.stress.kind)).toEqual(['delay-sensitivity', 'choice-noise']);
    expect(result.stress[0].summary.points.map((p) => p.n)).toEqual([10, 20, 40]);
    expect(runSeries('Run', result).map((s) => s.label)).toEqual(['Run (assumed truth)', 'Stress: s ~ U(0.4, 0.6)', 'Stress: noisier choices (γ × 0.5)']);
  });

  it('quantifies the extrapolation risk from the simulation, not from a fixed rule', () => {
    const risk = result.summary.warnings.find((w) => w.kind === 'extrapolation-risk');
    const outside = 1 - result.stress[0].summary.points[2].probesInTrueZone;
    expect(risk?.message).toContain(`Under delay sensitivity drawn from U(0.4, 0.6), ${(Math.round(outside * 1000) / 10).toFixed(1)} % of probe pairs fell outside`);
  });

  it('names every stress truth and the Monte Carlo error in the method paragraph when there are fewer than 1,000 replications', () => {
    expect(result.methodText).toContain('2 stress truth(s)');
    expect(result.methodText).toContain('delay sensitivity s drawn per participant from U(0.4, 0.6)');
    expect(result.methodText).toContain('noisier choices (γ × 0.5)');
    expect(result.methodText).toMatch(/fewer than 1,000 replicates \(60\), each power value carries a Monte Carlo standard error of up to \d+\.\d percentage points/);
    expect(monteCarloNote(result, 60)).toMatch(/Monte Carlo standard error up to ±\d+\.\d percentage points/);
    expect(monteCarloNote(result, 1000)).toBeNull();
    expect(runNotes({ test: { kind: 'sign', alpha: 0.05, alternative: 'greater' }, replications: 60 }, result)).toHaveLength(1);
  });

  it('reads a run saved before stress truths existed as a run without them', () => {
    const spec0 = { designVersionId: 1, label: '', truth, calibration: 'simulated' as const, test: base.test, sampleSizes: [10], replications: 10, seed: 1 };
    expect(buildScenarios(spec0 as never, content)).toHaveLength(1);
    expect(runSeries('Old run', { summary: result.summary } as never).map((s) => s.label)).toEqual(['Old run']);
  });
});

describe('the extrapolation risk of a frozen design, computed by simulation', () => {
  const content = { spec: { ...spec, name: 'Risk design', priorSetId: 1, criterion: 'gap-product' as const }, prior: { ...prior, name: 'Prior' } };

  it('grows as true delay sensitivity falls further below the 1 the design assumes, and says so in numbers', async () => {
    const { extrapolationRisk } = await import('@/lib/shared/power-scenario');
    const mild = extrapolationRisk(content, { low: 0.9, high: 1, participants: 300, seed: 3 })!;
    const strong = extrapolationRisk(content, { low: 0.3, high: 0.5, participants: 300, seed: 3 })!;
    expect(strong.outside).toBeGreaterThan(mild.outside + 0.1);
    expect(strong.outside).toBeGreaterThan(strong.outsideAssumed);
    expect(strong.outsideAssumed).toBe(mild.outsideAssumed); // same seed, same assumed truth
    expect(strong.message).toContain(`Under delay sensitivity drawn from U(0.3, 0.5), ${(Math.round(strong.outside * 1000) / 10).toFixed(1)} % of probe pairs would fall outside the true reversal zone`);
  });

  it('is not computed for a population design, which has no calibration block', async () => {
    const { extrapolationRisk } = await import('@/lib/shared/power-scenario');
    expect(extrapolationRisk({ ...content, spec: { ...content.spec, mode: 'population' } })).toBeNull();
  });
});
