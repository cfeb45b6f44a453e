// Scenario S1 of the power simulation, run as the app runs it (worker threads, chunks):
// hyperbolic assumed and true; ln kSmall ~ N(ln 0.02, 1), ln kLarge ~ N(ln 0.008, 1),
// correlation 0.8; ratio 0.82; large amount 100; soon delay 30 days; personalised design with
// a simulated calibration block of 20 items per magnitude (1 to 365 days) re-estimated per
// participant; γ = 10 per large amount, ε = 0.02; 4 probe pairs, 2 late and 2 soon anchors;
// exact McNemar, one-sided, α = 0.05; N = 20, 40, …, 200; 2,000 replications; seed 1.
// Target: the whole curve in 5 s or less on a 2-core machine.
import { summarisePower, type PowerScenario } from '@/lib/design/power';
import { defaultWorkerCount, runScenario } from '@/lib/server/jobs/power/run-scenario';
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

export async function runPowerBench(): Promise<void> {
  const workers = defaultWorkerCount();
  const started = performance.now();
  const outcome = await runScenario(S1, { workers });
  const seconds = (performance.now() - started) / 1000;
  if (!outcome) throw new Error('S1 did not finish');
  const summary = summarisePower(S1, outcome.tally, outcome.longestCalibrationDelay);
  console.log(`\nPower simulation S1 (${S1.replications} replications, ${workers} worker threads, including their start-up)`);
  console.log(`  whole curve: ${seconds.toFixed(2)} s (target ≤ 5 s)`);
  for (const p of summary.points) {
    console.log(`  N = ${String(p.n).padStart(3)}: power ${(100 * p.power).toFixed(1)} % (Wilson 95 % ${(100 * p.lower).toFixed(1)}–${(100 * p.upper).toFixed(1)} %), mean reversals ${p.meanReversals.toFixed(2)}`);
  }
}
