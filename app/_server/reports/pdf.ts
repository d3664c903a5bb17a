// The look every Tidewell PDF shares: A4, the fonts the app ships (app/fonts; the same faces as
// WOFF, because fontkit's subsetter breaks on WOFF2 composite glyphs such as "µ"), a header band, wrapped tables that break across pages, and a footer with the
// page number and the report's limits on every page.
import fs from "node:fs";
import path from "node:path";
import PDFDocument from "pdfkit";

const FONT_DIR = path.join(process.cwd(), "app/fonts");
const FONTS = {
  regular: "inter-latin-400-normal.woff",
  medium: "inter-latin-500-normal.woff",
  bold: "inter-latin-700-normal.woff",
  mono: "jetbrains-mono-latin-400-normal.woff",
} as const;
export type FontName = keyof typeof FONTS;

let fontCache: Record<FontName, Buffer> | null = null;
function fontData(): Record<FontName, Buffer> {
  fontCache ??= Object.fromEntries(Object.entries(FONTS).map(([k, file]) => [k, fs.readFileSync(path.join(FONT_DIR, file))])) as Record<FontName, Buffer>;
  return fontCache;
}

export const COLOR = { ink: "#1c1f1e", soft: "#4a504e", faint: "#7b827f", line: "#dcdad3", sunk: "#f1f0ec", accent: "#13524a", accentSoft: "#d3f3ec", ok: "#2f7d4f", bad: "#b42318", warn: "#a45d00" };
const MARGIN = 48;
const FOOTER_H = 46;

export type Doc = PDFKit.PDFDocument;

export interface ReportMeta {
  title: string;
  subtitle: string;
  /** Lines under the title: organisation, site, time zone, period, who generated it and when. */
  facts: [string, string][];
  footerNote: string;
}

/** A new A4 document with Tidewell's fonts, and a function that finishes it into bytes. */
export function newReport(meta: ReportMeta): { doc: Doc; finish: () => Promise<Buffer> } {
  const fonts = fontData();
  const doc = new PDFDocument({
    size: "A4",
    margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN + FOOTER_H },
    bufferPages: true,
    font: path.join(FONT_DIR, FONTS.regular),
    info: { Title: `${meta.title} — ${meta.subtitle}`, Author: "Tidewell", Subject: meta.title },
  });
  for (const [name, data] of Object.entries(fonts)) doc.registerFont(name, data);
  doc.font("regular").fillColor(COLOR.ink);
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  header(doc, meta);
  return {
    doc,
    finish: async () => {
      footers(doc, meta);
      doc.end();
      return done;
    },
  };
}

export function contentWidth(doc: Doc): number {
  return doc.page.width - doc.page.margins.left - doc.page.margins.right;
}

function bottomLimit(doc: Doc): number {
  return doc.page.height - doc.page.margins.bottom;
}

/** Starts a new page when less than `height` points are left. */
export function ensureSpace(doc: Doc, height: number) {
  if (doc.y + height > bottomLimit(doc)) doc.addPage();
}

function header(doc: Doc, meta: ReportMeta) {
  const x = doc.page.margins.left;
  const w = contentWidth(doc);
  // The mark: a tank cross-section with a wave line, as in the app.
  doc.save();
  doc.roundedRect(x, MARGIN, 26, 26, 5).fill(COLOR.accent);
  doc.roundedRect(x + 4.5, MARGIN + 5, 17, 15.5, 3).lineWidth(1.6).stroke("#ffffff");
  doc.path(`M${x + 6} ${MARGIN + 13.5} q2.3 -2 4.6 0 t4.6 0 t4.6 0 v4.5 a2 2 0 0 1 -2 2 h-10 a2 2 0 0 1 -2 -2z`).fill("#a8e6da");
  doc.restore();
  doc.font("bold").fontSize(13).fillColor(COLOR.accent).text("Tidewell", x + 34, MARGIN + 6, { lineBreak: false });
  doc.font("regular").fontSize(8.5).fillColor(COLOR.soft).text("Calibration record", x, MARGIN + 9, { width: w, align: "right" });
  doc.moveTo(x, MARGIN + 36).lineTo(x + w, MARGIN + 36).lineWidth(0.8).stroke(COLOR.line);

  doc.font("bold").fontSize(19).fillColor(COLOR.ink).text(meta.title, x, MARGIN + 50, { width: w });
  doc.font("regular").fontSize(11).fillColor(COLOR.soft).text(meta.subtitle, { width: w });
  doc.moveDown(0.6);
  keyValueGrid(doc, meta.facts, 2);
  doc.moveDown(0.4);
}

/** Label/value pairs in columns. */
export function keyValueGrid(doc: Doc, pairs: [string, string][], columns: number) {
  const x0 = doc.page.margins.left;
  const colW = contentWidth(doc) / columns;
  for (let i = 0; i < pairs.length; i += columns) {
    const row = pairs.slice(i, i + columns);
    const heights = row.map(([, v]) => doc.font("medium").fontSize(9.5).heightOfString(v, { width: colW - 12 }) + 12);
    const h = Math.max(...heights);
    ensureSpace(doc, h);
    const y = doc.y;
    row.forEach(([k, v], c) => {
      doc.font("regular").fontSize(7.5).fillColor(COLOR.faint).text(k.toUpperCase(), x0 + c * colW, y, { width: colW - 12, characterSpacing: 0.4 });
      doc.font("medium").fontSize(9.5).fillColor(COLOR.ink).text(v, x0 + c * colW, y + 10, { width: colW - 12 });
    });
    doc.x = x0;
    doc.y = y + h + 2;
  }
}

