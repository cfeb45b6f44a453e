import { readFileSync } from 'node:fs';
import path from 'node:path';
import { FIGURE_FONT } from '@/lib/shared/figures/power-curve';

/** The WOFF2 subsets an SVG download embeds: Latin and Greek (α, β, γ, ε), regular and semibold, with the ranges each covers. */
export const EMBEDDED_FONT_FILES = [
  { file: 'source-sans-3-latin-400-normal.woff2', weight: 400, range: 'U+0000-00FF,U+0131,U+0152-0153,U+02BB-02BC,U+02C6,U+02DA,U+02DC,U+2000-206F,U+20AC,U+2122,U+2191,U+2193,U+2212,U+2215,U+FEFF,U+FFFD' },
  { file: 'source-sans-3-latin-600-normal.woff2', weight: 600, range: 'U+0000-00FF,U+0131,U+0152-0153,U+02BB-02BC,U+02C6,U+02DA,U+02DC,U+2000-206F,U+20AC,U+2122,U+2191,U+2193,U+2212,U+2215,U+FEFF,U+FFFD' },
  { file: 'source-sans-3-greek-400-normal.woff2', weight: 400, range: 'U+0370-0377,U+037A-037F,U+0384-038A,U+038C,U+038E-03A1,U+03A3-03FF' },
  { file: 'source-sans-3-greek-600-normal.woff2', weight: 600, range: 'U+0370-0377,U+037A-037F,U+0384-038A,U+038C,U+038E-03A1,U+03A3-03FF' },
] as const;

let cached: string | null = null;

/**
 * @font-face rules carrying the figure font itself (base64 WOFF2, about 65 kB in all), so an SVG
 * download renders in Source Sans 3 on any machine instead of a fallback serif. The font is
 * under the SIL Open Font License (fonts/source-sans-3-OFL.txt), which allows embedding.
 */
export function embeddedFontCss(): string {
  if (cached) return cached;
  const dir = path.join(process.cwd(), 'fonts');
  cached = EMBEDDED_FONT_FILES.map(
    (f) =>
      `@font-face{font-family:'${FIGURE_FONT}';font-style:normal;font-weight:${f.weight};unicode-range:${f.range};` +
      `src:url(data:font/woff2;base64,${readFileSync(path.join(dir, f.file)).toString('base64')}) format('woff2');}`,
  ).join('');
  return cached;
}
