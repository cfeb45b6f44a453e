import { optimiseLateDelay } from '@/lib/design/optimiseLateDelay';
import { locateFor } from './item-bank-plan';
import { describeStress, methodText, POWER_ENGINE_VERSION, stressScenarios, summarisePower, type PowerSummary, type PowerTally, type PowerWarning, type StressTruth } from '@/lib/design/power';
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

/** The engine's scenarios of a run: the assumed truth first, then one per stress truth (runs saved before stress truths have none). */
export function buildScenarios(spec: PowerRunSpec, content: FrozenDesign): PowerScenario[] {
  return stressScenarios(buildScenario(spec, content), spec.stress ?? []);
}

/** Power under one stress truth, as a finished run stores it. */
export type StressResult = { stress: StressTruth; label: string; summary: PowerSummary };

export type PowerRunResult = { summary: PowerSummary; methodText: string; software: string; soonDelay: number; stress: StressResult[] };

/**
 * What a finished run stores as its result: the summary under the assumed truth, one per
 * stress truth, the method paragraph, the software and the soon delay used. Under a stress
 * truth that draws delay sensitivity below 1, the share of probe pairs outside the true zone is
 * reported as a warning of the assumed summary: the extrapolation risk, simulated, not a rule.
 */
export function runResult(
  scenarios: readonly PowerScenario[],
  outcomes: ReadonlyArray<{ tally: PowerTally; longestCalibrationDelay: number | null }>,
  version: { number: number; hash: string; content: FrozenDesign },
  stress: readonly StressTruth[] = [],
): PowerRunResult {
  const summary = summarisePower(scenarios[0], outcomes[0].tally, outcomes[0].longestCalibrationDelay);
  const stressed = stress.map((s, i): StressResult => ({
    stress: s,
    label: describeStress(s),
    summary: summarisePower(scenarios[i + 1], outcomes[i + 1].tally, outcomes[i + 1].longestCalibrationDelay),
  }));
  summary.warnings.push(...stressWarnings(summary, stressed));
  const text = methodText(
    scenarios[0],
    summary,
    { software: POWER_SOFTWARE, designLabel: `${version.content.spec.name}, frozen version ${version.number}`, designHash: version.hash },
    stressed,
  );
  return { summary, methodText: text, software: POWER_SOFTWARE, soonDelay: scenarios[0].design.soonDelay, stress: stressed };
}

function pct(v: number): string {
  return `${(Math.round(v * 1000) / 10).toFixed(1)} %`;
}

function stressWarnings(assumed: PowerSummary, stressed: readonly StressResult[]): PowerWarning[] {
  const warnings: PowerWarning[] = [];
  const last = assumed.points[assumed.points.length - 1];
  for (const s of stressed) {
    const point = s.summary.points[s.summary.points.length - 1];
    if (s.stress.kind === 'delay-sensitivity') {
      warnings.push({
        kind: 'extrapolation-risk',
        message:
          `Under delay sensitivity drawn from U(${s.stress.low}, ${s.stress.high}), ${pct(1 - point.probesInTrueZone)} of probe pairs fell outside the participants' true reversal zone ` +
          `(${pct(1 - last.probesInTrueZone)} under the assumed truth; simulated at N = ${point.n}).`,
      });
    }
    if (last.power - point.power > 0.1) {
      warnings.push({ kind: 'stress', message: `Under ${s.label}, power at N = ${point.n} drops to ${pct(point.power)} (assumed truth: ${pct(last.power)}).` });
    }
  }
  return warnings;
}
