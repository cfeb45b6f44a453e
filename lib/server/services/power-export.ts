import { recordsToCsv } from '@/lib/shared/csv';
import { embeddedFontCss } from '@/lib/server/figures/embedded-font';
import { figurePng } from '@/lib/server/figures/png';
import { powerCurveSvg, type PowerFigureOptions, type PowerSeries } from '@/lib/shared/figures/power-curve';
import { stressLegend } from '@/lib/design/power';
import { PAIR_ROLES } from '@/lib/design/power/types';
import { runNotes, runSeries } from '@/lib/shared/power-figure';
import { finishedResult, type PowerRunDto, type PowerResultDto } from './power-runs';

export const EXPORT_FORMATS = ['svg', 'png', 'csv', 'json'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

/** A run's label for legends and file names: its own label, else the design and version. */
export function runLabel(run: PowerRunDto): string {
  return run.label || `${run.design.name} v${run.design.number}`;
}

function series(run: PowerRunDto, result: PowerResultDto): PowerSeries {
  return { label: runLabel(run), points: result.summary.points };
}

/** The figure of one run (its assumed truth and each stress truth), or of several runs on one chart (the first gives the title). */
export function runFigureSvg(runs: Array<{ run: PowerRunDto; result: PowerResultDto }>, extra: Pick<PowerFigureOptions, 'fontCss'> = {}): string {
  const first = runs[0];
  const caption =
    runs.length === 1
      ? `${first.run.spec.replications} replications, seed ${first.run.spec.seed}; ${first.result.software}; design ${first.run.design.hash.slice(0, 12)}.`
      : `${first.result.software}.`;
  const notes = [...new Set(runs.flatMap((r) => runNotes(r.run.spec, r.result)))];
  return powerCurveSvg(runs.length === 1 ? runSeries(runLabel(first.run), first.result) : runs.map((r) => series(r.run, r.result)), {
    title: runs.length === 1 ? `Power: ${runLabel(first.run)}` : 'Power: compared runs',
    caption,
    notes,
    ...extra,
  });
}

/**
 * CSV, one row per truth and sample size (the assumed truth first, then each stress truth):
 * power, interval, Monte Carlo standard error, mean reversals, pattern shares per role, flags,
 * and the truth's choice sensitivity γ per unit of the larger amount; `calibration` says whether
 * the row simulates the design's own calibration ('design') or, in a run comparing calibrations,
 * the other one ('other', described in the JSON and the method text). Every cell goes through
 * the formula guard.
 */
export function runCsv(run: PowerRunDto, result: PowerResultDto): string {
  const replicates = result.summary.replicates;
  const own = [
    { truth: 'assumed', gamma: run.spec.truth.gamma, summary: result.summary, calibration: 'design' },
    ...(result.stress ?? []).map((s) => ({ truth: stressLegend(s.stress), gamma: s.stress.kind === 'choice-noise' ? run.spec.truth.gamma * s.stress.factor : run.spec.truth.gamma, summary: s.summary, calibration: 'design' })),
  ];
  // a run comparing calibrations: the same truths again with the design's other calibration
  const other = (result.calibrationComparison?.rows ?? []).map((r, i) => ({ ...own[i], summary: r.other, calibration: 'other' }));
  const curves = [...own, ...other];
  const rows = curves.flatMap((curve) =>
    curve.summary.points.map((p) => {
      const row: Record<string, number | string> = {
        truth: curve.truth,
        n: p.n,
        power: p.power,
        wilson_lower: p.lower,
        wilson_upper: p.upper,
        monte_carlo_se: Math.sqrt((p.power * (1 - p.power)) / replicates),
        rejections: p.rejections,
        replicates,
        mean_reversals_per_participant: p.meanReversals,
      };
      for (const role of PAIR_ROLES) for (const pattern of ['LL', 'LS', 'SL', 'SS'] as const) row[`${role}_${pattern}`] = p.patterns[role][pattern];
      row.flagged_share = p.flaggedShare;
      row.fallback_share = p.fallbackShare;
      row.probes_in_true_zone = p.probesInTrueZone;
      row.choice_sensitivity_per_larger_amount = curve.gamma;
      row.test = run.spec.test.kind;
      row.design_hash = run.design.hash;
      row.seed = run.spec.seed;
      row.calibration = curve.calibration;
      return row;
    }),
  );
  return recordsToCsv({ records: rows });
}

/** Everything a reader needs to check a run: spec, design, results, method text, software. */
export function runJson(run: PowerRunDto, result: PowerResultDto) {
  return {
    run: { id: run.id, label: run.label, createdAt: run.createdAt, finishedAt: run.finishedAt, engineVersion: run.engineVersion },
    design: run.design,
    spec: run.spec,
    soonDelay: result.soonDelay,
    software: result.software,
    summary: result.summary,
    stress: result.stress ?? [],
    ...(result.calibrationComparison ? { calibrationComparison: result.calibrationComparison } : {}),
    methodText: result.methodText,
  };
}

/** The body, content type and file name of a download. */
export async function exportRun(studyId: number, runId: number, format: ExportFormat, compareWith: number[] = []) {
  const main = await finishedResult(studyId, runId);
  const base = `power-run-${runId}`;
  if (format === 'csv') return { body: runCsv(main.run, main.result), type: 'text/csv; charset=utf-8', file: `${base}.csv` };
  if (format === 'json') return { body: JSON.stringify(runJson(main.run, main.result), null, 2), type: 'application/json', file: `${base}.json` };
  const others = await Promise.all(compareWith.filter((id) => id !== runId).map((id) => finishedResult(studyId, id)));
  const name = others.length ? `${base}-compared` : base;
  // the SVG download carries its font, so it renders in Source Sans 3 wherever it is opened; the PNG renderer has the font files
  if (format === 'svg') return { body: runFigureSvg([main, ...others], { fontCss: embeddedFontCss() }), type: 'image/svg+xml', file: `${name}.svg` };
  return { body: figurePng(runFigureSvg([main, ...others])), type: 'image/png', file: `${name}.png` };
}
