// A frozen design for the pure item-bank tests (valid per frozenDesignSchema).
import { frozenDesignSchema, type FrozenDesign } from '@/lib/shared/validations/planner';

export function design(spec: Partial<FrozenDesign['spec']> = {}, prior: Partial<FrozenDesign['prior']> = {}): FrozenDesign {
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

export const HASH = 'a1b2c3d4e5f60718293a4b5c6d7e8f90a1b2c3d4e5f60718293a4b5c6d7e8f90';
