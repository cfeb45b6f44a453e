import { extent } from 'd3-array';
import { axisBottom, axisLeft } from 'd3-axis';
import { format } from 'd3-format';
import { scaleLinear, scaleLog } from 'd3-scale';
import { select, type Selection } from 'd3-selection';
import { area, line } from 'd3-shape';

export type LineSeries = { label: string; x: ArrayLike<number>; y: ArrayLike<number>; colour: string; dashed?: boolean; area?: boolean };
export type LineChartSpec = {
  title: string;
  series: LineSeries[];
  xLabel: string;
  yLabel: string;
  xScale?: 'linear' | 'log';
  /** shaded x-intervals, e.g. a reversal zone */
  bands?: Array<{ from: number; to: number; label: string; colour?: string }>;
  /** marked points, e.g. an optimum or a crossing */
  markers?: Array<{ x: number; y: number; label: string; colour?: string }>;
  width?: number;
  height?: number;
  yFormat?: (v: number) => string;
};

export const CHART_COLOURS = ['#17645d', '#c9861c', '#862a2a', '#4a5a5f'];
const MARGIN = { top: 12, right: 16, bottom: 44, left: 60 };
const LEGEND_ROW = 14;

/**
 * Draws (or redraws) a line chart into an <svg> with d3: axes with labels, shaded bands,
 * lines (optionally filled to zero), markers with labels and a legend. Pure DOM work, no React,
 * so the benchmark can time it alone.
 */
export function drawLineChart(svgEl: SVGSVGElement, spec: LineChartSpec): void {
  const width = spec.width ?? 560;
  const height = spec.height ?? 280;
  const svg = select(svgEl).attr('viewBox', `0 0 ${width} ${height}`).attr('role', 'img').attr('aria-label', spec.title);
  svg.selectAll('*').remove();
  const xs: number[] = [];
  const ys: number[] = [0];
  for (const s of spec.series) {
    for (let i = 0; i < s.x.length; i++) {
      if (Number.isFinite(s.x[i]) && Number.isFinite(s.y[i])) {
        xs.push(s.x[i]);
        ys.push(s.y[i]);
      }
    }
  }
  for (const m of spec.markers ?? []) {
    xs.push(m.x);
    ys.push(m.y);
  }
  if (!xs.length) return;
  const [x0, x1] = extent(xs) as [number, number];
  const [y0, y1] = extent(ys) as [number, number];
  // the legend sits above the plot, one row per series, so it never covers a line or a label
  const top = MARGIN.top + LEGEND_ROW * spec.series.length;
  const innerW = width - MARGIN.left - MARGIN.right;
  const innerH = height - top - MARGIN.bottom;
  const x = (spec.xScale === 'log' ? scaleLog().domain([Math.max(x0, 1e-12), Math.max(x1, x0 * 1.0001)]) : scaleLinear().domain([x0, x1 === x0 ? x0 + 1 : x1])).range([0, innerW]);
  const y = scaleLinear().domain([y0, y1 === y0 ? y0 + 1 : y1 + 0.1 * (y1 - y0)]).nice().range([innerH, 0]); // headroom for marker labels
  const g = svg.append('g').attr('transform', `translate(${MARGIN.left},${top})`);
  const [dLo, dHi] = x.domain();
  for (const band of spec.bands ?? []) {
    const from = Math.max(band.from, dLo);
    const to = Math.min(Number.isFinite(band.to) ? band.to : dHi, dHi);
    if (!(to > from)) continue;
    g.append('rect').attr('x', x(from)).attr('width', x(to) - x(from)).attr('y', 0).attr('height', innerH).attr('fill', band.colour ?? '#fae6bf').attr('opacity', 0.6);
    g.append('text').attr('x', x(from) + 4).attr('y', innerH - 6).attr('font-size', 10).attr('fill', '#8a5a0e').text(band.label);
  }
  const xAxis = spec.xScale === 'log' ? axisBottom(x).ticks(6, '~g') : axisBottom(x).ticks(6);
  g.append('g').attr('transform', `translate(0,${innerH})`).call(xAxis as unknown as (s: Selection<SVGGElement, unknown, null, undefined>) => void);
  g.append('g').call(axisLeft(y).ticks(5).tickFormat((v) => (spec.yFormat ?? format('~g'))(Number(v))));
  g.append('text').attr('x', innerW / 2).attr('y', innerH + 36).attr('text-anchor', 'middle').attr('font-size', 11).attr('fill', '#4a5a5f').text(spec.xLabel);
  g.append('text').attr('transform', 'rotate(-90)').attr('x', -innerH / 2).attr('y', -46).attr('text-anchor', 'middle').attr('font-size', 11).attr('fill', '#4a5a5f').text(spec.yLabel);
  spec.series.forEach((s) => {
    const points: Array<[number, number]> = [];
    for (let i = 0; i < s.x.length; i++) if (Number.isFinite(s.x[i]) && Number.isFinite(s.y[i]) && s.x[i] >= dLo && s.x[i] <= dHi) points.push([x(s.x[i]), y(s.y[i])]);
    if (s.area) g.append('path').attr('d', area().x0((p) => p[0]).y0(y(Math.max(0, y.domain()[0]))).y1((p) => p[1])(points)).attr('fill', s.colour).attr('opacity', 0.15);
    g.append('path').attr('d', line()(points)).attr('fill', 'none').attr('stroke', s.colour).attr('stroke-width', 2).attr('stroke-dasharray', s.dashed ? '5 4' : null).attr('data-series', s.label);
  });
  for (const m of spec.markers ?? []) {
    g.append('circle').attr('cx', x(m.x)).attr('cy', y(m.y)).attr('r', 4.5).attr('fill', m.colour ?? '#1d2a2e');
    g.append('text').attr('x', x(m.x) + 7).attr('y', y(m.y) - 7).attr('font-size', 10).attr('fill', '#1d2a2e').text(m.label);
  }
  const legend = svg.append('g').attr('transform', `translate(${MARGIN.left}, 4)`);
  spec.series.forEach((s, i) => {
    const row = legend.append('g').attr('transform', `translate(0, ${i * LEGEND_ROW})`);
    row.append('line').attr('x1', 0).attr('x2', 16).attr('y1', 4).attr('y2', 4).attr('stroke', s.colour).attr('stroke-width', 2).attr('stroke-dasharray', s.dashed ? '5 4' : null);
    row.append('text').attr('x', 20).attr('y', 8).attr('font-size', 10).attr('fill', '#1d2a2e').text(s.label);
  });
}
