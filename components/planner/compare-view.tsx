'use client';

import { useMemo } from 'react';
import { CHART_COLOURS, drawLineChart, type LineChartSpec } from '@/components/charts/draw-line-chart';
import { drawBarChart, type BarChartSpec } from '@/components/charts/draw-bar-chart';
import { D3Chart } from '@/components/charts/d3-chart';
import { Table, Td, Th } from '@/components/ui/table';
import type { DesignDto, PriorSetDto } from '@/lib/client/planner';
import { compareRows, type CompareRow } from '@/lib/shared/planner/compare';
import { MODEL_IDS } from '@/lib/design';
import { fmtDays, fmtShare, fmtSmallRow } from '@/lib/shared/planner/format';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { DesignSummary, PlannerInput } from '@/lib/shared/planner/types';
import { CRITERION_LABELS, MODEL_LABELS } from './labels';
import { TermHelp } from '@/components/glossary/term-help';

/** Rows whose label gets a help button, and the glossary entry it opens. */
const ROW_TERMS: Record<string, string> = {
  'zone-width': 'reversal-zone',
  'gap-product': 'gap-product',
  'reversal-own': 'expected-reversal-rate',
  'late-clarity': 'anchor-clarity',
  'soon-clarity': 'anchor-clarity',
  'models-told-apart': 'model-discrimination',
};

/** One number format for every value of a row. */
function rowFormat(row: CompareRow): (v: number | null) => string {
  if (row.unit === 'days') return fmtDays;
  if (row.unit.startsWith('share')) return fmtShare;
  return fmtSmallRow(row.values);
}

/** Side-by-side table (best value per row highlighted) and overlaid gap-product curves for 2–4 designs. */
export function CompareView({ designs, priors }: { designs: DesignDto[]; priors: PriorSetDto[] }) {
  const computed = useMemo(() => {
    const inputs: PlannerInput[] = [];
    const summaries: DesignSummary[] = [];
    const problems: string[] = [];
    for (const d of designs) {
      const prior = priors.find((p) => p.id === d.spec.priorSetId);
      if (!prior) {
        problems.push(`${d.name}: its prior set no longer exists.`);
        continue;
      }
      try {
        const input = { spec: d.spec, prior: prior.values };
        summaries.push(computeDesignSummary(input));
        inputs.push(input);
      } catch (error) {
        problems.push(`${d.name}: ${(error as Error).message}`);
      }
    }
    return { inputs, summaries, problems, rows: inputs.length ? compareRows(inputs, summaries) : [] };
  }, [designs, priors]);
  const shown = designs.filter((d) => priors.some((p) => p.id === d.spec.priorSetId));

  const overlay = useMemo<LineChartSpec>(
    () => ({
      title: 'Gap product against the late delay, typical participant of each design',
      series: computed.summaries.flatMap((s, i) => (s.gapCurve ? [{ label: shown[i]?.name ?? `design ${i + 1}`, x: s.gapCurve.lateDelays, y: s.gapCurve.values, colour: CHART_COLOURS[i % CHART_COLOURS.length], dashed: i % 2 === 1 }] : [])),
      xScale: 'log',
      xLabel: 'late delay D (days, log scale)',
      yLabel: 'gap product (× L²)',
      yFormat: (v) => v.toExponential(1),
    }),
    [computed.summaries, shown],
  );

  const robustnessBars = useMemo<BarChartSpec>(
    () => ({
      title: 'Expected reversal rate of each design when choices follow each model',
      groups: MODEL_IDS.map((id) => MODEL_LABELS[id].replace(/ \(.*\)$/, '')),
      series: computed.summaries.map((_, i) => ({
        label: shown[i]?.name ?? `design ${i + 1}`,
        values: MODEL_IDS.map((id) => computed.rows.find((r) => r.key === `reversal-${id}`)?.values[i] ?? null),
      })),
      yLabel: 'expected reversal rate',
      yFormat: (v) => `${Math.round(v * 100)}%`,
    }),
    [computed, shown],
  );

  return (
    <div className="space-y-6">
      {computed.problems.map((p) => (
        <p key={p} className="text-sm text-danger-700">
          {p}
        </p>
      ))}
      <Table caption="Designs side by side">
        <thead className="bg-paper-sunk">
          <tr>
            <Th>Row</Th>
            {shown.map((d) => (
              <Th key={d.id} className="normal-case">
                {d.name}
                <span className="block font-normal text-ink-faint">
                  {MODEL_LABELS[d.spec.model.id]} · {d.spec.mode} · {CRITERION_LABELS[d.spec.criterion]}
                </span>
              </Th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-ink/10" data-testid="compare-table">
          {computed.rows.map((row) => {
            const fmt = rowFormat(row);
            return (
              <tr key={row.key} data-row={row.key}>
                <Td>
                  {ROW_TERMS[row.key] ? <TermHelp id={ROW_TERMS[row.key]}>{row.label}</TermHelp> : row.label}
                  {row.unit ? <span className="block text-xs text-ink-faint">{row.unit}</span> : null}
                  {row.note ? <span className="block max-w-xs text-xs text-ink-soft">{row.note}</span> : null}
                </Td>
                {row.values.map((v, i) => (
                  <Td key={i} className={`tabular-nums ${row.best.includes(i) ? 'bg-teal-50 font-semibold text-teal-700' : ''}`} data-best={row.best.includes(i) ? 'true' : undefined}>
                    {fmt(v)}
                  </Td>
                ))}
              </tr>
            );
          })}
          <tr>
            <Td>Warnings</Td>
            {computed.summaries.map((s, i) => (
              <Td key={i} className="text-xs">
                {s.warnings.length ? s.warnings.map((w) => <p key={w.message}>{w.message}</p>) : 'none'}
              </Td>
            ))}
          </tr>
        </tbody>
      </Table>
      <p className="text-xs text-ink-soft">
        Highlighted: the best value in each row where a direction makes sense. Robustness rows keep each design’s delays and let choices follow another model
        (s = 0.8 and β = 0.9 unless the design sets them). Zone bounds and gap products are for the typical participant (the prior’s median rates). Personalised designs are scored as if the calibration block recovered each participant’s rates exactly, which flatters them next to population designs; the power simulation drops that assumption.
      </p>
      <div className="grid gap-6 xl:grid-cols-2">
        <div>
          <h3 className="text-sm font-semibold">Gap product against late delay (typical participant)</h3>
          <D3Chart draw={drawLineChart} spec={overlay} testId="compare-chart" />
        </div>
        <div>
          <h3 className="text-sm font-semibold">Robustness: expected reversal rate if choices follow each model</h3>
          <D3Chart draw={drawBarChart} spec={robustnessBars} testId="compare-robustness-chart" />
        </div>
      </div>
    </div>
  );
}
