import { readFile } from 'node:fs/promises';
import { inflateSync } from 'node:zlib';
import fontkit from '@pdf-lib/fontkit';
import type { PDFDocument, PDFFont } from 'pdf-lib';

/**
 * The fonts printed files are set in: Inter, the app's own typeface, shipped with the app in
 * lib/reports/fonts (WOFF files copied from @fontsource/inter 5.3.0, SIL Open Font License 1.1,
 * see OFL.txt there). pdf-lib's standard fonts only encode WinAnsi, so a name like "Łukasz" or
 * "Ωmega" would throw; the embedded faces cover Latin, Latin Extended, Greek and Cyrillic.
 *
 * Why WOFF and not the WOFF2 files in app/fonts: fontkit cannot subset those (the variable
 * WOFF2 glyph table fails), and a WOFF file becomes a plain TrueType font by inflating each
 * table (W3C WOFF File Format 1.0, section 5), done here with node's zlib.
 */

const FONT_DIR = new URL('./fonts/', import.meta.url);
const SUBSETS = ['latin', 'latin-ext', 'greek', 'cyrillic'] as const;
/**
 * Each embedded subset's name, with the six-capital tag PDF gives subset fonts (ISO 32000-1,
 * 9.6.4 "Font Subsets"). Fixed rather than pdf-lib's random suffix, so one record always prints
 * to the same bytes.
 */
const TAGS: Record<(typeof SUBSETS)[number], string> = { latin: 'LA', 'latin-ext': 'LE', greek: 'GR', cyrillic: 'CY' };
export type Weight = 'regular' | 'bold';
const WEIGHT_FILE: Record<Weight, string> = { regular: '400', bold: '700' };

/** WOFF 1.0 → the TrueType/OpenType file it wraps (W3C WOFF File Format 1.0, sections 3–5). */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.length < 44 || woff.readUInt32BE(0) !== 0x774f4646) throw new Error('not a WOFF file');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const raw = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(raw) : raw;
    if (data.length !== origLength) throw new Error('a WOFF table does not inflate to its stated length');
    tables.push({ tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data });
  }
  // The sfnt table directory's binary-search fields (OpenType spec, "Table Directory").
  let entrySelector = 0;
  while (1 << (entrySelector + 1) <= numTables) entrySelector++;
  const searchRange = (1 << entrySelector) * 16;
  const headerLength = 12 + 16 * numTables;
  const out = Buffer.alloc(headerLength + tables.reduce((n, t) => n + ((t.data.length + 3) & ~3), 0));
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLength;
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    out.writeUInt32BE(t.tag, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += (t.data.length + 3) & ~3;
  });
  return out;
}

/** One embedded face and the characters it has. */
export interface Face {
  font: PDFFont;
  has(codePoint: number): boolean;
}

/** The faces of one weight, in the order a character is looked for. */
export type FaceSet = readonly Face[];

const sfntCache = new Map<string, Buffer>();

async function sfnt(subset: string, weight: Weight): Promise<Buffer> {
  const name = `inter-${subset}-${WEIGHT_FILE[weight]}-normal.woff`;
  let bytes = sfntCache.get(name);
  if (!bytes) {
    bytes = woffToSfnt(await readFile(new URL(name, FONT_DIR)));
    sfntCache.set(name, bytes);
  }
  return bytes;
}

/** Embeds both weights (subset to the characters used) into `doc`. */
export async function embedReportFonts(doc: PDFDocument): Promise<Record<Weight, FaceSet>> {
  doc.registerFontkit(fontkit);
  // One after the other: the order fonts are embedded in numbers their objects, and a fixed
  // order keeps the file the same from one rendering to the next.
  const load = async (weight: Weight): Promise<FaceSet> => {
    const faces: Face[] = [];
    for (const subset of SUBSETS) {
      const bytes = await sfnt(subset, weight);
      const parsed = fontkit.create(bytes);
      const tag = `CW${TAGS[subset]}${weight === 'bold' ? 'B' : 'R'}X`;
      const font = await doc.embedFont(bytes, { subset: true, customName: `${tag}+Inter-${weight === 'bold' ? 'Bold' : 'Regular'}` });
      faces.push({ font, has: (cp: number) => parsed.hasGlyphForCodePoint(cp) });
    }
    return faces;
  };
  return { regular: await load('regular'), bold: await load('bold') };
}
