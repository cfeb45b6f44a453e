// Browser side of the planner benchmark: bundled by bench/planner.ts and run in Chromium. Times
// one field change on the design page (recompute the summary, redraw both charts) and on the
// prior page (recompute the picture, redraw the 2,000-point scatter and the densities), and the
// design page's live power preview (S1 re-simulated on a Web Worker after a typed change).
import { drawLineChart } from '@/components/charts/draw-line-chart';
import { drawScatterChart } from '@/components/charts/draw-scatter-chart';
import { gapChartSpec, valueChartSpec } from '@/components/planner/design-charts-spec';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { expectationNodes, priorDraws } from '@/lib/shared/planner/points';
import { priorView } from '@/lib/shared/planner/prior-view';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import { DEFAULT_CHOICE_SENSITIVITY } from '@/lib/shared/planner/types';
import type { DesignSpec } from '@/lib/shared/validations/planner';
import { defaultPreviewWorkers, PowerPreviewRunner } from '@/lib/client/power-preview-runner';
import { PREVIEW_REPLICATIONS, type PreviewInput } from '@/lib/shared/power-preview';
import { powerDesign } from '../tests/support/frozen-design';

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

// ---- live power preview: a field change on the design page re-simulates S1's curve on a Web Worker ----

/** What the preview benchmark reads back from the page (bench/planner.ts prints it). */
export type PreviewTiming = {
  workers: number;
  changes: number;
  /** ms from the last keystroke of a change to the finished curve (debounce included) */
  toCurveMs: number[];
  /** ms the page's input handler took per keystroke */
  handlerMaxMs: number;
  /** Event Timing entries (input to next paint) of 16 ms or more, and their longest */
  slowEvents: number;
  slowestEventMs: number;
  /** of those, entries past one 60 Hz frame: over 16 ms (the API rounds durations to 8 ms, so 24 or more) */
  eventsPastAFrame: number;
  /** longest wait of an event for the page's thread plus its handlers' time (processingEnd − startTime), ms */
  worstDelayAndProcessingMs: number;
  /** long tasks (over 50 ms) on the page's thread while previews ran */
  longTasks: number;
  /** longest gap between animation frames while previews ran, ms */
  longestFrameGapMs: number;
};

function previewSetup(workerUrl: string): void {
  const field = document.createElement('input');
  field.id = 'ratio';
  field.value = '0.82';
  document.body.appendChild(field);
  const design = powerDesign();
  const inputFor = (ratio: number): PreviewInput => ({
    content: { ...design, spec: { ...design.spec, ratio } },
    test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
    sampleSizes: [20, 40, 60, 80, 100, 120, 140, 160, 180, 200],
    replications: PREVIEW_REPLICATIONS,
  });
  const workers = defaultPreviewWorkers();
  let lastInputAt = 0;
  let finished: ((ms: number) => void) | null = null;
  const runner = new PowerPreviewRunner({
    createWorker: () => new Worker(workerUrl),
    workers,
    onChange: (state) => {
      if (state.status === 'done' && finished) finished(performance.now() - lastInputAt);
      if (state.status === 'error') throw new Error(state.error ?? 'preview failed');
    },
  });
  const handlerMs: number[] = [];
  field.addEventListener('input', () => {
    const t0 = performance.now();
    const ratio = Number(field.value);
    runner.request(ratio > 0 && ratio < 1 ? inputFor(ratio) : null);
    lastInputAt = t0;
    handlerMs.push(performance.now() - t0);
  });
  const events: Array<{ duration: number; delayAndProcessing: number }> = [];
  const longTasks: number[] = [];
  new PerformanceObserver((list) =>
    list.getEntries().forEach((e) => {
      const timing = e as PerformanceEventTiming;
      events.push({ duration: timing.duration, delayAndProcessing: timing.processingEnd - timing.startTime });
    }),
  ).observe({ type: 'event', durationThreshold: 16 } as PerformanceObserverInit);
  new PerformanceObserver((list) => list.getEntries().forEach((e) => longTasks.push(e.duration))).observe({ type: 'longtask' });
  let frameGap = 0;
  let watching = false;
  let lastFrame = 0;
  const frame = (t: number) => {
    if (watching && lastFrame > 0) frameGap = Math.max(frameGap, t - lastFrame);
    lastFrame = t;
    requestAnimationFrame(frame);
  };
  requestAnimationFrame(frame);
  const toCurve: number[] = [];
  const bench = {
    /** the first preview (the page has just opened): starts the workers and warms them up */
    warmUp: () => new Promise<number>((resolve) => {
      finished = resolve;
      lastInputAt = performance.now();
      runner.request(inputFor(0.82));
    }),
    /** resolves when the change being typed has its curve */
    nextCurve: () => {
      watching = true;
      return new Promise<number>((resolve) => {
        finished = (ms) => {
          toCurve.push(ms);
          resolve(ms);
        };
      });
    },
    reset: () => {
      events.length = 0;
      longTasks.length = 0;
      handlerMs.length = 0;
      frameGap = 0;
    },
    result: (): PreviewTiming => ({
      workers,
      changes: toCurve.length,
      toCurveMs: toCurve,
      handlerMaxMs: Math.max(0, ...handlerMs),
      slowEvents: events.length,
      slowestEventMs: Math.max(0, ...events.map((e) => e.duration)),
      eventsPastAFrame: events.filter((e) => e.duration > 16).length,
      worstDelayAndProcessingMs: Math.max(0, ...events.map((e) => e.delayAndProcessing)),
      longTasks: longTasks.length,
      longestFrameGapMs: frameGap,
    }),
  };
  (window as unknown as { previewBench: typeof bench }).previewBench = bench;
}

(window as unknown as { previewSetup: typeof previewSetup }).previewSetup = previewSetup;
