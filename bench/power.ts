// Scenario S1 of the power simulation, run as the app runs it (worker threads, chunks):
// hyperbolic assumed and true; ln kSmall ~ N(ln 0.02, 1), ln kLarge ~ N(ln 0.008, 1),
// correlation 0.8; ratio 0.82; large amount 100; soon delay 30 days; personalised design with
// a simulated calibration block of 20 items per magnitude (1 to 365 days) re-estimated per
// participant; γ = 10 per large amount, ε = 0.02; 4 probe pairs, 2 late and 2 soon anchors;
// exact McNemar, one-sided, α = 0.05; N = 20, 40, …, 200; 2,000 replications; seed 1.
// Target: the whole curve in 1.5 s or less on a 2-core machine.
// S1 + stress: the same with two stress truths added (delay sensitivity s ~ U(0.4, 0.9) per
// participant, and choices half as sensitive, γ × 0.5): three curves, 6,000 replicates in all.
// Target: the whole run in 5 s or less on a 2-core machine.
// S1 + stress, calibration compared: the same three truths again with calibration delays spanning
// the probes and delay sensitivity estimated in stage 1 (power-delay hyperbola): six curves. No
// target; it shows what the other calibration costs in time and buys in probes inside the zone.
import { summarisePower, type PowerScenario } from '@/lib/design/power';
import { calibrationVariant, stressScenarios, type StressTruth } from '@/lib/design/power';
import { defaultWorkerCount, runScenario, runScenarios } from '@/lib/server/jobs/power/run-scenario';
import { POWER_PRIOR, powerDesign } from '../tests/support/frozen-design';

const prior = POWER_PRIOR;

export const S1: PowerScenario = {
  design: { spec: powerDesign().spec, prior, soonDelay: 30 },
  truth: { model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0.02 },
  calibration: 'simulated',
  test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
  sampleSizes: [20, 40, 60, 80, 100, 120, 140, 160, 180, 200],
  replications: 2000,
  seed: 1,
};

export const S1_STRESS: StressTruth[] = [
  { kind: 'delay-sensitivity', low: 0.4, high: 0.9 },
  { kind: 'choice-noise', factor: 0.5 },
];

export async function runPowerBench(): Promise<void> {
  const workers = defaultWorkerCount();
  const started = performance.now();
  const outcome = await runScenario(S1, { workers });
  const seconds = (performance.now() - started) / 1000;
  if (!outcome) throw new Error('S1 did not finish');
  const summary = summarisePower(S1, outcome.tally, outcome.longestCalibrationDelay);
  console.log(`\nPower simulation S1 (${S1.replications} replications, ${workers} worker threads, including their start-up)`);
  console.log(`  whole curve: ${seconds.toFixed(2)} s (target ≤ 1.5 s)`);
  for (const p of summary.points) {
    console.log(`  N = ${String(p.n).padStart(3)}: power ${(100 * p.power).toFixed(1)} % (Wilson 95 % ${(100 * p.lower).toFixed(1)}–${(100 * p.upper).toFixed(1)} %), mean reversals ${p.meanReversals.toFixed(2)}`);
  }

  const scenarios = stressScenarios(S1, S1_STRESS);
  const startedStress = performance.now();
  const outcomes = await runScenarios(scenarios, { workers });
  const secondsStress = (performance.now() - startedStress) / 1000;
  if (!outcomes) throw new Error('S1 with stress truths did not finish');
  console.log(`\nPower simulation S1 + 2 stress truths (3 × ${S1.replications} replications, ${workers} worker threads, including their start-up)`);
  console.log(`  whole run: ${secondsStress.toFixed(2)} s (target ≤ 5 s)`);
  const labels = ['assumed truth', ...S1_STRESS.map((s) => (s.kind === 'delay-sensitivity' ? `s ~ U(${s.low}, ${s.high})` : s.kind === 'choice-noise' ? `γ × ${s.factor}` : s.kind))];
  outcomes.forEach((outcome, i) => {
    const summary = summarisePower(scenarios[i], outcome.tally, outcome.longestCalibrationDelay);
    const at = (n: number) => summary.points.find((p) => p.n === n)!;
    const last = summary.points[summary.points.length - 1];
    console.log(
      `  ${labels[i].padEnd(16)} power at N = 20: ${(100 * at(20).power).toFixed(1)} %, N = 100: ${(100 * at(100).power).toFixed(1)} %, N = 200: ${(100 * last.power).toFixed(1)} %; ` +
        `probes in the true zone ${(100 * last.probesInTrueZone).toFixed(1)} %`,
    );
  });

  const compared = [...scenarios, ...scenarios.map(calibrationVariant)];
  const startedCompared = performance.now();
  const both = await runScenarios(compared, { workers });
  const secondsCompared = (performance.now() - startedCompared) / 1000;
  if (!both) throw new Error('S1 with calibration compared did not finish');
  console.log(`\nPower simulation S1 + 2 stress truths, calibration compared (6 × ${S1.replications} replications, ${workers} worker threads)`);
  console.log(`  whole run: ${secondsCompared.toFixed(2)} s (no target)`);
  labels.forEach((label, i) => {
    const last = (j: number) => {
      const summary = summarisePower(compared[j], both[j].tally, both[j].longestCalibrationDelay);
      return summary.points[summary.points.length - 1];
    };
    const own = last(i);
    const other = last(i + labels.length);
    console.log(
      `  ${label.padEnd(16)} probes in the true zone: today's block ${(100 * own.probesInTrueZone).toFixed(1)} %, spanning + s estimated ${(100 * other.probesInTrueZone).toFixed(1)} %; ` +
        `power at N = 200: ${(100 * own.power).toFixed(1)} % vs ${(100 * other.power).toFixed(1)} %`,
    );
  });
}
