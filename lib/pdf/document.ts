import "server-only";
import PDFDocument from "pdfkit";

// A small document builder over pdfkit for the reports the server generates (the field report, the
// case evidence file). Built-in Helvetica only, so nothing is downloaded and no font is embedded; text
// is mapped to the characters Helvetica's WinAnsi encoding can show. Letter paper, one column.

export interface PdfMeta {
  title: string;
  subject?: string;
  author?: string;
  /** Shown in the footer of every page; defaults to now. */
  generatedAt?: Date;
  /** Footer text of one page; defaults to "Page n of N · Generated <ISO time>". */
  footer?: (page: number, pageCount: number, generatedAt: Date) => string;
}

export type Align = "left" | "center" | "right";

export interface PdfColumn {
  header: string;
  /** Relative width (weights are scaled to the page); default 1. */
  width?: number;
  align?: Align;
}

export interface PdfTable {
  columns: PdfColumn[];
  /** One string per column; missing cells print empty. */
  rows: string[][];
  /** Printed instead of the table when there are no rows. */
  empty?: string;
}

export interface PdfImageOptions {
  caption?: string;
  /** Largest width in points (72 per inch); default the text width. */
  maxWidth?: number;
  /** Largest height in points; default 320. */
  maxHeight?: number;
  /** Printed instead of the image when the bytes are not JPEG or PNG. */
  unsupportedText?: string;
}

export interface PdfWriter {
  /** Level 1 is the document title size; 2 a section; 3 a sub-section. */
  heading(text: string, level?: 1 | 2 | 3): void;
  paragraph(text: string, options?: { muted?: boolean; bold?: boolean }): void;
  /** Label and value pairs, label in bold in a narrow first column. */
  keyValues(pairs: readonly (readonly [string, string])[]): void;
  /** A ruled table; breaks across pages and repeats its header row on each page. */
  table(table: PdfTable): void;
  /** Embeds a JPEG or PNG scaled to fit; returns false (and prints unsupportedText) for other bytes. */
  image(bytes: Uint8Array, options?: PdfImageOptions): boolean;
  bulletList(items: readonly string[]): void;
  /** A shaded, ruled box for safety notes; the optional title prints in bold on its first line. */
  cautionBox(text: string, title?: string): void;
  /** A numbered list of the sources of the computations, in small type. */
  sources(list: readonly string[], title?: string): void;
  /** Vertical space, in lines of body text. */
  space(lines?: number): void;
  pageBreak(): void;
}

export type ImageKind = "jpeg" | "png";

/** JPEG or PNG by the file's signature; null for anything else. */
export function imageKindOf(bytes: Uint8Array): ImageKind | null {
  if (bytes.length > 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "jpeg";
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (bytes.length > 24 && png.every((b, i) => bytes[i] === b)) return "png";
  return null;
}

/** Pixel size read from the PNG header or the first JPEG frame header; null when not found. */
export function imageSizeOf(bytes: Uint8Array): { width: number; height: number } | null {
  const kind = imageKindOf(bytes);
  const u16 = (i: number) => ((bytes[i] ?? 0) << 8) | (bytes[i + 1] ?? 0);
  if (kind === "png") {
    const u32 = (i: number) => u16(i) * 65536 + u16(i + 2);
    return { width: u32(16), height: u32(20) };
  }
  if (kind === "jpeg") {
    let i = 2;
    while (i + 9 < bytes.length) {
      if (bytes[i] !== 0xff) return null;
      const marker = bytes[i + 1] ?? 0;
      // Start-of-frame markers C0–CF, except C4 (Huffman tables), C8 (reserved) and CC (arithmetic).
      if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
        return { height: u16(i + 5), width: u16(i + 7) };
      }
      i += 2 + u16(i + 2);
    }
  }
  return null;
}

