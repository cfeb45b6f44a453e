// Property of issue 15: calibration delays spanning the probes, with delay sensitivity s estimated in
// stage 1, put more probe pairs inside the participants' true reversal zones than today's calibration
// block when true s is below 1 (docs/mathematics.md, "Calibration that spans the probes").
import { describe, expect, it } from 'vitest';
import { calibrationVariant, createPowerSimulator, stressScenarios, type PowerScenario } from '@/lib/design/power';
import { POWER_PRIOR, powerDesign } from '../support/frozen-design';

const REPLICATES = 10;
const N = 100;

/**
 * The known way to miss the zone: calibration delays of 1 to 30 days, probes months to years out, and
 * true s drawn per participant from U(0.4, 0.9) under the power-delay hyperbola (the stress truth of a
 * hyperbolic design). Choices are less noisy than the default (γ = 30 in design and truth), the regime in
 * which 20 items per magnitude can place s; seeds fixed.
 */
function scenario(seed: number): PowerScenario {
  const spec = { ...powerDesign().spec, choiceSensitivity: 30, calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30 } };
  const base: PowerScenario = {
    design: { spec, prior: POWER_PRIOR, soonDelay: 30 },
    truth: { model: { id: 'hyperbolic' }, prior: POWER_PRIOR, gamma: 30, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind: 'sign', alpha: 0.05, alternative: 'greater' },
    sampleSizes: [N],
    replications: REPLICATES,
    seed,
  };
  return stressScenarios(base, [{ kind: 'delay-sensitivity', low: 0.4, high: 0.9 }])[1];
}

function shareInZone(s: PowerScenario): number {
  const tally = createPowerSimulator(s).run(0, s.replications);
  return tally.probesInTrueZone[0] / tally.patterns.probe[0].reduce((a, b) => a + b, 0);
}

describe('calibration spanning the probes with s estimated', () => {
  it.each([1, 2, 3])('puts a larger share of probe pairs inside the true zone than today’s block under s ~ U(0.4, 0.9) (seed %i, 10 replicates of 100 participants)', (seed) => {
    const today = scenario(seed);
    const spanning = calibrationVariant(today);
    expect(spanning.design.spec.calibration).toMatchObject({ placement: 'span-probes', fit: 'power-delay' });
    const before = shareInZone(today);
    const after = shareInZone(spanning);
    // measured (seeds 1, 2, 3): 44.2 → 48.9 %, 41.2 → 46.7 %, 42.1 → 46.6 %. Each arm has 1,000 participants × 4 probes;
    // the binomial SE of a share near 0.45 over 4,000 pairs is 0.008 (larger when clustered by participant), so asking for
    // 2 points more keeps clear of noise while staying well below the measured gain of 4.6 to 5.5 points
    expect(after).toBeGreaterThan(before + 0.02);
  });
});
