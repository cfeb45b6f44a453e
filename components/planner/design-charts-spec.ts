import { CHART_COLOURS, type LineChartSpec } from '@/components/charts/draw-line-chart';
import { fmtDays } from '@/lib/shared/planner/format';
import type { DesignSummary } from '@/lib/shared/planner/types';

/** Chart specs for a summary: values against the standing day, and the gap product against the late delay. */
export function valueChartSpec(s: DesignSummary, currency: string): LineChartSpec | null {
  const c = s.valueCurve;
  if (!c) return null;
  return {
    title: 'Discounted values of both rewards against the standing day',
    series: [
      { label: `smaller-sooner (day ${fmtDays(c.soonDelay)})`, x: c.days, y: c.small, colour: CHART_COLOURS[1] },
      { label: `larger-later (day ${fmtDays(c.lateDelay)})`, x: c.days, y: c.large, colour: CHART_COLOURS[0] },
    ],
    bands: c.crossing !== null ? [{ from: c.crossing, to: c.soonDelay, label: 'SS preferred from here' }] : [],
    markers: c.crossing !== null ? [{ x: c.crossing, y: interpolate(c.days, c.large, c.crossing), label: `crossing, day ${fmtDays(c.crossing)}` }] : [],
    xLabel: 'standing day t (days from the far view)',
    yLabel: `value now (${currency})`,
  };
}

export function gapChartSpec(s: DesignSummary): LineChartSpec | null {
  const c = s.gapCurve;
  if (!c) return null;
  const probe = s.roles[1].lateDelay;
  return {
    title: 'Gap product against the late delay for the typical participant',
    series: [{ label: 'gap product A·B', x: c.lateDelays, y: c.values, colour: CHART_COLOURS[0], area: true }],
    xScale: 'log',
    bands: c.zone ? [{ from: c.zone.lower, to: c.zone.upper, label: 'reversal zone' }] : [],
    markers: [
      ...(c.optimum ? [{ x: c.optimum.lateDelay, y: c.optimum.gapProduct, label: `optimum ${fmtDays(c.optimum.lateDelay)} d` }] : []),
      ...(probe !== null && s.mode === 'population' ? [{ x: probe, y: interpolate(c.lateDelays, c.values, probe), label: 'population probe', colour: CHART_COLOURS[2] }] : []),
    ],
    xLabel: 'late delay D (days, log scale)',
    yLabel: 'gap product (× L²)',
    yFormat: (v) => v.toExponential(1),
  };
}

function interpolate(xs: number[], ys: number[], x: number): number {
  for (let i = 1; i < xs.length; i++) {
    if (xs[i] >= x) {
      const t = (x - xs[i - 1]) / (xs[i] - xs[i - 1] || 1);
      return ys[i - 1] + t * (ys[i] - ys[i - 1]);
    }
  }
  return ys[ys.length - 1] ?? 0;
}

