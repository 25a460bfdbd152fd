import * as echarts from "echarts";
import type PDFDocument from "pdfkit";
import SVGtoPDF from "svg-to-pdfkit";
import { withLegendRoom } from "~/charts/legend-room";
import type { ChartOption } from "~/charts/theme";
import { formatNumber, fromSI, unitSymbol, type Quantity, type UnitSystem } from "~/domain/units";
import type { ResultCase } from "~/exchange";
import type { ReportFigures, ReportSnapshot } from "../snapshot";
import { face, fontRuns, splitSvgText, svgFont, type Subset, type Weight } from "./fonts.server";

/*
 * The report's page layout: the A4 page and its margins, colours, and the Writer that sets
 * text, headings, tables, label–value facts and server-rendered charts with page breaks. Each
 * section of the report (one module per section beside this one) writes through it.
 */

// ---------------------------------------------------------------- page and type

export const PAGE = { width: 595.28, height: 841.89 };
export const M = { top: 54, bottom: 46, left: 46, right: 46 };
export const W = PAGE.width - M.left - M.right;
export const BOTTOM = PAGE.height - M.bottom;
export const INK = "#17202b";
export const MUTED = "#4d5a69";
export const LINE = "#cfd6df";
export const SOFT = "#eef1f5";
export const ACCENT = "#1d5b8f";
export const WARN = "#9a5b00";

export interface TextOptions {
  size?: number;
  weight?: Weight;
  italic?: boolean;
  color?: string;
  width?: number;
  align?: "left" | "right" | "center";
  lineGap?: number;
  /** Single line: no wrapping (table numbers). */
  oneLine?: boolean;
}

export interface Column {
  header: string;
  width: number;
  align?: "left" | "right";
}

export class Writer {
  section = 0;
  figure = 0;
  constructor(readonly doc: PDFKit.PDFDocument) {}

  get y() {
    return this.doc.y;
  }
  set y(v: number) {
    this.doc.y = v;
  }

  private use(subset: Subset, o: TextOptions) {
    this.doc.font(face(o.weight ?? 400, subset, o.italic)).fontSize(o.size ?? 9);
  }

  widthOf(text: string, o: TextOptions = {}): number {
    let w = 0;
    for (const r of fontRuns(text)) {
      this.use(r.subset, o);
      w += this.doc.widthOfString(r.text);
    }
    return w;
  }

  heightOf(text: string, width: number, o: TextOptions = {}): number {
    // Measured in the latin face: the subsets share the family's metrics.
    this.use("latin", o);
    return this.doc.heightOfString(text || " ", { width, lineGap: o.lineGap ?? 0.8 });
  }

  /** Writes text at (x, y) in the faces its characters need; returns the height used. */
  text(text: string, x: number, y: number, o: TextOptions = {}): number {
    const doc = this.doc;
    doc.fillColor(o.color ?? INK);
    const runs = fontRuns(text);
    const width = o.width ?? W;
    if (runs.length === 1 && !o.oneLine) {
      this.use(runs[0]!.subset, o);
      doc.text(text, x, y, { width, align: o.align ?? "left", lineGap: o.lineGap ?? 0.8 });
      return this.heightOf(text, width, o);
    }
    if (o.oneLine || (o.align && o.align !== "left")) {
      const total = this.widthOf(text, o);
      let cx = o.align === "right" ? x + width - total : o.align === "center" ? x + (width - total) / 2 : x;
      for (const r of runs) {
        this.use(r.subset, o);
        doc.text(r.text, cx, y, { lineBreak: false });
        cx += doc.widthOfString(r.text);
      }
      return this.heightOf("X", width, o);
    }
    const h = this.heightOf(text, width, o);
    runs.forEach((r, i) => {
      this.use(r.subset, o);
      const opts = { width, lineGap: o.lineGap ?? 0.8, continued: i < runs.length - 1 };
      if (i === 0) doc.text(r.text, x, y, opts);
      else doc.text(r.text, opts);
    });
    return h;
  }

  newPage() {
    this.doc.addPage();
    this.y = M.top;
  }

  /** Starts a new page when fewer than `h` points are left. */
  ensure(h: number) {
    if (this.y + h > BOTTOM) this.newPage();
  }

  heading(title: string, opts: { newPage?: boolean; keep?: number } = {}) {
    if (opts.newPage) this.newPage();
    else this.ensure(opts.keep ?? 90);
    this.section++;
    if (this.y > M.top + 1) this.y += 8;
    const y = this.y;
    this.text(`${this.section}`, M.left, y, { size: 13, weight: 600, color: ACCENT, oneLine: true });
    this.text(title, M.left + 20, y, { size: 13, weight: 600, oneLine: true });
    this.doc.moveTo(M.left, y + 18).lineTo(M.left + W, y + 18).lineWidth(0.6).strokeColor(INK).stroke();
    this.y = y + 25;
  }

