import { scaleLinear } from 'd3-scale';
import { area, line } from 'd3-shape';
import { textWidth as measure, wrapText } from './figure-text';

/** One curve: a label and its points (sample size, power, Wilson interval). */
export type PowerSeries = { label: string; points: ReadonlyArray<{ n: number; power: number; lower: number; upper: number }> };

export type PowerFigureOptions = {
  title?: string;
  /** a note under the plot (e.g. replications and seed) */
  caption?: string;
  /** horizontal guide lines; default 0.8 and 0.9 */
  targets?: number[];
  /** warnings a reader of the figure must see (e.g. a test's assumption), below the caption, each wrapped to the figure's width */
  notes?: string[];
  /** @font-face rules to embed (the SVG download carries its font this way; the page and the PNG renderer have it already) */
  fontCss?: string;
};

/** The caution every power figure carries, on the page and wherever it is downloaded to. */
export const FIGURE_CAUTION =
  'Simulated hypothetical choices under the stated assumptions: power and rates shown are estimates for planning, not a clinical assessment of anyone.';

/** Caption and note text size, and the height of one of their lines, in SVG units (1/100 inch). */
const CAPTION_SIZE = 12;
const LINE = 15;

/** Figure size: 6.5 × 4.2 inches; one SVG unit is 1/100 inch, so 300 dpi is 3 pixels per unit. */
export const FIGURE = { width: 650, height: 420, inchesWide: 6.5, inchesHigh: 4.2 } as const;
export const FIGURE_FONT = 'Source Sans 3';

const COLOURS = ['#0f766e', '#b45309', '#4338ca', '#be123c', '#6d28d9', '#0369a1'];
const MARGIN = { top: 44, right: 24, bottom: 74, left: 64 };

function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/**
 * The power curve(s) as a self-contained SVG document: power against sample size with the
 * Wilson 95 % band of each curve, guide lines at the target powers, axes, legend and caption.
 * d3 computes the scales and paths; the same text is shown on the results page, downloaded
 * as SVG, and rendered to PNG, so all three always agree.
 */