/** A section title; it moves to the next page with room for a few lines of what follows it. */
export function sectionHeading(doc: Doc, text: string) {
  ensureSpace(doc, 90);
  doc.moveDown(0.8);
  const x = doc.page.margins.left;
  doc.font("bold").fontSize(12.5).fillColor(COLOR.accent).text(text, x, doc.y, { width: contentWidth(doc) });
  doc.moveTo(x, doc.y + 2).lineTo(x + contentWidth(doc), doc.y + 2).lineWidth(0.6).stroke(COLOR.accent);
  doc.y += 8;
  doc.fillColor(COLOR.ink);
}

export function paragraph(doc: Doc, text: string, opts: { font?: FontName; size?: number; color?: string; indent?: number } = {}) {
  const x = doc.page.margins.left + (opts.indent ?? 0);
  const width = contentWidth(doc) - (opts.indent ?? 0);
  doc.font(opts.font ?? "regular").fontSize(opts.size ?? 9.5);
  ensureSpace(doc, Math.min(doc.heightOfString(text, { width }), 60));
  doc.fillColor(opts.color ?? COLOR.ink).text(text, x, doc.y, { width });
  doc.fillColor(COLOR.ink);
}

export interface Column {
  title: string;
  /** Share of the content width. */
  width: number;
  align?: "left" | "right";
  mono?: boolean;
}

/** A table with a shaded header; rows wrap and the header repeats after a page break. */
export function table(doc: Doc, columns: Column[], rows: string[][], opts: { size?: number } = {}) {
  const size = opts.size ?? 8.5;
  const x0 = doc.page.margins.left;
  const total = contentWidth(doc);
  const widths = columns.map((c) => c.width * total);
  const pad = 4;
  const drawHeader = () => {
    const h = size + 2 * pad + 2;
    ensureSpace(doc, h + 18);
    const y = doc.y;
    doc.rect(x0, y, total, h).fill(COLOR.sunk);
    let x = x0;
    columns.forEach((c, i) => {
      doc.font("medium").fontSize(size - 0.5).fillColor(COLOR.soft).text(c.title, x + pad, y + pad + 0.5, { width: widths[i] - 2 * pad, align: c.align ?? "left", lineBreak: false });
      x += widths[i];
    });
    doc.y = y + h;
  };
  drawHeader();
  for (const row of rows) {
    const heights = row.map((cell, i) => doc.font(columns[i].mono ? "mono" : "regular").fontSize(size).heightOfString(cell || " ", { width: widths[i] - 2 * pad }));
    const h = Math.max(...heights) + 2 * pad;
    if (doc.y + h > bottomLimit(doc)) {
      doc.addPage();
      drawHeader();
    }
    const y = doc.y;
    let x = x0;
    row.forEach((cell, i) => {
      doc.font(columns[i].mono ? "mono" : "regular").fontSize(size).fillColor(COLOR.ink).text(cell, x + pad, y + pad, { width: widths[i] - 2 * pad, align: columns[i].align ?? "left" });
      x += widths[i];
    });
    doc.moveTo(x0, y + h).lineTo(x0 + total, y + h).lineWidth(0.4).stroke(COLOR.line);
    doc.x = x0;
    doc.y = y + h;
  }
  doc.y += 4;
}

/** A coloured word with a shape (never colour alone): a filled dot for accepted, a cross for rejected. */
export function verdictTag(doc: Doc, x: number, y: number, status: string): number {
  const color = status === "accepted" ? COLOR.ok : status === "rejected" ? COLOR.bad : COLOR.soft;
  const word = status === "accepted" ? "ACCEPTED" : status === "rejected" ? "REJECTED" : status.toUpperCase().replace("_", " ");
  doc.font("bold").fontSize(8);
  const w = doc.widthOfString(word) + 22;
  doc.save();
  doc.roundedRect(x, y, w, 15, 3).lineWidth(0.9).stroke(color);
  if (status === "accepted") doc.circle(x + 8, y + 7.5, 2.8).fill(color);
  else {
    doc.moveTo(x + 5.5, y + 5).lineTo(x + 10.5, y + 10).moveTo(x + 10.5, y + 5).lineTo(x + 5.5, y + 10).lineWidth(1.4).stroke(color);
  }
  doc.restore();
  doc.font("bold").fontSize(8).fillColor(color).text(word, x + 15, y + 4, { lineBreak: false });
  doc.fillColor(COLOR.ink);
  return w;
}

function footers(doc: Doc, meta: ReportMeta) {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const x = doc.page.margins.left;
    const w = contentWidth(doc);
    const y = doc.page.height - MARGIN - FOOTER_H + 10;
    // Writing below the bottom margin would add a page; lift the margin while the footer is drawn.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.moveTo(x, y).lineTo(x + w, y).lineWidth(0.6).stroke(COLOR.line);
    doc.font("regular").fontSize(6.8).fillColor(COLOR.faint).text(meta.footerNote, x, y + 6, { width: w - 70 });
    doc.font("medium").fontSize(7.5).fillColor(COLOR.soft).text(`Page ${i - range.start + 1} of ${range.count}`, x + w - 70, y + 6, { width: 70, align: "right", lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
}

/** The limits every calibration report states, with the usual cautions. */
export const REPORT_LIMITS =
  "Generated by Tidewell from its own records: values are as captured from the probe's signal and the temperatures and buffer lots entered at the time. " +
  "It does not replace the equipment maker's instructions, an accredited laboratory's calibration, or the requirements of your certification scheme. " +
  "pH buffers, pH-up and pH-down solutions are corrosive: wear gloves and eye protection; glass probes break.";
