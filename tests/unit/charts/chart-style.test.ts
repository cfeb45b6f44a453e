import { describe, expect, it } from 'vitest';
import { CHART_TEXT, placeLabel, textWidth, type Box } from '@/components/charts/chart-style';

const area: Box = { x: 0, y: 0, width: 480, height: 200 };
const overlap = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

describe('chart labels avoid each other', () => {
  it('uses legible sizes: no chart text below 12 units', () => {
    expect(Math.min(...Object.values(CHART_TEXT))).toBeGreaterThanOrEqual(12);
  });

  it('puts a label above-right of its point when there is room', () => {
    const taken: Box[] = [];
    expect(placeLabel({ x: 100, y: 100 }, 'optimum 120 d', area, taken)).toEqual({ x: 107, y: 93, anchor: 'start' });
    expect(taken).toHaveLength(1);
  });

  it('moves a second label off the first when two points are close (an optimum beside a probe)', () => {
    const taken: Box[] = [];
    placeLabel({ x: 200, y: 80 }, 'optimum 131 d', area, taken);
    placeLabel({ x: 204, y: 82 }, 'population probe', area, taken);
    expect(overlap(taken[0], taken[1])).toBe(false);
  });

  it('keeps a label inside the plot near the right and top edges', () => {
    const taken: Box[] = [];
    const at = placeLabel({ x: 475, y: 4 }, 'crossing, day 12', area, taken);
    const box = taken[0];
    expect(at.anchor).toBe('end');
    expect(box.x).toBeGreaterThanOrEqual(0);
    expect(box.x + box.width).toBeLessThanOrEqual(area.width);
    expect(box.y).toBeGreaterThanOrEqual(0);
  });

  it('places many labels at one spot without any two overlapping, while room remains', () => {
    const taken: Box[] = [];
    for (let i = 0; i < 6; i++) placeLabel({ x: 240, y: 120 }, `label number ${i}`, area, taken);
    for (let i = 0; i < taken.length; i++) for (let j = i + 1; j < taken.length; j++) expect(overlap(taken[i], taken[j]), `${i} vs ${j}`).toBe(false);
  });

  it('estimates text width from the character count (errs wide)', () => {
    expect(textWidth('abcd', 12)).toBeCloseTo(4 * 12 * 0.55, 12);
  });
});
