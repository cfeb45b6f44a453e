// Browser side of the planner benchmark: bundled by bench/planner.ts and run in Chromium. Times
// one field change on the design page (recompute the summary, redraw both charts) and on the
// prior page (recompute the picture, redraw the 2,000-point scatter and the densities).
import { drawLineChart } from '@/components/charts/draw-line-chart';
import { drawScatterChart } from '@/components/charts/draw-scatter-chart';
import { gapChartSpec, valueChartSpec } from '@/components/planner/design-charts-spec';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { expectationNodes, priorDraws } from '@/lib/shared/planner/points';
import { priorView } from '@/lib/shared/planner/prior-view';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import { DEFAULT_CHOICE_SENSITIVITY } from '@/lib/shared/planner/types';
import type { DesignSpec } from '@/lib/shared/validations/planner';

type Timing = { label: string; draws: number; runs: number; medianMs: number; p95Ms: number; maxMs: number };

function stats(label: string, draws: number, times: number[]): Timing {
  const sorted = [...times].sort((a, b) => a - b);
  const at = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
  return { label, draws, runs: times.length, medianMs: at(0.5), p95Ms: at(0.95), maxMs: sorted[sorted.length - 1] };
}

function svg(id: string): SVGSVGElement {
  const el = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
  el.id = id;
  el.style.width = '640px';
  document.body.appendChild(el);
  return el;
}

function run(runs: number): Timing[] {
  const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
  const draws = priorDraws(prior);
  const nodes = expectationNodes(prior, defaultSpec('Bench', 1).choiceSensitivity ?? DEFAULT_CHOICE_SENSITIVITY);
  const [valueSvg, gapSvg, scatterSvg, densitySvg] = ['value', 'gap', 'scatter', 'density'].map(svg);
  const out: Timing[] = [];
  const designs: Array<[string, DesignSpec]> = [
    ['design page, personalised hyperbolic: change the ratio', { ...defaultSpec('Bench', 1) }],
    ['design page, population hyperboloid (expected reversal rate): change the ratio', { ...defaultSpec('Bench', 1), model: { id: 'hyperboloid', sensitivity: 0.8 }, mode: 'population', criterion: 'expected-reversal-rate' }],
  ];
  for (const [label, base] of designs) {
    const times: number[] = [];
    for (let i = 0; i < runs + 10; i++) {
      const spec = { ...base, ratio: 0.5 + 0.2 * ((i % 10) / 10) }; // one field changes each time
      const t0 = performance.now();
      const summary = computeDesignSummary({ spec, prior }, { draws, nodes });
      const value = valueChartSpec(summary, 'EUR');
      const gap = gapChartSpec(summary);
      if (value) drawLineChart(valueSvg, value);
      if (gap) drawLineChart(gapSvg, gap);
      void document.body.getBoundingClientRect(); // force layout, as a frame would
      if (i >= 10) times.push(performance.now() - t0); // the first 10 warm up the JIT
    }
    out.push(stats(label, draws.kSmall.length, times));
  }
  const times: number[] = [];
  for (let i = 0; i < runs + 10; i++) {
    const t0 = performance.now();
    const view = priorView(prior, { model: { id: 'hyperbolic' }, ratio: 0.6, soonDelay: 7 + (i % 20) }, draws);
    drawScatterChart(scatterSvg, { title: 'bench', x: view.draws.kSmall, y: view.draws.kLarge, flags: view.canReverse, line: { x: view.boundary.kSmall, y: view.boundary.kLarge, label: 'line' }, domain: view.range, xLabel: 'k', yLabel: 'K' });
    drawLineChart(densitySvg, { title: 'bench', series: [{ label: 'k', x: view.densities.k, y: view.densities.small, colour: '#17645d', area: true }], xScale: 'log', xLabel: 'k', yLabel: 'density' });
    void document.body.getBoundingClientRect();
    if (i >= 10) times.push(performance.now() - t0);
  }
  out.push(stats('prior page: change the soon delay (2,000-point scatter)', draws.kSmall.length, times));
  return out;
}

(window as unknown as { plannerBench: (runs: number) => Timing[] }).plannerBench = run;