  subheading(title: string, keep = 60) {
    this.ensure(keep);
    this.y += 4;
    this.text(title, M.left, this.y, { size: 10, weight: 600, oneLine: true });
    this.y += 15;
  }

  para(text: string, o: TextOptions = {}) {
    const size = o.size ?? 8.8;
    const h = this.heightOf(text, o.width ?? W, { ...o, size, lineGap: 1.4 });
    this.ensure(Math.min(h, 60));
    this.text(text, M.left, this.y, { ...o, size, lineGap: 1.4 });
    this.y += 4;
  }

  bullets(items: string[], o: TextOptions = {}) {
    for (const item of items) {
      const size = o.size ?? 8.8;
      const h = this.heightOf(item, W - 12, { size, lineGap: 1.4 });
      this.ensure(Math.min(h, 40));
      const y = this.y;
      this.text("•", M.left + 2, y, { size, color: MUTED, oneLine: true });
      this.text(item, M.left + 12, y, { ...o, size, width: W - 12, lineGap: 1.4 });
      this.y += 2.5;
    }
    this.y += 2;
  }

  /**
   * A dense table: header on a tinted band, hairline rules, numbers right-aligned (Source Sans 3's
   * default figures are tabular: every digit has the same advance). Rows never split; on a page
   * break the header is drawn again with the caption marked as continued.
   */
  table(columns: Column[], rows: string[][], opts: { size?: number; caption?: string; header?: boolean; rowColor?: (i: number) => string | undefined; boldFirst?: boolean } = {}) {
    const size = opts.size ?? 7.6;
    const pad = 2.2;
    const fill = W - columns.reduce((a, c) => a + c.width, 0);
    const cols = columns.map((c) => ({ ...c, width: c.width === 0 ? fill : c.width }));
    const showHeader = opts.header !== false;
    const headerHeight = showHeader ? Math.max(...cols.map((c) => this.heightOf(c.header, c.width - 2 * pad, { size, weight: 600 }))) + 2 * pad : 0;
    const drawHeader = (continued: boolean) => {
      if (opts.caption) {
        this.text(continued ? `${opts.caption} (continued)` : opts.caption, M.left, this.y, { size: 8, weight: 600, color: MUTED, oneLine: true });
        this.y += 12;
      }
      if (!showHeader) return;
      const y = this.y;
      this.doc.rect(M.left, y, W, headerHeight).fillColor(SOFT).fill();
      let x = M.left;
      for (const c of cols) {
        this.text(c.header, x + pad, y + pad, { size, weight: 600, width: c.width - 2 * pad, align: c.align === "right" ? "right" : "left", color: INK });
        x += c.width;
      }
      this.doc.moveTo(M.left, y + headerHeight).lineTo(M.left + W, y + headerHeight).lineWidth(0.6).strokeColor(INK).stroke();
      this.y = y + headerHeight;
    };
    const heights = rows.map((r) => Math.max(...cols.map((c, i) => this.heightOf(r[i] ?? "", c.width - 2 * pad, { size }))) + 2 * pad);
    // A table never starts with fewer than five rows (or all of them) at the foot of a page.
    this.ensure((opts.caption ? 12 : 0) + headerHeight + heights.slice(0, 5).reduce((a, b) => a + b, 0));
    drawHeader(false);
    rows.forEach((r, ri) => {
      const h = heights[ri]!;
      if (this.y + h > BOTTOM) {
        this.newPage();
        drawHeader(true);
      }
      const y = this.y;
      let x = M.left;
      const color = opts.rowColor?.(ri);
      cols.forEach((c, ci) => {
        const cell = r[ci] ?? "";
        const o: TextOptions = { size, width: c.width - 2 * pad, color: color ?? INK, weight: opts.boldFirst && ci === 0 ? 600 : 400 };
        this.text(cell, x + pad, y + pad, { ...o, align: c.align ?? "left" });
        x += c.width;
      });
      this.doc.moveTo(M.left, y + h).lineTo(M.left + W, y + h).lineWidth(0.3).strokeColor(LINE).stroke();
      this.y = y + h;
    });
    this.y += 8;
  }