// Characters outside WinAnsi that reports use, and a plain spelling Helvetica can print.
const REPLACEMENTS: Record<string, string> = {
  "≤": "<=",
  "≥": ">=",
  "≈": "~",
  "−": "-",
  "→": "->",
  "←": "<-",
  "✓": "yes",
  "✗": "no",
  "\u2009": " ",
  "\u202f": " ",
  "\u2011": "-",
};
const WIN_ANSI_EXTRA = new Set("€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ");

/** Text as Helvetica's WinAnsi encoding can show it (other characters become a plain spelling or ?). */
export function winAnsiText(text: string): string {
  let out = "";
  for (const ch of text) {
    const code = ch.codePointAt(0) ?? 0;
    if (ch === "\n" || (code >= 0x20 && code <= 0x7e) || (code >= 0xa0 && code <= 0xff)) out += ch;
    else if (WIN_ANSI_EXTRA.has(ch)) out += ch;
    else if (ch in REPLACEMENTS) out += REPLACEMENTS[ch];
    else if (ch === "\t") out += " ";
    else if (code < 0x20) continue;
    else out += "?";
  }
  return out;
}

const FONT = "Helvetica";
const BOLD = "Helvetica-Bold";
const BODY_SIZE = 10;
const SMALL_SIZE = 8;
const INK = "#1f1a14";
const MUTED = "#5b5247";
const RULE = "#b9ae9f";
const SHADE = "#f1ece4";
const CAUTION_FILL = "#fff4d6";
const CAUTION_RULE = "#a86a00";
const HEADING_SIZES = { 1: 18, 2: 13, 3: 11 } as const;
const CELL_PAD = 3;

type Doc = PDFKit.PDFDocument;

