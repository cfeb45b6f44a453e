import { optimiseLateDelay } from '@/lib/design/optimiseLateDelay';
import { locateFor } from './item-bank-plan';
import { methodText, POWER_ENGINE_VERSION, summarisePower, type PowerSummary, type PowerTally } from '@/lib/design/power';
import type { PowerScenario } from '@/lib/design/power/types';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerRunSpec } from '@/lib/shared/validations/power';
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

/** What a finished run stores as its result: the summary, the method paragraph, the software and the soon delay used. */
export function runResult(
  scenario: PowerScenario,
  outcome: { tally: PowerTally; longestCalibrationDelay: number | null },
  version: { number: number; hash: string; content: FrozenDesign },
): { summary: PowerSummary; methodText: string; software: string; soonDelay: number } {
  const summary = summarisePower(scenario, outcome.tally, outcome.longestCalibrationDelay);
  const text = methodText(scenario, summary, {
    software: POWER_SOFTWARE,
    designLabel: `${version.content.spec.name}, frozen version ${version.number}`,
    designHash: version.hash,
  });
  return { summary, methodText: text, software: POWER_SOFTWARE, soonDelay: scenario.design.soonDelay };
}