  /** Label–value pairs in two columns of pairs. */
  facts(pairs: [string, string][], labelWidth = 112) {
    this.table(
      [
        { header: "", width: labelWidth },
        { header: "", width: 0 },
      ],
      pairs.map(([k, v]) => [k, v]),
      { header: false, size: 8.6, boldFirst: true },
    );
  }

  /**
   * An ECharts option rendered on the server as SVG and embedded as vectors. The chart is laid
   * out at 1.4 px per point so its 11–13 px text prints at about 8–9 pt.
   */
  chart(option: Record<string, unknown>, height: number, width = W, x = M.left) {
    const scale = 1.4;
    this.figure++;
    const title = (option.title as { text?: string } | undefined)?.text ?? "";
    this.text(`Figure ${this.figure}. ${title}`, x, this.y, { size: 8.4, weight: 600, oneLine: true });
    this.y += 12;
    const grid = option.grid as { top?: number } | undefined;
    // The caption above replaces the chart's own title, so the legend moves up into its place.
    const laidOut = {
      ...option,
      title: { ...(option.title as object), show: false },
      legend: { ...(option.legend as object), top: 0 },
      grid: { ...grid, top: 34 },
    };
    const chart = echarts.init(null, null, { renderer: "svg", ssr: true, width: Math.round(width * scale), height: Math.round(height * scale) });
    try {
      chart.setOption({ ...withLegendRoom(laidOut as ChartOption, Math.round(width * scale)), animation: false });
      const svg = splitSvgText(chart.renderToSVGString());
      SVGtoPDF(this.doc as unknown as typeof PDFDocument, svg, x, this.y, {
        width,
        height,
        preserveAspectRatio: "xMinYMin meet",
        fontCallback: (family, bold, italic) => svgFont(family, bold, italic),
      });
    } finally {
      chart.dispose();
    }
    this.y += height + 8;
  }
}

/** A UTC time as the report prints it: 2026-12-01 09:30:00 UTC. */
export const utc = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;

/** A quantity in the report's display units, without its symbol. */
export type Fmt = (qty: Quantity, si: number | null | undefined, sig?: number) => string;
/** The symbol of a quantity in the report's display units. */
export type Sym = (qty: Quantity) => string;

/** What every section of the report is written from. */
export interface Section {
  w: Writer;
  s: ReportSnapshot;
  figures: ReportFigures;
  units: UnitSystem;
  q: Fmt;
  sym: Sym;
  /** The critical case: the largest root bending moment magnitude. */
  crit: ResultCase;
}

/** The display-unit formatters of a report, in the units its basis chose. */
export function formatters(units: UnitSystem): { q: Fmt; sym: Sym } {
  const q: Fmt = (qty, si, sig = 4) => {
    if (si === null || si === undefined) return formatNumber(si, sig);
    const v = fromSI(units, qty, si);
    // Integration round-off at the tip (|v| below the last printed digit) prints as 0, not "-0".
    return formatNumber(Math.abs(v) < 5e-7 ? 0 : v, sig);
  };
  return { q, sym: (qty) => unitSymbol(units, qty) };
}

/** Header and footer on every buffered page, written last so the page count is known. */
export function decorate(doc: PDFKit.PDFDocument, s: ReportSnapshot) {
  const w = new Writer(doc);
  const range = doc.bufferedPageRange();
  const total = range.count;
  for (let i = range.start; i < range.start + total; i++) {
    doc.switchToPage(i);
    // Writing into the margins must not start a new page.
    const saved = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    if (i > range.start) {
      w.text("Spanwright", M.left, 26, { size: 8, weight: 600, oneLine: true });
      w.text(`${s.case.reference} · ${s.case.title}`, M.left + 50, 26, { size: 8, color: MUTED, width: W - 200, oneLine: true });
      w.text(s.organisation, M.left, 26, { size: 8, color: MUTED, width: W, align: "right" });
      doc.moveTo(M.left, 38).lineTo(M.left + W, 38).lineWidth(0.4).strokeColor(LINE).stroke();
    }
    doc.moveTo(M.left, PAGE.height - 34).lineTo(M.left + W, PAGE.height - 34).lineWidth(0.4).strokeColor(LINE).stroke();
    w.text(`Report ${s.reportNumber} v${s.version} · inputs ${s.inputHash.slice(0, 16)} · page ${i - range.start + 1} of ${total}`, M.left, PAGE.height - 28, { size: 7.6, color: MUTED, oneLine: true });
    w.text(`Issued ${utc(s.issuedAt)}`, M.left, PAGE.height - 28, { size: 7.6, color: MUTED, width: W, align: "right" });
    doc.page.margins.bottom = saved;
  }
}
