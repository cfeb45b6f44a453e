import path from 'node:path';
import { Resvg } from '@resvg/resvg-js';
import { FIGURE, FIGURE_FONT } from '@/lib/shared/figures/power-curve';

/** The TrueType fonts shipped in fonts/ that figures are rendered with (resvg reads TTF/OTF, not WOFF2). */
export function figureFontFiles(): string[] {
  const dir = path.join(process.cwd(), 'fonts');
  return [path.join(dir, 'source-sans-3-400.ttf'), path.join(dir, 'source-sans-3-600.ttf')];
}

/**
 * Renders a figure SVG to PNG at `dpi` (default 300) with @resvg/resvg-js and the shipped
 * fonts only (no system fonts, so every server draws the same pixels), and records the
 * resolution in a pHYs chunk so programs that read it place the figure at its size in inches.
 */
export function figurePng(svg: string, dpi = 300): Buffer {
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'width', value: Math.round(FIGURE.inchesWide * dpi) },
    font: { fontFiles: figureFontFiles(), loadSystemFonts: false, defaultFontFamily: FIGURE_FONT },
    background: '#ffffff',
  });
  return withResolution(Buffer.from(resvg.render().asPng()), dpi);
}

const CRC_TABLE = (() => {
  const table = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    table[n] = c >>> 0;
  }
  return table;
})();

function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** Inserts (or replaces) the pHYs chunk (PNG spec §11.3.5.3: pixels per metre, unit 1) after IHDR. */
export function withResolution(png: Buffer, dpi: number): Buffer {
  const perMetre = Math.round(dpi / 0.0254);
  const body = Buffer.alloc(13);
  body.write('pHYs', 0, 'ascii');
  body.writeUInt32BE(perMetre, 4);
  body.writeUInt32BE(perMetre, 8);
  body.writeUInt8(1, 12);
  const chunk = Buffer.alloc(4 + 13 + 4);
  chunk.writeUInt32BE(9, 0);
  body.copy(chunk, 4);
  chunk.writeUInt32BE(crc32(body), 17);
  const parts: Buffer[] = [png.subarray(0, 8)];
  let offset = 8;
  while (offset < png.length) {
    const length = png.readUInt32BE(offset);
    const type = png.toString('ascii', offset + 4, offset + 8);
    const end = offset + 12 + length;
    if (type !== 'pHYs') parts.push(png.subarray(offset, end));
    if (type === 'IHDR') parts.push(chunk);
    offset = end;
  }
  return Buffer.concat(parts);
}

/** Width, height and pixels per metre of a PNG, read from its IHDR and pHYs chunks. */
export function pngInfo(png: Buffer): { width: number; height: number; pixelsPerMetre: number | null } {
  let pixelsPerMetre: number | null = null;
  let offset = 8;
  while (offset < png.length) {
    const length = png.readUInt32BE(offset);
    if (png.toString('ascii', offset + 4, offset + 8) === 'pHYs') pixelsPerMetre = png.readUInt32BE(offset + 8);
    offset += 12 + length;
  }
  return { width: png.readUInt32BE(16), height: png.readUInt32BE(20), pixelsPerMetre };
}
