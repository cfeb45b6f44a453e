import { stressLegend } from '@/lib/design/power';
import type { PowerSeries } from '@/lib/shared/figures/power-curve';
import type { PowerRunResult } from '@/lib/shared/power-scenario';
import { MONTE_CARLO_NOTE_BELOW, testWarning, type PowerRunSpec } from '@/lib/shared/validations/power';

/** Largest Monte Carlo standard error √(p(1 − p)/R) over every curve of a result. */
export function largestMonteCarloError(result: Pick<PowerRunResult, 'summary' | 'stress'>, replications: number): number {
  let worst = 0;
  for (const summary of [result.summary, ...(result.stress ?? []).map((s) => s.summary)]) {
    for (const p of summary.points) worst = Math.max(worst, Math.sqrt((p.power * (1 - p.power)) / replications));
  }
  return worst;
}

/** The Monte Carlo note a run with fewer than 1,000 replications carries; null otherwise. */
export function monteCarloNote(result: Pick<PowerRunResult, 'summary' | 'stress'>, replications: number): string | null {
  if (replications >= MONTE_CARLO_NOTE_BELOW) return null;
  return `Fewer than 1,000 replications (${replications}): Monte Carlo standard error up to ±${(100 * largestMonteCarloError(result, replications)).toFixed(1)} percentage points.`;
}

/**
 * The curves of one run's figure: power under the assumed truth, then under each stress truth,
 * as the results page draws them and the SVG and PNG downloads render them.
 */
export function runSeries(label: string, result: Pick<PowerRunResult, 'summary' | 'stress'>): PowerSeries[] {
  const stress = result.stress ?? [];
  return [
    { label: stress.length ? `${label} (assumed truth)` : label, points: result.summary.points },
    ...stress.map((s) => ({ label: `Stress: ${stressLegend(s.stress)}`, points: s.summary.points })),
  ];
}

/** The warning lines under a run's figure: the test's assumption and the Monte Carlo error. */
export function runNotes(spec: Pick<PowerRunSpec, 'test' | 'replications'>, result: Pick<PowerRunResult, 'summary' | 'stress'>): string[] {
  return [testWarning(spec.test.kind), monteCarloNote(result, spec.replications)].filter((n): n is string => n !== null);
}
