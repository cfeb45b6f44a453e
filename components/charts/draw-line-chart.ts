import { extent } from 'd3-array';
import { axisBottom, axisLeft } from 'd3-axis';
import { format } from 'd3-format';
import { scaleLinear, scaleLog } from 'd3-scale';
import { select, type Selection } from 'd3-selection';
import { area, line } from 'd3-shape';
import { CHART_INK, CHART_TEXT, LEGEND_ROW, placeLabel, styleAxis, styleRoot, textWidth, type Box } from './chart-style';

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
const MARGIN = { top: 12, right: 16, bottom: 48, left: 64 };

/**
 * Draws (or redraws) a line chart into an <svg> with d3: axes with labels, shaded bands,
 * lines (optionally filled to zero), markers with labels and a legend. Pure DOM work, no React,
 * so the benchmark can time it alone. Text follows the shared chart style; band and marker
 * labels are placed so they do not overlap each other or leave the plot.
 */
export function drawLineChart(svgEl: SVGSVGElement, spec: LineChartSpec): void {
  const width = spec.width ?? 560;
  const height = spec.height ?? 280;
  const svg = select(svgEl).attr('viewBox', `0 0 ${width} ${height}`).attr('role', 'img').attr('aria-label', spec.title);
  svg.selectAll('*').remove();
  styleRoot(svg);
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
  const bandLabels: Array<{ x: number; text: string }> = [];
  for (const band of spec.bands ?? []) {
    const from = Math.max(band.from, dLo);
    const to = Math.min(Number.isFinite(band.to) ? band.to : dHi, dHi);
    if (!(to > from)) continue;
    g.append('rect').attr('x', x(from)).attr('width', x(to) - x(from)).attr('y', 0).attr('height', innerH).attr('fill', band.colour ?? '#fae6bf').attr('opacity', 0.6);
    bandLabels.push({ x: x(from) + 4, text: band.label });
  }
  const xAxis = spec.xScale === 'log' ? axisBottom(x).ticks(6, '~g') : axisBottom(x).ticks(6);
  styleAxis(g.append('g').attr('transform', `translate(0,${innerH})`).call(xAxis as unknown as (s: Selection<SVGGElement, unknown, null, undefined>) => void));
  styleAxis(g.append('g').call(axisLeft(y).ticks(5).tickFormat((v) => (spec.yFormat ?? format('~g'))(Number(v)))));
  g.append('text').attr('x', innerW / 2).attr('y', innerH + 40).attr('text-anchor', 'middle').attr('font-size', CHART_TEXT.label).attr('fill', CHART_INK.soft).text(spec.xLabel);
  g.append('text').attr('transform', 'rotate(-90)').attr('x', -innerH / 2).attr('y', -50).attr('text-anchor', 'middle').attr('font-size', CHART_TEXT.label).attr('fill', CHART_INK.soft).text(spec.yLabel);
  spec.series.forEach((s) => {
    const points: Array<[number, number]> = [];
    for (let i = 0; i < s.x.length; i++) if (Number.isFinite(s.x[i]) && Number.isFinite(s.y[i]) && s.x[i] >= dLo && s.x[i] <= dHi) points.push([x(s.x[i]), y(s.y[i])]);
    if (s.area) g.append('path').attr('d', area().x0((p) => p[0]).y0(y(Math.max(0, y.domain()[0]))).y1((p) => p[1])(points)).attr('fill', s.colour).attr('opacity', 0.15);
    g.append('path').attr('d', line()(points)).attr('fill', 'none').attr('stroke', s.colour).attr('stroke-width', 2).attr('stroke-dasharray', s.dashed ? '5 4' : null).attr('data-series', s.label);
  });
  // labels claim space in turn: band labels along the bottom, then marker labels beside their points
  const plotArea: Box = { x: 0, y: 0, width: innerW, height: innerH };
  const taken: Box[] = (spec.markers ?? []).map((m) => ({ x: x(m.x) - 5, y: y(m.y) - 5, width: 10, height: 10 }));
  for (const b of bandLabels) {
    const bx = Math.min(b.x, innerW - textWidth(b.text));
    taken.push({ x: bx, y: innerH - 6 - CHART_TEXT.note, width: textWidth(b.text), height: CHART_TEXT.note * 1.2 });
    g.append('text').attr('x', bx).attr('y', innerH - 6).attr('font-size', CHART_TEXT.note).attr('fill', CHART_INK.band).attr('data-label', 'band').text(b.text);
  }
  for (const m of spec.markers ?? []) {
    g.append('circle').attr('cx', x(m.x)).attr('cy', y(m.y)).attr('r', 4.5).attr('fill', m.colour ?? CHART_INK.text);
    const at = placeLabel({ x: x(m.x), y: y(m.y) }, m.label, plotArea, taken);
    g.append('text').attr('x', at.x).attr('y', at.y).attr('text-anchor', at.anchor).attr('font-size', CHART_TEXT.note).attr('fill', CHART_INK.text).attr('data-label', 'marker').text(m.label);
  }
  const legend = svg.append('g').attr('transform', `translate(${MARGIN.left}, 4)`);
  spec.series.forEach((s, i) => {
    const row = legend.append('g').attr('transform', `translate(0, ${i * LEGEND_ROW})`);
    row.append('line').attr('x1', 0).attr('x2', 18).attr('y1', 6).attr('y2', 6).attr('stroke', s.colour).attr('stroke-width', 2).attr('stroke-dasharray', s.dashed ? '5 4' : null);
    row.append('text').attr('x', 24).attr('y', 10).attr('font-size', CHART_TEXT.legend).attr('fill', CHART_INK.text).text(s.label);
  });
}
