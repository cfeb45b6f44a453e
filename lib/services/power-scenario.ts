import { optimiseLateDelay } from '@/lib/design/optimiseLateDelay';
import { locateFor } from './item-bank-plan';
import { POWER_ENGINE_VERSION } from '@/lib/design/power';
import type { PowerScenario } from '@/lib/design/power/types';
import type { FrozenDesign } from '@/lib/validations/design';
import type { PowerRunSpec } from '@/lib/validations/power';
import packageJson from '@/package.json';

/** "Switchback 0.1.0 (power engine 1)": the software version every run and method text cites. */
export const POWER_SOFTWARE = `Switchback ${packageJson.version} (power engine ${POWER_ENGINE_VERSION})`;

/**
 * The soon delay the probe pairs use: the fixed one, or for a design that optimises it, the
 * whole day in [min, max] (at least 1) with the largest gap product at the prior medians.
 */
export function resolveSoonDelay(content: FrozenDesign): number {
  const { spec, prior } = content;
  if (spec.soonDelay.mode === 'fixed') return Math.max(1, spec.soonDelay.days);
  let best = Math.max(1, spec.soonDelay.min);
  let bestValue = -Infinity;
  for (let d = Math.max(1, spec.soonDelay.min); d <= Math.max(1, spec.soonDelay.max); d++) {
    const optimum = optimiseLateDelay({ model: spec.model, ratio: spec.ratio, soonDelay: d, kSmall: prior.medianSmall, kLarge: prior.medianLarge });
    if (optimum && optimum.gapProduct > bestValue) {
      bestValue = optimum.gapProduct;
      best = d;
    }
  }
  return best;
}

/** The engine's scenario for a run spec and the frozen design it cites. */
export function buildScenario(spec: PowerRunSpec, content: FrozenDesign): PowerScenario {
  const { name: _name, ...prior } = content.prior;
  // the item bank's design point (population designs: the optimised shared pairs)
  const point = locateFor(content)({ kSmall: prior.medianSmall, kLarge: prior.medianLarge }) ?? undefined;
  const soonDelay = point && content.spec.soonDelay.mode === 'optimised' ? point.soonDelay : resolveSoonDelay(content);
  return {
    design: { spec: content.spec, prior, soonDelay, designPoint: point },
    truth: { model: spec.truth.model, prior: spec.truth.prior, gamma: spec.truth.gamma, lapse: spec.truth.lapse },
    calibration: spec.calibration,
    test: spec.test,
    sampleSizes: spec.sampleSizes,
    replications: spec.replications,
    seed: spec.seed,
  };
}