function createWriter(doc: Doc): PdfWriter {
  const left = () => doc.page.margins.left;
  const textWidth = () => doc.page.width - doc.page.margins.left - doc.page.margins.right;
  const bottom = () => doc.page.height - doc.page.margins.bottom;
  const ensure = (height: number) => {
    if (doc.y + height > bottom()) doc.addPage();
  };
  const body = () => doc.font(FONT).fontSize(BODY_SIZE).fillColor(INK);

  return {
    heading(text, level = 2) {
      const size = HEADING_SIZES[level];
      const t = winAnsiText(text);
      doc.font(BOLD).fontSize(size);
      // Keep a heading with at least three lines of what follows it.
      ensure(doc.heightOfString(t, { width: textWidth() }) + BODY_SIZE * 4);
      if (doc.y > doc.page.margins.top + 1) doc.moveDown(level === 1 ? 0.2 : 0.6);
      doc.fillColor(INK).text(t, left(), doc.y, { width: textWidth() });
      doc.moveDown(0.3);
      body();
    },

    paragraph(text, options = {}) {
      doc
        .font(options.bold ? BOLD : FONT)
        .fontSize(BODY_SIZE)
        .fillColor(options.muted ? MUTED : INK);
      doc.text(winAnsiText(text), left(), doc.y, { width: textWidth() });
      doc.moveDown(0.4);
      body();
    },

    keyValues(pairs) {
      const labelWidth = Math.min(150, textWidth() * 0.3);
      const valueWidth = textWidth() - labelWidth - 8;
      for (const [label, value] of pairs) {
        const l = winAnsiText(label);
        const v = winAnsiText(value || "-");
        doc.font(BOLD).fontSize(BODY_SIZE);
        const lh = doc.heightOfString(l, { width: labelWidth });
        doc.font(FONT);
        const vh = doc.heightOfString(v, { width: valueWidth });
        ensure(Math.max(lh, vh));
        const y = doc.y;
        doc.font(BOLD).fillColor(INK).text(l, left(), y, { width: labelWidth });
        doc.font(FONT).text(v, left() + labelWidth + 8, y, { width: valueWidth });
        doc.y = y + Math.max(lh, vh) + 2;
      }
      doc.x = left();
      doc.moveDown(0.4);
      body();
    },

    table({ columns, rows, empty }) {
      if (rows.length === 0) {
        if (empty) this.paragraph(empty, { muted: true });
        return;
      }
      const total = columns.reduce((sum, c) => sum + (c.width ?? 1), 0);
      const widths = columns.map((c) => ((c.width ?? 1) / total) * textWidth());
      const heightOf = (cells: string[], font: string) => {
        doc.font(font).fontSize(SMALL_SIZE + 0.5);
        return (
          Math.max(
            ...cells.map((cell, i) => doc.heightOfString(cell, { width: (widths[i] ?? 0) - CELL_PAD * 2 })),
          ) +
          CELL_PAD * 2
        );
      };
      const drawRow = (cells: string[], font: string, fill: string | null) => {
        const h = heightOf(cells, font);
        const y = doc.y;
        if (fill) doc.rect(left(), y, textWidth(), h).fill(fill);
        doc
          .font(font)
          .fontSize(SMALL_SIZE + 0.5)
          .fillColor(INK);
        let x = left();
        cells.forEach((cell, i) => {
          const w = widths[i] ?? 0;
          doc.text(cell, x + CELL_PAD, y + CELL_PAD, {
            width: w - CELL_PAD * 2,
            align: columns[i]?.align ?? "left",
          });
          x += w;
        });
        doc
          .moveTo(left(), y + h)
          .lineTo(left() + textWidth(), y + h)
          .lineWidth(0.5)
          .strokeColor(RULE)
          .stroke();
        doc.y = y + h;
      };
      const header = columns.map((c) => winAnsiText(c.header));
      const headerHeight = heightOf(header, BOLD);
      const prepared = rows.map((r) => columns.map((_, i) => winAnsiText(r[i] ?? "")));
      ensure(headerHeight + heightOf(prepared[0] ?? [], FONT));
      drawRow(header, BOLD, SHADE);
      for (const cells of prepared) {
        const h = heightOf(cells, FONT);
        if (doc.y + h > bottom()) {
          doc.addPage();
          drawRow(header, BOLD, SHADE);
        }
        drawRow(cells, FONT, null);
      }
      doc.x = left();
      doc.moveDown(0.6);
      body();
    },

    image(bytes, options = {}) {
      const size = imageKindOf(bytes) ? imageSizeOf(bytes) : null;
      if (!size || size.width === 0 || size.height === 0) {
        if (options.unsupportedText) this.paragraph(options.unsupportedText, { muted: true });
        return false;
      }
      const maxWidth = Math.min(options.maxWidth ?? textWidth(), textWidth());
      const maxHeight = options.maxHeight ?? 320;
      const scale = Math.min(maxWidth / size.width, maxHeight / size.height, 1);
      const w = size.width * scale;
      const h = size.height * scale;
      const caption = options.caption ? winAnsiText(options.caption) : null;
      doc.font(FONT).fontSize(SMALL_SIZE);
      const ch = caption ? doc.heightOfString(caption, { width: textWidth() }) + 4 : 0;
      ensure(h + ch + 4);
      const y = doc.y;
      doc.image(Buffer.from(bytes), left(), y, { width: w, height: h });
      doc.y = y + h + 4;
      if (caption) {
        doc.fillColor(MUTED).text(caption, left(), doc.y, { width: textWidth() });
      }
      doc.x = left();
      doc.moveDown(0.6);
      body();
      return true;
    },

    bulletList(items) {
      body();
      for (const item of items) {
        const t = winAnsiText(item);
        const h = doc.heightOfString(t, { width: textWidth() - 14 });
        ensure(h);
        const y = doc.y;
        doc.text("•", left() + 2, y, { width: 10 });
        doc.text(t, left() + 14, y, { width: textWidth() - 14 });
        doc.y = Math.max(doc.y, y + h) + 2;
      }
      doc.x = left();
      doc.moveDown(0.4);
    },

    cautionBox(text, title) {
      const pad = 8;
      const innerWidth = textWidth() - pad * 2 - 4;
      const t = winAnsiText(text);
      const titleText = title ? winAnsiText(title) : null;
      doc.font(BOLD).fontSize(BODY_SIZE);
      const th = titleText ? doc.heightOfString(titleText, { width: innerWidth }) + 3 : 0;
      doc.font(FONT);
      const bh = doc.heightOfString(t, { width: innerWidth });
      const h = th + bh + pad * 2;
      ensure(h);
      const y = doc.y;
      doc.rect(left(), y, textWidth(), h).fill(CAUTION_FILL);
      doc.rect(left(), y, 4, h).fill(CAUTION_RULE);
      if (titleText) {
        doc
          .font(BOLD)
          .fillColor(INK)
          .text(titleText, left() + pad + 4, y + pad, { width: innerWidth });
      }
      doc
        .font(FONT)
        .fillColor(INK)
        .text(t, left() + pad + 4, y + pad + th, { width: innerWidth });
      doc.y = y + h;
      doc.x = left();
      doc.moveDown(0.6);
      body();
    },

    sources(list, title) {
      if (title) this.heading(title, 3);
      doc.font(FONT).fontSize(SMALL_SIZE).fillColor(MUTED);
      list.forEach((source, i) => {
        const t = `${i + 1}. ${winAnsiText(source)}`;
        ensure(doc.heightOfString(t, { width: textWidth() }));
        doc.text(t, left(), doc.y, { width: textWidth() });
        doc.moveDown(0.2);
      });
      doc.moveDown(0.4);
      body();
    },

    space(lines = 1) {
      doc.moveDown(lines);
    },

    pageBreak() {
      doc.addPage();
    },
  };
}

