// The one frozen design of the tests and benchmarks (valid per frozenDesignSchema): a personalised
// hyperbolic design with a small calibration block. Each test overrides only the fields it is about.
import { frozenDesignSchema, type FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerScenario } from '@/lib/design/power/types';

export function frozenDesign(spec: Partial<FrozenDesign['spec']> = {}, prior: Partial<FrozenDesign['prior']> = {}): FrozenDesign {
  return frozenDesignSchema.parse({
    spec: {
      name: 'Unit design',
      priorSetId: 1,
      model: { id: 'hyperbolic' },
      ratio: 0.6,
      largeAmount: 100,
      currency: 'EUR',
      mode: 'personalised',
      soonDelay: { mode: 'fixed', days: 14 },
      lateDelayLimit: 730,
      probePairs: 2,
      lateAnchors: 1,
      soonAnchors: 1,
      criterion: 'gap-product',
      calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 180 },
      ...spec,
    },
    prior: { name: 'Unit prior', medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.5, ...prior },
  });
}

/** The prior of the power tests and benchmarks: wide, strongly correlated rates. */
export const POWER_PRIOR = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.8 };

/** The design of the power tests and benchmarks: four probe pairs at a 30-day soon delay, two anchors of each kind. */
export function powerDesign(spec: Partial<FrozenDesign['spec']> = {}): FrozenDesign {
  return frozenDesign(
    {
      name: 'Harbourlight bonus timing',
      ratio: 0.82,
      soonDelay: { mode: 'fixed', days: 30 },
      lateDelayLimit: 9131,
      probePairs: 4,
      lateAnchors: 2,
      soonAnchors: 2,
      calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 365 },
      ...spec,
    },
    { ...POWER_PRIOR, name: 'Pilot prior' },
  );
}

/** A content hash for tests that need one (any 64 hex digits). */
export const HASH = 'a1b2c3d4e5f60718293a4b5c6d7e8f90a1b2c3d4e5f60718293a4b5c6d7e8f90';

/** A small S1-like power scenario (powerDesign, hyperbolic truth, McNemar) for tests that run it on threads. */
export function smallPowerScenario(options: { replications: number; seed: number }): PowerScenario {
  return {
    design: { spec: powerDesign().spec, prior: POWER_PRIOR, soonDelay: 30 },
    truth: { model: { id: 'hyperbolic' }, prior: POWER_PRIOR, gamma: 10, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
    sampleSizes: [20, 40],
    ...options,
  };
}
