import { PDFDocument, rgb, type PDFPage } from 'pdf-lib';
import { embedReportFonts, type FaceSet, type Weight } from './fonts';

/**
 * A small flowing-text writer over pdf-lib for printed files: headings, wrapped paragraphs,
 * bullet lists and ruled tables on A4 pages, breaking pages where the text runs out and
 * repeating a table's header on the next page. Characters go to the first embedded face that
 * has them (fonts.ts); one no face has prints as U+FFFD, so any text prints.
 */

/** A4 in PDF points (ISO 216: 210 × 297 mm; 1 pt = 1/72 in). */
const PAGE = { width: 595.28, height: 841.89 } as const;
const MARGIN = 50;
const FOOTER_SPACE = 28;
const INK = rgb(0.06, 0.09, 0.16);
const MUTED = rgb(0.33, 0.38, 0.45);
const LINE = rgb(0.6, 0.64, 0.7);

export interface TextStyle {
  size?: number;
  weight?: Weight;
  muted?: boolean;
}

export interface Column {
  title: string;
  /** Share of the text width. */
  share: number;
}

type Run = { text: string; face: number };

export interface PdfWriter {
  heading(text: string, level?: 1 | 2): void;
  paragraph(text: string, style?: TextStyle): void;
  bullets(lines: readonly string[], style?: TextStyle): void;
  /** Cells may hold several lines (`\n`); a row never splits across pages. */
  table(columns: readonly Column[], rows: readonly (readonly string[])[], style?: TextStyle): void;
  space(points: number): void;
  rule(): void;
  /** Writes `footer(page, pages)` at the foot of every page and answers the file. */
  finish(footer: (page: number, pages: number) => string): Promise<Uint8Array>;
}

export interface DocumentInfo {
  title: string;
  subject: string;
  /** Fixed dates make the same content give the same bytes. */
  date: Date;
}

