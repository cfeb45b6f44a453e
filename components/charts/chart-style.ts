import type { Selection } from 'd3-selection';

/**
 * One style for every chart: the page's own font (inherited, so axis ticks no longer fall back
 * to d3's "sans-serif"), legible sizes in viewBox units (charts are drawn 560–640 units wide
 * and shown about that many pixels wide on a desktop), one set of inks, and labels placed so
 * they do not sit on each other.
 */
export const CHART_TEXT = { tick: 12, label: 13, note: 12, legend: 12 } as const;
export const CHART_INK = { text: '#1d2a2e', soft: '#4a5a5f', band: '#8a5a0e' } as const;
/** Height of one legend row, in viewBox units. */
export const LEGEND_ROW = 17;


/** The root <svg>: the page's font family and the chart's base size. */
export function styleRoot(svg: Selection<SVGSVGElement, unknown, null, undefined>): void {
  svg.attr('font-family', 'inherit').attr('font-size', CHART_TEXT.tick).style('font-family', 'inherit');
}

/** An axis group after d3 drew it: drop d3's own font and size so ticks read like the rest of the chart. */
export function styleAxis(axis: Selection<SVGGElement, unknown, null, undefined>): void {
  axis.attr('font-family', null).attr('font-size', CHART_TEXT.tick);
  axis.selectAll('text').attr('fill', CHART_INK.soft);
}

/** A rectangle in the chart's coordinates. */
export type Box = { x: number; y: number; width: number; height: number };

/** Approximate width of a label: Source Sans 3 averages about 0.5 em per character, 0.55 errs wide. */
export function textWidth(text: string, size: number = CHART_TEXT.note): number {
  return text.length * size * 0.55;
}

function overlaps(a: Box, b: Box): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}

/**
 * Where to put a label beside a point so that it stays inside `area` and clear of the boxes
 * already taken: tries above-right, above-left, below-right, below-left, then steps upwards.
 * Returns the text's anchor position (x, baseline y, text-anchor) and adds its box to `taken`.
 */
export function placeLabel(
  point: { x: number; y: number },
  text: string,
  area: Box,
  taken: Box[],
  size: number = CHART_TEXT.note,
): { x: number; y: number; anchor: 'start' | 'end' } {
  const w = textWidth(text, size);
  const h = size * 1.2;
  const gap = 7;
  const candidates: Array<{ x: number; y: number; anchor: 'start' | 'end' }> = [];
  for (let lift = 0; lift <= 6; lift++) {
    const dy = lift * h;
    candidates.push(
      { x: point.x + gap, y: point.y - gap - dy, anchor: 'start' },
      { x: point.x - gap, y: point.y - gap - dy, anchor: 'end' },
      { x: point.x + gap, y: point.y + gap + h + dy, anchor: 'start' },
      { x: point.x - gap, y: point.y + gap + h + dy, anchor: 'end' },
    );
  }
  const boxOf = (c: { x: number; y: number; anchor: 'start' | 'end' }): Box => ({ x: c.anchor === 'start' ? c.x : c.x - w, y: c.y - size, width: w, height: h });
  const inside = (b: Box) => b.x >= area.x && b.x + b.width <= area.x + area.width && b.y >= area.y && b.y + b.height <= area.y + area.height;
  const chosen = candidates.find((c) => inside(boxOf(c)) && !taken.some((t) => overlaps(t, boxOf(c)))) ?? candidates.find((c) => inside(boxOf(c))) ?? candidates[0];
  taken.push(boxOf(chosen));
  return chosen;
}
