// The power figure's legend sits in a corner the curves leave free, whatever shape the curve has.
import { describe, expect, it } from 'vitest';
import { powerCurveSvg, type PowerSeries } from '@/lib/shared/figures/power-curve';

const ns = [20, 40, 60, 80, 100, 120, 140, 160, 180, 200];
const series = (label: string, power: (n: number) => number): PowerSeries => ({
  label,
  points: ns.map((n) => ({ n, power: power(n), lower: Math.max(0, power(n) - 0.03), upper: Math.min(1, power(n) + 0.03) })),
});

/** The legend box (the first rect with a grey outline) as x, y. */
function legendBox(svg: string) {
  const m = /<rect x="([\d.]+)" y="([\d.]+)" width="([\d.]+)" height="([\d.]+)" fill="#ffffff" fill-opacity="0.9"/.exec(svg);
  if (!m) throw new Error('no legend box');
  return { x: Number(m[1]), y: Number(m[2]), width: Number(m[3]), height: Number(m[4]) };
}

describe('power figure legend', () => {
  it('goes top left for a curve that rises with N', () => {
    const box = legendBox(powerCurveSvg([series('rising', (n) => Math.min(0.99, n / 220))]));
    expect(box.x).toBeLessThan(100);
    expect(box.y).toBeLessThan(100);
  });

  it('moves off the top when power is already near 1 at the smallest N', () => {
    const box = legendBox(powerCurveSvg([series('saturated', () => 1)]));
    expect(box.y).toBeGreaterThan(200);
  });

  it('still finds a free corner for two curves, one high and one low', () => {
    const svg = powerCurveSvg([series('as assumed', () => 0.97), series('misspecified', () => 0.05)]);
    const box = legendBox(svg);
    // the middle band of the plot is free: the box must not sit on either flat curve
    expect(box.y).toBeGreaterThan(60);
    expect(box.y + box.height).toBeLessThan(320);
    expect(svg).toContain('misspecified');
  });
});

describe('warnings under the figure', () => {
  it('prints each note below the caption and grows the figure by a line per note, keeping the plot', () => {
    const plain = powerCurveSvg([series('A', (n) => n / 250)]);
    const noted = powerCurveSvg([series('A', (n) => n / 250)], { notes: ['Pooled McNemar test assumes independent pairs.'] });
    const height = (svg: string) => Number(/viewBox="0 0 650 ([\d.]+)"/.exec(svg)![1]);
    // the plain figure already has its wrapped caption and the caution below the plot
    expect(height(plain)).toBeGreaterThan(420);
    expect(height(noted)).toBe(height(plain) + 15);
    expect(noted).toContain(`height="${(height(plain) + 15) / 100}in"`);
    expect(noted).toContain('>Pooled McNemar test assumes independent pairs.</text>');
    expect(legendBox(noted)).toEqual(legendBox(plain));
  });
});
