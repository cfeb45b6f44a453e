// The power figure's text: measured with the font's own advance widths, wrapped to the figure,
// carrying the caution, and (in the SVG download) carrying the font itself.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { Resvg } from '@resvg/resvg-js';
import { describe, expect, it } from 'vitest';
import { EMBEDDED_FONT_FILES, embeddedFontCss } from '@/lib/server/figures/embedded-font';
import { figureFontFiles } from '@/lib/server/figures/png';
import { textWidth, wrapText } from '@/lib/shared/figures/figure-text';
import { FIGURE, FIGURE_CAUTION, FIGURE_FONT, powerCurveSvg, type PowerSeries } from '@/lib/shared/figures/power-curve';

const series: PowerSeries[] = [{ label: 'as assumed', points: [20, 60, 100, 140].map((n) => ({ n, power: n / 160, lower: n / 170, upper: n / 150 })) }];
const longCaption =
  '2000 replications, seed 20261203; switchback-power 1.4.0 with a participant-level sign test and an exact sign-flip permutation test; design 3f2a9c01b7de, calibration delays 7 to 365 days.';

/** Ink width of one line of text as resvg draws it with the shipped TrueType files (an independent renderer). */
function resvgWidth(text: string, size: number): number {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="4000" height="200"><text x="10" y="150" font-family="'${FIGURE_FONT}'" font-size="${size}">${text}</text></svg>`;
  const box = new Resvg(svg, { font: { fontFiles: figureFontFiles(), loadSystemFonts: false, defaultFontFamily: FIGURE_FONT } }).getBBox();
  if (!box) throw new Error('nothing drawn');
  return box.width;
}

describe('figure text widths', () => {
  it('match what resvg draws with the shipped font (advance widths vs ink extent: within 1.5 % plus the end side bearings)', () => {
    for (const text of ['Power (share of replicates with p', 'Shaded: Wilson 95 % interval. Dashed lines: 80 % and 90 % power.', 'WWW mmm iii 0123456789', 'γ = 10, ε = 0.02, α = 0.05']) {
      const ours = textWidth(text, 100);
      // side bearings of the first and last glyph are part of the advance but not the ink: at 100 units they are under 15 units
      expect(Math.abs(ours - resvgWidth(text, 100)), text).toBeLessThan(0.015 * ours + 15);
    }
  });

  it('wraps a caption into lines no wider than the limit, keeping every word in order', () => {
    const lines = wrapText(longCaption, 300, 12);
    expect(lines.length).toBeGreaterThan(1);
    for (const l of lines) expect(textWidth(l, 12)).toBeLessThanOrEqual(300);
    expect(lines.join(' ')).toBe(longCaption);
  });

  it('breaks a single word longer than the line between characters rather than letting it run off', () => {
    const lines = wrapText(`hash ${'f'.repeat(120)}`, 200, 12);
    for (const l of lines) expect(textWidth(l, 12)).toBeLessThanOrEqual(200);
    expect(lines.join('').replace(/\s/g, '')).toBe(`hash${'f'.repeat(120)}`);
  });
});

describe('the power figure’s caption', () => {
  const svg = powerCurveSvg(series, { caption: longCaption, notes: ['Pooled McNemar test assumes independent pairs; with several probes per person, read the sign test instead.'] });
  const lines = [...svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)" font-size="(\d+)"[^>]* data-line="(\w+)">([^<]*)<\/text>/g)].map((m) => ({ x: Number(m[1]), size: Number(m[3]), kind: m[4], text: m[5] }));

  it('wraps inside the figure: no caption, note or caution line reaches the right edge', () => {
    expect(lines.filter((l) => l.kind === 'caption').length).toBeGreaterThan(1);
    for (const l of lines) expect(l.x + textWidth(l.text.replace(/&amp;/g, '&'), l.size, l.kind === 'note' ? 'semibold' : 'regular'), l.text).toBeLessThanOrEqual(FIGURE.width - 24);
  });

  it('grows the figure by one line height per extra line, keeping the plot', () => {
    const height = Number(/viewBox="0 0 650 ([\d.]+)"/.exec(svg)![1]);
    expect(height).toBe(FIGURE.height + 15 * (lines.length - 1));
  });

  it('always carries the caution that these are estimates from simulated hypothetical choices, not an assessment', () => {
    const plain = powerCurveSvg(series);
    const caution = [...plain.matchAll(/data-line="caution">([^<]*)</g)].map((m) => m[1]).join(' ');
    expect(caution.replace(/&amp;/g, '&')).toBe(FIGURE_CAUTION);
    expect(FIGURE_CAUTION).toMatch(/not a clinical assessment/);
  });

  it('names its font quoted, since an unquoted family name with a digit is invalid CSS and falls back to a serif', () => {
    expect(svg).toContain(`font-family="'${FIGURE_FONT}', sans-serif"`);
  });
});

describe('the SVG download carries its font', () => {
  it('embeds each WOFF2 subset byte for byte as a data URL in @font-face rules', () => {
    const css = embeddedFontCss();
    const svg = powerCurveSvg(series, { fontCss: css });
    expect(svg).toContain('<defs><style>@font-face{');
    const urls = [...svg.matchAll(/font-family:'([^']+)';font-style:normal;font-weight:(\d+);unicode-range:[^;]+;src:url\(data:font\/woff2;base64,([A-Za-z0-9+/=]+)\) format\('woff2'\)/g)];
    expect(urls.map((m) => [m[1], Number(m[2])])).toEqual(EMBEDDED_FONT_FILES.map((f) => [FIGURE_FONT, f.weight]));
    urls.forEach((m, i) => {
      const bytes = Buffer.from(m[3], 'base64');
      expect(bytes.subarray(0, 4).toString('latin1')).toBe('wOF2'); // WOFF2 signature (W3C WOFF 2.0 §3)
      expect(bytes.equals(readFileSync(path.join(process.cwd(), 'fonts', EMBEDDED_FONT_FILES[i].file)))).toBe(true);
    });
  });

  it('still parses and renders with resvg, and leaves the on-page figure without the embedded font', () => {
    const svg = powerCurveSvg(series, { fontCss: embeddedFontCss() });
    expect(() => new Resvg(svg, { font: { fontFiles: figureFontFiles(), loadSystemFonts: false, defaultFontFamily: FIGURE_FONT } }).render()).not.toThrow();
    expect(powerCurveSvg(series)).not.toContain('@font-face');
  });
});