export async function createPdfWriter(info: DocumentInfo): Promise<PdfWriter> {
  const doc = await PDFDocument.create({ updateMetadata: false });
  doc.setTitle(info.title);
  doc.setSubject(info.subject);
  doc.setAuthor('Cellwright');
  doc.setCreator('Cellwright');
  doc.setProducer('Cellwright (pdf-lib)');
  doc.setCreationDate(info.date);
  doc.setModificationDate(info.date);
  const faces = await embedReportFonts(doc);
  const width = PAGE.width - 2 * MARGIN;
  let page: PDFPage = doc.addPage([PAGE.width, PAGE.height]);
  let y = PAGE.height - MARGIN;

  // Which face prints a character, and its advance at size 1, per weight: asked once per
  // character (pdf-lib's own measuring lays the whole string out each time, far too slow for
  // wrapping word by word).
  const glyphs = new Map<FaceSet, Map<string, { face: number; out: string; advance: number }>>();
  const glyphOf = (ch: string, set: FaceSet) => {
    let table = glyphs.get(set);
    if (!table) glyphs.set(set, (table = new Map()));
    let g = table.get(ch);
    if (!g) {
      const face = set.findIndex((f) => f.has(ch.codePointAt(0)!));
      const out = face < 0 ? '\uFFFD' : ch;
      const at = Math.max(face, 0);
      g = { face: at, out, advance: set[at].font.widthOfTextAtSize(out, 1) };
      table.set(ch, g);
    }
    return g;
  };

  const runsOf = (text: string, set: FaceSet): Run[] => {
    const runs: Run[] = [];
    for (const ch of text) {
      const { face, out } = glyphOf(ch, set);
      const last = runs[runs.length - 1];
      if (last && last.face === face) last.text += out;
      else runs.push({ text: out, face });
    }
    return runs;
  };

  const measure = (text: string, set: FaceSet, size: number) => {
    let w = 0;
    for (const ch of text) w += glyphOf(ch, set).advance;
    return w * size;
  };

  /** Lines of at most `max` points; a word longer than a line (a hash) is cut where it must be. */
  const wrap = (text: string, set: FaceSet, size: number, max: number): string[] => {
    const lines: string[] = [];
    for (const para of text.replace(/\t/g, '  ').split('\n')) {
      let line = '';
      for (const word of para.split(/(?<=\s)/)) {
        const candidate = line + word;
        if (measure(candidate.trimEnd(), set, size) <= max) {
          line = candidate;
          continue;
        }
        if (line) lines.push(line.trimEnd());
        line = '';
        let rest = word;
        while (measure(rest.trimEnd(), set, size) > max) {
          let cut = 1;
          const chars = [...rest];
          while (cut < chars.length && measure(chars.slice(0, cut + 1).join(''), set, size) <= max) cut++;
          lines.push(chars.slice(0, cut).join(''));
          rest = chars.slice(cut).join('');
        }
        line = rest;
      }
      lines.push(line.trimEnd());
    }
    return lines;
  };

  const draw = (text: string, x: number, at: number, set: FaceSet, size: number, muted: boolean) => {
    let cx = x;
    for (const r of runsOf(text, set)) {
      page.drawText(r.text, { x: cx, y: at, size, font: set[r.face].font, color: muted ? MUTED : INK });
      cx += measure(r.text, set, size);
    }
  };

  const newPage = () => {
    page = doc.addPage([PAGE.width, PAGE.height]);
    y = PAGE.height - MARGIN;
  };
  const ensure = (height: number) => {
    if (y - height < MARGIN + FOOTER_SPACE) newPage();
  };
  const lineHeight = (size: number) => size * 1.35;

  const writeLines = (lines: string[], x: number, set: FaceSet, size: number, muted: boolean) => {
    for (const line of lines) {
      ensure(lineHeight(size));
      y -= lineHeight(size);
      draw(line, x, y + size * 0.3, set, size, muted);
    }
  };

  return {
    heading(text, level = 2) {
      const size = level === 1 ? 18 : 12.5;
      const lines = wrap(text, faces.bold, size, width);
      // Keep a heading with at least two lines of what follows it.
      ensure(lineHeight(size) * lines.length + 8 + lineHeight(10) * 2);
      y -= level === 1 ? 2 : 8;
      writeLines(lines, MARGIN, faces.bold, size, false);
      y -= 2;
    },
    paragraph(text, style = {}) {
      const size = style.size ?? 10;
      const set = faces[style.weight ?? 'regular'];
      writeLines(wrap(text, set, size, width), MARGIN, set, size, style.muted ?? false);
      y -= 3;
    },
    bullets(lines, style = {}) {
      const size = style.size ?? 10;
      const set = faces[style.weight ?? 'regular'];
      for (const item of lines) {
        const wrapped = wrap(item, set, size, width - 12);
        ensure(lineHeight(size));
        draw('•', MARGIN + 2, y - lineHeight(size) + size * 0.3, set, size, style.muted ?? false);
        writeLines(wrapped, MARGIN + 12, set, size, style.muted ?? false);
      }
      y -= 3;
    },
    table(columns, rows, style = {}) {
      const size = style.size ?? 9;
      const pad = 3;
      const total = columns.reduce((n, c) => n + c.share, 0);
      const widths = columns.map((c) => (c.share / total) * width);
      const xs = widths.map((_, i) => MARGIN + widths.slice(0, i).reduce((n, w) => n + w, 0));
      const layout = (cells: readonly string[], set: FaceSet) => cells.map((c, i) => wrap(c, set, size, widths[i] - 2 * pad));
      const rowHeight = (cells: string[][]) => Math.max(1, ...cells.map((c) => c.length)) * lineHeight(size) + 2 * pad;
      const drawRow = (cells: string[][], set: FaceSet, muted: boolean, strong: boolean) => {
        const h = rowHeight(cells);
        cells.forEach((lines, i) => {
          lines.forEach((line, j) => draw(line, xs[i] + pad, y - pad - (j + 1) * lineHeight(size) + size * 0.3, set, size, muted));
        });
        y -= h;
        page.drawLine({ start: { x: MARGIN, y }, end: { x: MARGIN + width, y }, thickness: strong ? 0.9 : 0.4, color: strong ? INK : LINE });
      };
      const header = layout(
        columns.map((c) => c.title),
        faces.bold,
      );
      const drawHeader = () => drawRow(header, faces.bold, true, true);
      const body = rows.map((r) => layout(r, faces.regular));
      ensure(rowHeight(header) + (body[0] ? rowHeight(body[0]) : 0));
      drawHeader();
      for (const cells of body) {
        const h = rowHeight(cells);
        if (y - h < MARGIN + FOOTER_SPACE) {
          newPage();
          drawHeader();
        }
        drawRow(cells, faces.regular, false, false);
      }
      y -= 6;
    },
    space(points) {
      y -= points;
    },
    rule() {
      ensure(8);
      y -= 4;
      page.drawLine({ start: { x: MARGIN, y }, end: { x: MARGIN + width, y }, thickness: 1.2, color: INK });
      y -= 4;
    },
    async finish(footer) {
      const pages = doc.getPages();
      pages.forEach((p, i) => {
        const saved = page;
        page = p;
        draw(footer(i + 1, pages.length), MARGIN, MARGIN - 6, faces.regular, 8, true);
        page = saved;
      });
      return doc.save();
    },
  };
}
