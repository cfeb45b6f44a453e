import { axisBottom, axisLeft } from 'd3-axis';
import { format } from 'd3-format';
import { scaleBand, scaleLinear } from 'd3-scale';
import { select } from 'd3-selection';
import { CHART_INK, CHART_TEXT, LEGEND_ROW, styleAxis, styleRoot } from './chart-style';
import { CHART_COLOURS } from './draw-line-chart';

export type BarChartSpec = {
  title: string;
  /** categories along the x axis */
  groups: string[];
  /** one series per compared item; values[i] belongs to groups[i] */
  series: Array<{ label: string; values: Array<number | null> }>;
  yLabel: string;
  yFormat?: (v: number) => string;
  yMax?: number;
  width?: number;
  height?: number;
};

const MARGIN = { top: 12, right: 16, bottom: 72, left: 60 };

/** Draws (or redraws) grouped bars into an <svg> with d3: one group per category, one bar per series, legend above. */
export function drawBarChart(svgEl: SVGSVGElement, spec: BarChartSpec): void {
  const width = spec.width ?? 640;
  const height = spec.height ?? 300;
  const svg = select(svgEl).attr('viewBox', `0 0 ${width} ${height}`).attr('role', 'img').attr('aria-label', spec.title);
  svg.selectAll('*').remove();
  styleRoot(svg);
  const top = MARGIN.top + LEGEND_ROW * spec.series.length;
  const innerW = width - MARGIN.left - MARGIN.right;
  const innerH = height - top - MARGIN.bottom;
  const all = spec.series.flatMap((s) => s.values).filter((v): v is number => v !== null && Number.isFinite(v));
  const x = scaleBand().domain(spec.groups).range([0, innerW]).padding(0.2);
  const inner = scaleBand().domain(spec.series.map((_, i) => String(i))).range([0, x.bandwidth()]).padding(0.08);
  const y = scaleLinear().domain([0, spec.yMax ?? Math.max(1e-12, ...all)]).nice().range([innerH, 0]);
  const g = svg.append('g').attr('transform', `translate(${MARGIN.left},${top})`);
  const xAxis = g.append('g').attr('transform', `translate(0,${innerH})`).call(axisBottom(x));
  styleAxis(xAxis);
  xAxis.selectAll('text').attr('transform', 'rotate(-18)').attr('text-anchor', 'end');
  styleAxis(g.append('g').call(axisLeft(y).ticks(5).tickFormat((v) => (spec.yFormat ?? format('~g'))(Number(v)))));
  g.append('text').attr('transform', 'rotate(-90)').attr('x', -innerH / 2).attr('y', -46).attr('text-anchor', 'middle').attr('font-size', CHART_TEXT.label).attr('fill', CHART_INK.soft).text(spec.yLabel);
  spec.series.forEach((s, si) => {
    const colour = CHART_COLOURS[si % CHART_COLOURS.length];
    s.values.forEach((v, gi) => {
      if (v === null || !Number.isFinite(v)) return;
      g.append('rect')
        .attr('x', (x(spec.groups[gi]) ?? 0) + (inner(String(si)) ?? 0))
        .attr('width', inner.bandwidth())
        .attr('y', y(v))
        .attr('height', innerH - y(v))
        .attr('fill', colour)
        .attr('data-series', s.label);
    });
  });
  const legend = svg.append('g').attr('transform', `translate(${MARGIN.left}, 4)`);
  spec.series.forEach((s, i) => {
    const row = legend.append('g').attr('transform', `translate(0, ${i * LEGEND_ROW})`);
    row.append('rect').attr('y', 1).attr('width', 14).attr('height', 10).attr('fill', CHART_COLOURS[i % CHART_COLOURS.length]);
    row.append('text').attr('x', 20).attr('y', 10).attr('font-size', CHART_TEXT.legend).attr('fill', CHART_INK.text).text(s.label);
  });
}
