import metrics from './figure-font-metrics.json';

/**
 * Text measurement and wrapping for figures drawn as SVG strings, with the advance widths of
 * the shipped Source Sans 3 (read from its TrueType files by scripts/figure-font-metrics.mjs),
 * so a caption is broken into lines that fit the figure in the SVG download, in the PNG
 * (resvg renders with the same font files) and on the page.
 */
type Weight = 'regular' | 'semibold';

const TABLES: Record<Weight, Record<string, number>> = { regular: metrics.regular, semibold: metrics.semibold };
/** Width assumed for a character the table does not hold (a wide-ish 0.6 em, so wrapping errs short). */
const UNKNOWN = 0.6;

/** Width of `text` in SVG units at `size` (font-size in the same units). */
export function textWidth(text: string, size: number, weight: Weight = 'regular'): number {
  const table = TABLES[weight];
  let units = 0;
  for (const ch of text) units += table[ch] ?? UNKNOWN * metrics.unitsPerEm;
  return (units / metrics.unitsPerEm) * size;
}

/**
 * Breaks `text` into lines no wider than `width` at `size`, at spaces (a single word wider than
 * the line is broken between characters, so nothing ever runs past the edge).
 */
export function wrapText(text: string, width: number, size: number, weight: Weight = 'regular'): string[] {
  const lines: string[] = [];
  let line = '';
  const push = (word: string) => {
    const candidate = line ? `${line} ${word}` : word;
    if (textWidth(candidate, size, weight) <= width) {
      line = candidate;
      return;
    }
    if (line) lines.push(line);
    line = '';
    if (textWidth(word, size, weight) <= width) {
      line = word;
      return;
    }
    let piece = '';
    for (const ch of word) {
      if (textWidth(piece + ch, size, weight) > width && piece) {
        lines.push(piece);
        piece = '';
      }
      piece += ch;
    }
    line = piece;
  };
  for (const word of text.split(/\s+/).filter(Boolean)) push(word);
  if (line) lines.push(line);
  return lines;
}
