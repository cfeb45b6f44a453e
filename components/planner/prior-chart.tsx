'use client';

import { useMemo, useState } from 'react';
import { CHART_COLOURS, drawLineChart, type LineChartSpec } from '@/components/charts/draw-line-chart';
import { drawScatterChart, type ScatterSpec } from '@/components/charts/draw-scatter-chart';
import { D3Chart } from '@/components/charts/d3-chart';
import { SelectField, TextField } from '@/components/ui/field';
import { fmtShare } from '@/lib/shared/planner/format';
import { priorDraws } from '@/lib/shared/planner/points';
import { priorView } from '@/lib/shared/planner/prior-view';
import { modelOf } from '@/lib/shared/planner/summary';
import { MODEL_CHOICES, priorValuesSchema, type PriorValues } from '@/lib/shared/validations/planner';
import { MODEL_LABELS } from './labels';

/**
 * Live picture of a prior: 2,000 draws of (k, K) on log axes, coloured by whether a reversal is
 * possible under the chosen model, ratio and soon delay, the line where it becomes possible,
 * the share of the prior that can reverse, and the densities of both rates.
 */
export function PriorChart({ values }: { values: Partial<PriorValues> }) {
  const [modelId, setModelId] = useState<(typeof MODEL_CHOICES)[number]>('hyperbolic');
  const [ratio, setRatio] = useState(0.6);
  const [soonDelay, setSoonDelay] = useState(14);
  const [sensitivity, setSensitivity] = useState(1);
  const [presentBias, setPresentBias] = useState(0.9);
  const usesS = modelId === 'hyperboloid' || modelId === 'power-delay' || modelId === 'exponential-power';
  const { medianSmall, medianLarge, sdLogSmall, sdLogLarge, correlation } = values;
  const parsed = priorValuesSchema.safeParse({ medianSmall, medianLarge, sdLogSmall, sdLogLarge, correlation });
  const prior = parsed.success ? parsed.data : null;
  const key = prior ? JSON.stringify(prior) : '';
  // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the values, not the object identity
  const draws = useMemo(() => (prior ? priorDraws(prior) : null), [key]);
  const settingOk = ratio > 0 && ratio < 1 && soonDelay >= 0 && Number.isFinite(soonDelay) && sensitivity > 0 && sensitivity <= 5 && presentBias > 0 && presentBias <= 1;
  const view = useMemo(() => {
    if (!prior || !draws || !settingOk) return null;
    const model = modelOf({ model: { id: modelId, sensitivity, presentBias } } as Parameters<typeof modelOf>[0]);
    return priorView(prior, { model, ratio, soonDelay }, draws);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, draws, modelId, ratio, soonDelay, sensitivity, presentBias, settingOk]);

  const scatter = useMemo<ScatterSpec | null>(
    () =>
      view && {
        title: 'Prior draws of the two discount rates on log axes',
        x: view.draws.kSmall,
        y: view.draws.kLarge,
        flags: view.canReverse,
        flagLabel: 'can reverse',
        otherLabel: 'cannot reverse',
        line: { x: view.boundary.kSmall, y: view.boundary.kLarge, label: 'reversals possible below this line' },
        diagonal: true,
        domain: view.range,
        xLabel: 'k, small-reward rate (per day, log scale)',
        yLabel: 'K, large-reward rate (per day, log scale)',
      },
    [view],
  );
  const density = useMemo<LineChartSpec | null>(
    () =>
      view && {
        title: 'Densities of the two discount rates',
        series: [
          { label: 'small reward, k', x: view.densities.k, y: view.densities.small, colour: CHART_COLOURS[0], area: true },
          { label: 'large reward, K', x: view.densities.k, y: view.densities.large, colour: CHART_COLOURS[1], area: true },
        ],
        xScale: 'log',
        xLabel: 'rate (per day, log scale)',
        yLabel: 'density per unit of ln k',
        height: 240,
      },
    [view],
  );

  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField label="Model for the picture" value={modelId} onChange={(e) => setModelId(e.target.value as typeof modelId)}>
          {MODEL_CHOICES.map((m) => (
            <option key={m} value={m}>
              {MODEL_LABELS[m]}
            </option>
          ))}
        </SelectField>
        <TextField label="Magnitude ratio S/L" type="number" step="0.05" value={ratio} onChange={(e) => setRatio(Number(e.target.value))} hint="between 0 and 1" />
        <TextField label="Soon delay d (days)" type="number" step="1" value={soonDelay} onChange={(e) => setSoonDelay(Number(e.target.value))} />
        {usesS ? <TextField label="Delay sensitivity s for the picture" type="number" step="0.1" value={sensitivity} onChange={(e) => setSensitivity(Number(e.target.value))} hint="above 0, at most 5" /> : null}
        {modelId === 'quasi-hyperbolic' ? <TextField label="Present bias β for the picture" type="number" step="0.05" value={presentBias} onChange={(e) => setPresentBias(Number(e.target.value))} hint="above 0, at most 1" /> : null}
      </div>
      {!prior ? <p className="text-sm text-ink-soft">Enter valid prior values to see the picture.</p> : null}
      {prior && !settingOk ? <p className="text-sm text-ink-soft">The ratio must be between 0 and 1, the soon delay 0 days or more, s between 0 and 5 and β between 0 and 1.</p> : null}
      {view && scatter && density ? (
        <>
          <p className="text-sm" data-testid="reversible-share">
            Share of the prior that can reverse: <strong>{fmtShare(view.share)}</strong>{' '}
            <span className="text-ink-soft">(model: {MODEL_LABELS[modelId]}, S/L = {ratio}, d = {soonDelay} days; these settings only shape the picture and are not saved)</span>
          </p>
          <div className="grid gap-4 lg:grid-cols-2">
            <D3Chart draw={drawScatterChart} spec={scatter} testId="prior-scatter" />
            <D3Chart draw={drawLineChart} spec={density} testId="prior-density" />
          </div>
        </>
      ) : null}
    </div>
  );
}