export function powerCurveSvg(series: readonly PowerSeries[], options: PowerFigureOptions = {}): string {
  const { width } = FIGURE;
  // caption, notes and caution are wrapped to the figure's width with the font's own advance
  // widths; every line after the first adds 15 units below the plot, so the plot keeps its size
  const textWidth = width - MARGIN.left - MARGIN.right;
  const captionText = `Shaded: Wilson 95 % interval. Dashed lines: 80 % and 90 % power.${options.caption ? ` ${options.caption}` : ''}`;
  const lines = [
    ...wrapText(captionText, textWidth, CAPTION_SIZE).map((text) => ({ text, kind: 'caption' as const })),
    ...(options.notes ?? []).flatMap((note) => wrapText(note, textWidth, CAPTION_SIZE, 'semibold').map((text) => ({ text, kind: 'note' as const }))),
    ...wrapText(FIGURE_CAUTION, textWidth, CAPTION_SIZE).map((text) => ({ text, kind: 'caution' as const })),
  ];
  const height = FIGURE.height + LINE * (lines.length - 1);
  const innerW = width - MARGIN.left - MARGIN.right;
  const innerH = FIGURE.height - MARGIN.top - MARGIN.bottom;
  const all = series.flatMap((s) => s.points.map((p) => p.n));
  const maxN = Math.max(1, ...all);
  const minN = Math.min(maxN, ...all);
  const x = scaleLinear()
    .domain([Math.min(0, minN), maxN])
    .range([MARGIN.left, MARGIN.left + innerW])
    .nice();
  const y = scaleLinear().domain([0, 1]).range([MARGIN.top + innerH, MARGIN.top]);
  type P = PowerSeries['points'][number];
  const curve = line<P>()
    .x((p) => x(p.n))
    .y((p) => y(p.power));
  const band = area<P>()
    .x((p) => x(p.n))
    .y0((p) => y(p.lower))
    .y1((p) => y(p.upper));
  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${FIGURE.inchesWide}in" height="${height / 100}in" viewBox="0 0 ${width} ${height}" ` +
      // quoted: a family name with a digit in it is not a valid unquoted CSS name, and an invalid one falls back to a serif
      `font-family="'${FIGURE_FONT}', sans-serif" role="img" aria-label="${escapeXml(options.title ?? 'Power curve')}">`,
  );
  if (options.fontCss) parts.push(`<defs><style>${options.fontCss}</style></defs>`);
  parts.push(`<rect width="${width}" height="${height}" fill="#ffffff"/>`);
  if (options.title) parts.push(`<text x="${MARGIN.left}" y="24" font-size="16" font-weight="600" fill="#1f2933">${escapeXml(options.title)}</text>`);
  for (const t of y.ticks(5)) {
    parts.push(`<line x1="${MARGIN.left}" x2="${MARGIN.left + innerW}" y1="${y(t)}" y2="${y(t)}" stroke="#e5e7eb" stroke-width="1"/>`);
    parts.push(`<text x="${MARGIN.left - 8}" y="${y(t) + 4}" font-size="12" text-anchor="end" fill="#374151">${Math.round(t * 100)} %</text>`);
  }
  for (const target of options.targets ?? [0.8, 0.9]) {
    parts.push(`<line x1="${MARGIN.left}" x2="${MARGIN.left + innerW}" y1="${y(target)}" y2="${y(target)}" stroke="#6b7280" stroke-width="1" stroke-dasharray="5 4"/>`);
  }
  for (const t of x.ticks(8)) {
    parts.push(`<line x1="${x(t)}" x2="${x(t)}" y1="${MARGIN.top + innerH}" y2="${MARGIN.top + innerH + 5}" stroke="#374151"/>`);
    parts.push(`<text x="${x(t)}" y="${MARGIN.top + innerH + 19}" font-size="12" text-anchor="middle" fill="#374151">${t}</text>`);
  }
  parts.push(`<line x1="${MARGIN.left}" x2="${MARGIN.left + innerW}" y1="${MARGIN.top + innerH}" y2="${MARGIN.top + innerH}" stroke="#374151"/>`);
  parts.push(`<line x1="${MARGIN.left}" x2="${MARGIN.left}" y1="${MARGIN.top}" y2="${MARGIN.top + innerH}" stroke="#374151"/>`);
  parts.push(`<text x="${MARGIN.left + innerW / 2}" y="${MARGIN.top + innerH + 40}" font-size="13" text-anchor="middle" fill="#1f2933">Participants (N)</text>`);
  parts.push(
    `<text transform="translate(18 ${MARGIN.top + innerH / 2}) rotate(-90)" font-size="13" text-anchor="middle" fill="#1f2933">Power (share of replicates with p &lt; α)</text>`,
  );
  const sorted = series.map((s) => [...s.points].sort((a, b) => a.n - b.n));
  sorted.forEach((points, i) => {
    const colour = COLOURS[i % COLOURS.length];
    parts.push(`<path d="${band(points) ?? ''}" fill="${colour}" fill-opacity="0.18" stroke="none"/>`);
    parts.push(`<path d="${curve(points) ?? ''}" fill="none" stroke="${colour}" stroke-width="2.2"${i % 2 ? ' stroke-dasharray="7 3"' : ''}/>`);
    for (const p of points) parts.push(`<circle cx="${x(p.n)}" cy="${y(p.power)}" r="3" fill="${colour}"/>`);
  });
  // legend inside the plot, in whichever corner (or side) the curves and their bands leave free:
  // top left for the usual curve that rises with N, bottom right when power is high at small N
  const widest = Math.max(...series.map((s) => measure(s.label, 12)), 60);
  const boxW = Math.min(innerW - 8, 34 + widest);
  const boxH = series.length * 18 + 8;
  const corners = [
    { lx: MARGIN.left + 10, ly: MARGIN.top + 8 },
    { lx: MARGIN.left + innerW - boxW - 4, ly: MARGIN.top + innerH - boxH - 4 },
    { lx: MARGIN.left + innerW - boxW - 4, ly: MARGIN.top + 8 },
    { lx: MARGIN.left + 10, ly: MARGIN.top + innerH - boxH - 4 },
    { lx: MARGIN.left + innerW - boxW - 4, ly: MARGIN.top + (innerH - boxH) / 2 },
    { lx: MARGIN.left + 10, ly: MARGIN.top + (innerH - boxH) / 2 },
  ];
  const overlap = ({ lx, ly }: { lx: number; ly: number }) => {
    let hits = 0;
    for (const points of sorted) {
      for (let k = 0; k + 1 < points.length; k++) {
        // sample each segment so a line crossing the box between two points still counts
        for (let f = 0; f <= 1; f += 0.1) {
          const px = x(points[k].n + f * (points[k + 1].n - points[k].n));
          const top = y(points[k].upper + f * (points[k + 1].upper - points[k].upper));
          const bottom = y(points[k].lower + f * (points[k + 1].lower - points[k].lower));
          if (px >= lx - 6 && px <= lx - 6 + boxW && bottom >= ly - 6 && top <= ly - 6 + boxH) hits++;
        }
      }
      if (points.length === 1 && x(points[0].n) >= lx - 6 && x(points[0].n) <= lx - 6 + boxW) hits++;
    }
    return hits;
  };
  const hits = corners.map(overlap);
  const { lx, ly } = corners[hits.indexOf(Math.min(...hits))]; // the first of the freest
  if (series.length > 0) {
    parts.push(`<rect x="${lx - 6}" y="${ly - 6}" width="${boxW}" height="${boxH}" fill="#ffffff" fill-opacity="0.9" stroke="#e5e7eb"/>`);
  }
  series.forEach((s, i) => {
    const colour = COLOURS[i % COLOURS.length];
    const y0 = ly + i * 18;
    parts.push(`<rect x="${lx}" y="${y0}" width="16" height="10" fill="${colour}" fill-opacity="0.3" stroke="${colour}"/>`);
    parts.push(`<text x="${lx + 22}" y="${y0 + 9}" font-size="12" fill="#1f2933">${escapeXml(s.label)}</text>`);
  });
  lines.forEach((l, i) => {
    const style = l.kind === 'note' ? ' font-weight="600" fill="#92400e"' : l.kind === 'caution' ? ' fill="#1f2933" font-style="normal"' : ' fill="#4b5563"';
    parts.push(`<text x="${MARGIN.left}" y="${FIGURE.height - 12 + LINE * i}" font-size="${CAPTION_SIZE}"${style} data-line="${l.kind}">${escapeXml(l.text)}</text>`);
  });
  parts.push('</svg>');
  return parts.join('\n');
}