function defaultFooter(page: number, pageCount: number, generatedAt: Date) {
  return `Page ${page} of ${pageCount} · Generated ${generatedAt.toISOString().replace(/\.\d+Z$/, "Z")}`;
}

/**
 * Builds a PDF by calling `build` with a writer, then stamps every page's footer (page n of N and the
 * generation time). Resolves to the file's bytes; rejects when `build` throws.
 */
export async function renderPdf(
  meta: PdfMeta,
  build: (w: PdfWriter) => void | Promise<void>,
): Promise<Uint8Array> {
  const generatedAt = meta.generatedAt ?? new Date();
  const doc = new PDFDocument({
    size: "LETTER",
    margins: { top: 54, bottom: 60, left: 54, right: 54 },
    bufferPages: true,
    lang: "en-US",
    displayTitle: true,
    // pdfkit hashes every info entry, so absent ones must be left out rather than undefined.
    info: {
      Title: winAnsiText(meta.title),
      ...(meta.subject ? { Subject: winAnsiText(meta.subject) } : {}),
      ...(meta.author ? { Author: winAnsiText(meta.author) } : {}),
      Creator: "Trenchbook",
      CreationDate: generatedAt,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Uint8Array>((resolve, reject) => {
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(new Uint8Array(Buffer.concat(chunks))));
    doc.on("error", reject);
  });
  doc.font(FONT).fontSize(BODY_SIZE).fillColor(INK);
  try {
    await build(createWriter(doc));
  } catch (err) {
    doc.end();
    await done.catch(() => undefined);
    throw err;
  }
  const footer = meta.footer ?? defaultFooter;
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Writing below the bottom margin would start a new page; lift the margin while stamping.
    const margin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc
      .font(FONT)
      .fontSize(SMALL_SIZE)
      .fillColor(MUTED)
      .text(
        winAnsiText(footer(i - range.start + 1, range.count, generatedAt)),
        doc.page.margins.left,
        doc.page.height - margin + 24,
        {
          width: doc.page.width - doc.page.margins.left - doc.page.margins.right,
          align: "center",
          lineBreak: false,
        },
      );
    doc.page.margins.bottom = margin;
  }
  doc.end();
  return done;
}
