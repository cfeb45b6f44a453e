import { axisBottom, axisLeft } from 'd3-axis';
import { scaleLog } from 'd3-scale';
import { select } from 'd3-selection';
import { line } from 'd3-shape';
import { CHART_INK, CHART_TEXT, LEGEND_ROW, styleAxis, styleRoot } from './chart-style';

export type ScatterSpec = {
  title: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** 1 = highlighted point (drawn in the accent colour) */
  flags?: ArrayLike<number>;
  flagLabel?: string;
  otherLabel?: string;
  /** a line drawn over the points, e.g. the edge of the region where reversals are possible */
  line?: { x: ArrayLike<number>; y: ArrayLike<number>; label: string };
  /** the diagonal y = x, for reference */
  diagonal?: boolean;
  domain: [number, number];
  xLabel: string;
  yLabel: string;
  width?: number;
  height?: number;
};

const MARGIN = { top: 12, right: 16, bottom: 44, left: 64 };

/**
 * Draws a scatter on log–log axes into an <svg>: thousands of points as one path per colour
 * (one DOM node each, so redrawing 2,000 points stays cheap), an optional line and diagonal.
 */
export function drawScatterChart(svgEl: SVGSVGElement, spec: ScatterSpec): void {
  const width = spec.width ?? 420;
  const height = spec.height ?? 380;
  const svg = select(svgEl).attr('viewBox', `0 0 ${width} ${height}`).attr('role', 'img').attr('aria-label', spec.title);
  svg.selectAll('*').remove();
  styleRoot(svg);
  const innerW = width - MARGIN.left - MARGIN.right;
  const innerH = height - MARGIN.top - MARGIN.bottom;
  const x = scaleLog().domain(spec.domain).range([0, innerW]);
  const y = scaleLog().domain(spec.domain).range([innerH, 0]);
  const g = svg.append('g').attr('transform', `translate(${MARGIN.left},${MARGIN.top})`);
  styleAxis(g.append('g').attr('transform', `translate(0,${innerH})`).call(axisBottom(x).ticks(5, '~g')));
  styleAxis(g.append('g').call(axisLeft(y).ticks(5, '~g')));
  g.append('text').attr('x', innerW / 2).attr('y', innerH + 38).attr('text-anchor', 'middle').attr('font-size', CHART_TEXT.label).attr('fill', CHART_INK.soft).text(spec.xLabel);
  g.append('text').attr('transform', 'rotate(-90)').attr('x', -innerH / 2).attr('y', -50).attr('text-anchor', 'middle').attr('font-size', CHART_TEXT.label).attr('fill', CHART_INK.soft).text(spec.yLabel);
  let on = '';
  let off = '';
  for (let i = 0; i < spec.x.length; i++) {
    const px = x(spec.x[i]);
    const py = y(spec.y[i]);
    if (!(px >= 0 && px <= innerW && py >= 0 && py <= innerH)) continue;
    const dot = `M${px.toFixed(1)},${py.toFixed(1)}h0`;
    if (spec.flags?.[i]) on += dot;
    else off += dot;
  }
  g.append('path').attr('d', off || null).attr('stroke', '#7d8b8f').attr('stroke-width', 3).attr('stroke-linecap', 'round').attr('opacity', 0.45);
  g.append('path').attr('d', on || null).attr('stroke', '#17645d').attr('stroke-width', 3).attr('stroke-linecap', 'round').attr('opacity', 0.55);
  if (spec.diagonal) g.append('line').attr('x1', 0).attr('y1', innerH).attr('x2', innerW).attr('y2', 0).attr('stroke', '#4a5a5f').attr('stroke-dasharray', '2 4');
  if (spec.line && spec.line.x.length) {
    const pts: Array<[number, number]> = [];
    for (let i = 0; i < spec.line.x.length; i++) pts.push([x(spec.line.x[i]), y(spec.line.y[i])]);
    g.append('path').attr('d', line()(pts)).attr('fill', 'none').attr('stroke', '#c9861c').attr('stroke-width', 2.5).attr('data-series', spec.line.label);
  }
  const legend = g.append('g').attr('transform', 'translate(8, 6)').attr('font-size', CHART_TEXT.legend).attr('fill', CHART_INK.text);
  const rows = [
    { colour: '#17645d', label: spec.flagLabel ?? 'highlighted' },
    { colour: '#7d8b8f', label: spec.otherLabel ?? 'other' },
    ...(spec.line ? [{ colour: '#c9861c', label: spec.line.label }] : []),
  ];
  rows.forEach((r, i) => {
    legend.append('circle').attr('cx', 4).attr('cy', i * LEGEND_ROW + 5).attr('r', 4).attr('fill', r.colour);
    legend.append('text').attr('x', 13).attr('y', i * LEGEND_ROW + 9).text(r.label);
  });
}
