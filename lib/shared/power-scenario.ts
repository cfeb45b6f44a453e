import { optimiseLateDelay } from '@/lib/design/optimiseLateDelay';
import { locateFor } from './item-bank-plan';
import { calibrationLabel, calibrationVariant, createPowerSimulator, describeStress, methodText, POWER_ENGINE_VERSION, STRESS_DEFAULTS, stressScenarios, summarisePower, type PowerSummary, type PowerTally, type PowerWarning, type StressTruth } from '@/lib/design/power';
import type { PowerScenario } from '@/lib/design/power/types';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { assumedTruth, type PowerRunSpec } from '@/lib/shared/validations/power';
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

/** What of a run spec the engine's scenario reads (a saved run's spec, or the design page's preview). */
export type ScenarioSettings = Pick<PowerRunSpec, 'truth' | 'calibration' | 'test' | 'sampleSizes' | 'replications' | 'seed'>;

/** The engine's scenario for a run spec and the frozen design it cites (or the draft a preview simulates). */
export function buildScenario(spec: ScenarioSettings, content: FrozenDesign): PowerScenario {
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

/** Whether a run also simulates its design's other calibration: asked for, on a personalised design with a simulated calibration block. */
export function comparesCalibration(spec: PowerRunSpec, content: FrozenDesign): boolean {
  return spec.compareCalibration === true && spec.calibration === 'simulated' && content.spec.mode === 'personalised';
}

/**
 * The engine's scenarios of a run: the assumed truth first, then one per stress truth (runs
 * saved before stress truths have none); when the run compares calibrations, the same truths
 * again with the design's other calibration (calibrationVariant).
 */
export function buildScenarios(spec: PowerRunSpec, content: FrozenDesign): PowerScenario[] {
  const own = stressScenarios(buildScenario(spec, content), spec.stress ?? []);
  return comparesCalibration(spec, content) ? [...own, ...own.map(calibrationVariant)] : own;
}

/** Power under one stress truth, as a finished run stores it. */
export type StressResult = { stress: StressTruth; label: string; summary: PowerSummary };

/**
 * The design's own calibration next to its other one (calibrationVariant), truth by truth (the
 * assumed truth first, then the stress truths in order).
 */
export type RunCalibrationComparison = {
  own: string;
  other: string;
  rows: Array<{ truth: string; own: PowerSummary; other: PowerSummary }>;
};

export type PowerRunResult = { summary: PowerSummary; methodText: string; software: string; soonDelay: number; stress: StressResult[]; calibrationComparison?: RunCalibrationComparison };

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
  const truths = 1 + stress.length;
  let calibrationComparison: RunCalibrationComparison | undefined;
  let comparisonText = '';
  if (scenarios.length === 2 * truths) {
    const summaries = scenarios.map((scenario, i) => (i === 0 ? summary : i < truths ? stressed[i - 1].summary : summarisePower(scenario, outcomes[i].tally, outcomes[i].longestCalibrationDelay)));
    calibrationComparison = {
      own: calibrationLabel(scenarios[0]),
      other: calibrationLabel(scenarios[truths]),
      rows: Array.from({ length: truths }, (_, i) => ({ truth: i === 0 ? 'the assumed truth' : stressed[i - 1].label, own: summaries[i], other: summaries[truths + i] })),
    };
    comparisonText = ` ${comparisonParagraph(calibrationComparison)}`;
  }
  return { summary, methodText: text + comparisonText, software: POWER_SOFTWARE, soonDelay: scenarios[0].design.soonDelay, stress: stressed, ...(calibrationComparison ? { calibrationComparison } : {}) };
}

/** The comparison of calibrations in one paragraph: power and probes inside the true zone at the largest N under each truth. */
function comparisonParagraph(c: RunCalibrationComparison): string {
  const at = (s: PowerSummary) => s.points[s.points.length - 1];
  const n = at(c.rows[0].own).n;
  const rows = c.rows.map(
    (r) => `under ${r.truth}, power ${pct(at(r.own).power)} against ${pct(at(r.other).power)} and probes inside the true zone ${pct(at(r.own).probesInTrueZone)} against ${pct(at(r.other).probesInTrueZone)}`,
  );
  return (
    `The same truths were simulated with the design's other calibration (${c.other}) beside its own (${c.own}), with the same seed; at N = ${n}: ${rows.join('; ')}.`
  );
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

/** The extrapolation risk of a frozen design, computed by simulation (extrapolationRisk). */
export type ExtrapolationRisk = {
  low: number;
  high: number;
  participants: number;
  /** share of probe pairs outside the participant's true reversal zone under the stress */
  outside: number;
  /** the same share when the truth is as the design assumes */
  outsideAssumed: number;
  message: string;
};

/**
 * How often a personalised design's probe pairs would miss the true reversal zone when true
 * delay sensitivity is below 1, computed rather than judged by a delay ratio: `participants`
 * simulated people (seeded) answer the design's calibration block under the design's truth
 * with s drawn from U(low, high) (stressTruth 'delay-sensitivity'), their rates are
 * re-estimated as the probe-items API does, their probes are built from the estimates, and the
 * share of probe pairs outside each person's true zone is counted; the same under the truth
 * the design assumes is given beside it. Null for population designs (no calibration block).
 */
export function extrapolationRisk(
  content: FrozenDesign,
  options: { low?: number; high?: number; participants?: number; seed?: number } = {},
): ExtrapolationRisk | null {
  if (content.spec.mode !== 'personalised') return null;
  const low = options.low ?? STRESS_DEFAULTS['delay-sensitivity'].low;
  const high = options.high ?? STRESS_DEFAULTS['delay-sensitivity'].high;
  const participants = options.participants ?? 400;
  const spec = {
    designVersionId: 1,
    label: '',
    truth: assumedTruth(content),
    calibration: 'simulated' as const,
    stress: [],
    test: { kind: 'sign' as const, alpha: 0.05, alternative: 'greater' as const },
    sampleSizes: [participants],
    replications: 1,
    seed: options.seed ?? 1,
  };
  const [assumed, stressed] = stressScenarios(buildScenario(spec, content), [{ kind: 'delay-sensitivity', low, high }]);
  const outsideShare = (scenario: PowerScenario) => {
    const tally = createPowerSimulator(scenario).run(0, 1);
    const pairs = tally.patterns.probe[0].reduce((a, b) => a + b, 0);
    return pairs > 0 ? 1 - tally.probesInTrueZone[0] / pairs : 0;
  };
  const outside = outsideShare(stressed);
  const outsideAssumed = outsideShare(assumed);
  return {
    low,
    high,
    participants,
    outside,
    outsideAssumed,
    message:
      `Under delay sensitivity drawn from U(${low}, ${high}), ${pct(outside)} of probe pairs would fall outside the true reversal zone ` +
      `(${pct(outsideAssumed)} when delay sensitivity is 1, as the design assumes); simulated for ${participants} participants answering this calibration block, ` +
      'rates re-estimated as the probe-items API does.',
  };
}
