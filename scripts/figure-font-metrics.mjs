// Writes lib/shared/figures/figure-font-metrics.json: the advance width of each character the
// figures may use, read from the shipped TrueType files (fonts/source-sans-3-400.ttf and -600.ttf)
// by parsing their cmap (format 4) and hmtx tables. The figure code wraps captions with these
// widths, so a caption never runs past the figure's edge. Run: node scripts/figure-font-metrics.mjs
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..');

function tables(font) {
  const count = font.readUInt16BE(4);
  const out = {};
  for (let i = 0; i < count; i++) {
    const at = 12 + 16 * i;
    out[font.toString('ascii', at, at + 4)] = { offset: font.readUInt32BE(at + 8), length: font.readUInt32BE(at + 12) };
  }
  return out;
}

/** Code point → glyph id from the Windows Unicode BMP subtable (platform 3, encoding 1, format 4). */
function cmap4(font, cmap) {
  const count = font.readUInt16BE(cmap.offset + 2);
  for (let i = 0; i < count; i++) {
    const rec = cmap.offset + 4 + 8 * i;
    const platform = font.readUInt16BE(rec);
    const encoding = font.readUInt16BE(rec + 2);
    const sub = cmap.offset + font.readUInt32BE(rec + 4);
    if (platform !== 3 || encoding !== 1 || font.readUInt16BE(sub) !== 4) continue;
    const segX2 = font.readUInt16BE(sub + 6);
    const ends = sub + 14;
    const starts = ends + segX2 + 2;
    const deltas = starts + segX2;
    const offsets = deltas + segX2;
    return (code) => {
      for (let s = 0; s < segX2 / 2; s++) {
        const end = font.readUInt16BE(ends + 2 * s);
        if (code > end) continue;
        const start = font.readUInt16BE(starts + 2 * s);
        if (code < start) return 0;
        const delta = font.readInt16BE(deltas + 2 * s);
        const rangeOffset = font.readUInt16BE(offsets + 2 * s);
        if (rangeOffset === 0) return (code + delta) & 0xffff;
        const glyph = font.readUInt16BE(offsets + 2 * s + rangeOffset + 2 * (code - start));
        return glyph === 0 ? 0 : (glyph + delta) & 0xffff;
      }
      return 0;
    };
  }
  throw new Error('no format-4 Unicode cmap');
}

function widths(file) {
  const font = readFileSync(path.join(root, 'fonts', file));
  const t = tables(font);
  const unitsPerEm = font.readUInt16BE(t.head.offset + 18);
  const metrics = font.readUInt16BE(t.hhea.offset + 34);
  const glyphOf = cmap4(font, t.cmap);
  const advance = (glyph) => font.readUInt16BE(t.hmtx.offset + 4 * Math.min(glyph, metrics - 1));
  const codes = [];
  for (let c = 0x20; c <= 0x7e; c++) codes.push(c);
  for (let c = 0xa0; c <= 0xff; c++) codes.push(c);
  for (let c = 0x391; c <= 0x3c9; c++) codes.push(c); // Greek (α, β, γ, ε, ...)
  codes.push(0x2013, 0x2014, 0x2018, 0x2019, 0x201c, 0x201d, 0x2026, 0x2212, 0x2264, 0x2265, 0x2248, 0x2032);
  const out = {};
  for (const c of codes) {
    const glyph = glyphOf(c);
    if (glyph) out[String.fromCodePoint(c)] = advance(glyph);
  }
  return { unitsPerEm, widths: out };
}

const regular = widths('source-sans-3-400.ttf');
const semibold = widths('source-sans-3-600.ttf');
const json = { source: 'fonts/source-sans-3-400.ttf and fonts/source-sans-3-600.ttf (cmap format 4, hmtx)', unitsPerEm: regular.unitsPerEm, regular: regular.widths, semibold: semibold.widths };
writeFileSync(path.join(root, 'lib/shared/figures/figure-font-metrics.json'), `${JSON.stringify(json)}\n`);
console.log(`wrote ${Object.keys(regular.widths).length} regular and ${Object.keys(semibold.widths).length} semibold widths`);
