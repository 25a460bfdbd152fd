import { createRequire } from "node:module";
import * as echarts from "echarts";
import PDFDocument from "pdfkit";
import SVGtoPDF from "svg-to-pdfkit";
import unicodeRanges from "@fontsource/source-sans-3/unicode.json";
import { CATEGORY_LABELS, RULE_LABELS, SPANWISE_LABELS } from "~/domain/step-data";
import { formatNumber, formatQuantity, fromSI, unitSymbol, type Quantity, type UnitSystem } from "~/domain/units";
import { clOption, loadingOption, machCriticalOption, rulesOption } from "~/charts/distribution";
import { loadsOption, type LoadQuantity } from "~/charts/loads";
import { vnOption } from "~/charts/vn";
import { STEPS } from "~/domain/steps";
import { STEP_KEYS } from "~/domain/vocabulary";
import { wingGeometry, type WingStation } from "~/engine";
import type { ResultCase } from "~/exchange";
import { distributionView } from "~/services/distribution.server";
import { vnSets } from "~/services/envelope.server";
import { METHOD_STATEMENT as METHODS } from "~/domain/method-statement";
import type { ReportSnapshot, SignatureLine } from "./snapshot";

const G0 = 9.80665;

// ---------------------------------------------------------------- fonts

/**
 * @fontsource ships Source Sans 3 as unicode-range subsets: the latin file has no ł, ż, ć, the
 * latin-ext file has almost no basic Latin, and pdfkit has no glyph fallback. So every string is
 * cut into runs by the subset whose published range holds each character, and each run is set in
 * that subset's face. Greek is registered for α, β in headers and method names.
 */
const SUBSETS = ["latin", "latin-ext", "greek"] as const;
type Subset = (typeof SUBSETS)[number];
type Weight = 400 | 600;

const RANGES: Record<Subset, [number, number][]> = Object.fromEntries(
  SUBSETS.map((s) => [
    s,
    (unicodeRanges as Record<string, string>)[s]!.split(",").map((r) => {
      const [a, b] = r.replace(/^U\+/, "").split("-");
      return [parseInt(a!, 16), parseInt(b ?? a!, 16)] as [number, number];
    }),
  ]),
) as Record<Subset, [number, number][]>;

function subsetOf(cp: number): Subset {
  for (const s of SUBSETS) if (RANGES[s].some(([a, b]) => cp >= a && cp <= b)) return s;
  // Outside every registered subset: the latin face draws its missing-glyph box.
  return "latin";
}

/** The text cut into runs of one subset each, in order. */
export function fontRuns(text: string): { subset: Subset; text: string }[] {
  const out: { subset: Subset; text: string }[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    // Spaces and combining marks stay with the run they are in.
    const s = out.length > 0 && (cp === 0x20 || cp === 0x0304 || cp === 0x0308) ? out[out.length - 1]!.subset : subsetOf(cp);
    const last = out[out.length - 1];
    if (last && last.subset === s) last.text += ch;
    else out.push({ subset: s, text: ch });
  }
  return out;
}

const face = (weight: Weight, subset: Subset, italic = false) => `SS3-${weight}${italic ? "i" : ""}-${subset}`;

function registerFonts(doc: PDFKit.PDFDocument) {
  const require = createRequire(import.meta.url);
  for (const subset of SUBSETS) {
    for (const weight of [400, 600] as const) {
      for (const italic of [false, true]) {
        const file = require.resolve(`@fontsource/source-sans-3/files/source-sans-3-${subset}-${weight}-${italic ? "italic" : "normal"}.woff`);
        doc.registerFont(face(weight, subset, italic), file);
      }
    }
  }
}

/**
 * SVG text is given the same treatment: text holding characters outside the latin subset is cut
 * into tspans naming the subset, which the font callback below maps to the registered face.
 */
function splitSvgText(svg: string): string {
  return svg.replace(/(<text\b[^>]*>)([^<]*)(<\/text>)/g, (_whole, tag: string, content: string, close: string) => {
    // svg-to-pdfkit ignores paint-order, so a label's white halo would be painted over its fill.
    const open = /paint-order="stroke"/.test(tag) ? tag.replace(/ stroke(-width|-opacity|-miterlimit)?="[^"]*"/g, "") : tag;
    const runs = fontRuns(content);
    if (runs.length === 1 && runs[0]!.subset === "latin") return open + content + close;
    return open + runs.map((r) => `<tspan style="font-family:SS3-${r.subset}">${r.text}</tspan>`).join("") + close;
  });
}

function svgFont(family: string, bold: boolean, italic: boolean): string {
  const m = /SS3-(latin-ext|latin|greek)/.exec(family);
  return face(bold ? 600 : 400, (m?.[1] as Subset | undefined) ?? "latin", italic);
}

// ---------------------------------------------------------------- page and type

const PAGE = { width: 595.28, height: 841.89 };
const M = { top: 54, bottom: 46, left: 46, right: 46 };
const W = PAGE.width - M.left - M.right;
const BOTTOM = PAGE.height - M.bottom;
const INK = "#17202b";
const MUTED = "#4d5a69";
const LINE = "#cfd6df";
const SOFT = "#eef1f5";
const ACCENT = "#1d5b8f";
const WARN = "#9a5b00";

interface TextOptions {
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

interface Column {
  header: string;
  width: number;
  align?: "left" | "right";
}

class Writer {
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
    const xAxis = option.xAxis as { name?: string } | undefined;
    const grid = option.grid as { top?: number } | undefined;
    // The caption above replaces the chart's own title, so the legend moves up into its place;
    // span axes end at the tip rather than at the next round number.
    const laidOut = {
      ...option,
      title: { ...(option.title as object), show: false },
      legend: { ...(option.legend as object), top: 0 },
      grid: { ...grid, top: 34 },
      ...(xAxis?.name?.startsWith("Spanwise") ? { xAxis: { ...xAxis, max: "dataMax" } } : {}),
    };
    const chart = echarts.init(null, null, { renderer: "svg", ssr: true, width: Math.round(width * scale), height: Math.round(height * scale) });
    try {
      chart.setOption({ ...laidOut, animation: false });
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

// ---------------------------------------------------------------- wording


const VALIDITY: [string, string, string][] = [
  ["Prandtl–Glauert / Göthert", "Linearised subsonic flow", "M below the critical Mach number; thin sections, small angles"],
  ["Kármán–Tsien", "Tangent-gas hodograph correction", "M below the critical Mach number; not for the spanwise solve"],
  ["Laitone", "Local-Mach correction of Prandtl–Glauert", "M below the critical Mach number; singular fallback to Prandtl–Glauert"],
  ["Cp* (isentropic, γ = 1.4)", "Sonic pressure coefficient", "Defines the critical Mach number; perfect gas"],
  ["Lifting line", "Glauert Fourier series", "Unswept or slightly swept wings of moderate to high aspect ratio"],
  ["Vortex lattice", "Horseshoe vortices, 3/4-chord control points", "Attached flow, linear lift range; swept, tapered, cranked planforms"],
  ["Schrenk", "Mean of chord and ellipse", "Cross-check of the spanwise loading only; unswept wings"],
  ["Pratt gust formula", "Alleviated sharp-edged gust (NACA TN 2964)", "Part 23 gust loads; Part 25 preliminary only (25.341(a) asks for a dynamic analysis)"],
];

const STEP_LABEL: Record<string, string> = Object.fromEntries(STEPS.map((s) => [s.key, s.label]));

// ---------------------------------------------------------------- report

const utc = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;

/** The case whose root bending moment has the largest magnitude: the one the distribution pages show. */
export function criticalCase(cases: readonly ResultCase[]): ResultCase {
  return cases.reduce((a, b) => (Math.abs(b.root.bending) > Math.abs(a.root.bending) ? b : a));
}

/**
 * Renders the signed report of a case as an A4 PDF from its frozen snapshot: cover, basis and
 * scope, method statement, inputs with a to-scale planform, results (V–n, distributions of the
 * critical case, shear/bending/torsion envelopes, tables), flags and dispositions, cautions and
 * signatures, with a footer naming report, version, input hash and page on every page.
 *
 * Deterministic: the same snapshot gives the same bytes. Dates in the PDF come from `issuedAt`,
 * and pdfkit derives the document ID from the info dictionary (an MD5 of its entries), so nothing
 * depends on the clock or on chance. Display units follow the basis (SI or US customary).
 */
export async function renderReportPdf(s: ReportSnapshot, opts: { onProgress?: (pct: number, note: string) => void } = {}): Promise<Uint8Array> {
  const progress = opts.onProgress ?? (() => {});
  const issued = new Date(s.issuedAt);
  const doc = new PDFDocument({
    size: "A4",
    margins: M,
    bufferPages: true,
    autoFirstPage: true,
    pdfVersion: "1.7",
    lang: "en-GB",
    displayTitle: true,
    info: {
      Title: `${s.reportNumber} v${s.version} — ${s.case.reference} ${s.case.title}`,
      Author: s.organisation,
      Subject: `Wing loads report of case ${s.case.reference}`,
      Creator: "Spanwright",
      Producer: "Spanwright (pdfkit)",
      Keywords: `inputs ${s.inputHash}; engine ${s.engineVersion}`,
      CreationDate: issued,
      ModDate: issued,
    },
  });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const finished = new Promise<void>((resolve, reject) => {
    doc.on("end", () => resolve());
    doc.on("error", reject);
  });
  registerFonts(doc);
  const w = new Writer(doc);
  const units: UnitSystem = s.inputs.basis.units;
  const q = (qty: Quantity, si: number | null | undefined, sig = 4) => {
    if (si === null || si === undefined) return formatNumber(si, sig);
    const v = fromSI(units, qty, si);
    // Integration round-off at the tip (|v| below the last printed digit) prints as 0, not "-0".
    return formatNumber(Math.abs(v) < 5e-7 ? 0 : v, sig);
  };
  const sym = (qty: Quantity) => unitSymbol(units, qty);
  const crit = criticalCase(s.result.cases);

  progress(5, "Cover");
  cover(w, s, crit, units);

  progress(15, "Basis and method");
  basisAndScope(w, s, q, sym);
  methodStatement(w, s);

  progress(30, "Inputs");
  inputs(w, s, q, sym);

  progress(45, "V–n diagram");
  resultsVn(w, s, units, q, sym);

  progress(60, "Distributions of the critical case");
  resultsDistribution(w, s, crit, q, sym);

  progress(75, "Shear, bending and torsion");
  resultsLoads(w, s, crit, units, q, sym);

  progress(88, "Flags, cautions and signatures");
  flagsAndCautions(w, s);
  signatures(w, s);

  progress(95, "Page footers");
  decorate(doc, s);
  doc.end();
  await finished;
  progress(100, "Done");
  return new Uint8Array(Buffer.concat(chunks));
}

type Fmt = (qty: Quantity, si: number | null | undefined, sig?: number) => string;
type Sym = (qty: Quantity) => string;

function cover(w: Writer, s: ReportSnapshot, crit: ResultCase, units: UnitSystem) {
  const doc = w.doc;
  doc.rect(0, 0, PAGE.width, 6).fillColor(ACCENT).fill();
  w.text("Spanwright", M.left, 64, { size: 30, weight: 600, oneLine: true });
  w.text("Wing loads report", M.left, 102, { size: 12, color: MUTED, oneLine: true });
  w.text(s.organisation, M.left, 150, { size: 11, weight: 600, color: MUTED });
  w.text(s.case.title, M.left, 172, { size: 22, weight: 600, width: W, lineGap: 2 });
  w.y = Math.max(w.y, 200) + 6;
  w.text(`${s.case.reference} · ${s.programme.code} ${s.programme.name}`, M.left, w.y, { size: 11, color: MUTED });
  w.y += 6;
  if (s.case.description) w.para(s.case.description, { size: 9.5, color: MUTED });
  w.y += 14;
  w.facts([
    ["Report number", s.reportNumber],
    ["Version", `v${s.version}`],
    ["Issued", utc(s.issuedAt)],
    ["Organisation", s.organisation],
    ["Programme", `${s.programme.code} — ${s.programme.name}`],
    ["Aircraft", s.programme.aircraft],
    ["Case", `${s.case.reference} — ${s.case.title}`],
    ["Input hash (SHA-256)", s.inputHash],
    ["Engine version", `${s.engineVersion} (results ${s.result.engine}, ${s.result.schema})`],
    ["Load cases analysed", `${s.result.cases.length}`],
    ["Critical root bending", `${formatQuantity(units, "moment", crit.root.bending)} (case ${crit.id})`],
  ]);
  w.subheading("Step revisions this report is built from");
  const keys = [...STEP_KEYS.filter((k) => k in s.revisions), ...Object.keys(s.revisions).filter((k) => !(STEP_KEYS as readonly string[]).includes(k))];
  w.table(
    [
      { header: "Step", width: 0 },
      ...keys.map((k) => ({ header: STEP_LABEL[k] ?? k, width: 60, align: "right" as const })),
    ],
    [["Revision", ...keys.map((k) => `${s.revisions[k]}`)]],
    { size: 8.4, boldFirst: true },
  );
  const y = Math.max(w.y + 10, BOTTOM - 70);
  w.y = y;
  w.text(
    "This report sets out computed wing loads in support of the certification of the aircraft named above. It supports, and does not replace, what the certifying authority accepts; the applicable regulations and licensed engineering practice govern.",
    M.left,
    y,
    { size: 8.4, color: MUTED, lineGap: 1.4 },
  );
}

function basisAndScope(w: Writer, s: ReportSnapshot, q: Fmt, sym: Sym) {
  const b = s.inputs.basis;
  w.heading("Certification basis and scope", { newPage: true });
  w.facts([
    ["Category", CATEGORY_LABELS[b.category]],
    ["Regulation references", b.regulations],
    ["Units of this report", b.units === "SI" ? "SI (m, kg, N, m/s EAS); loads in kN and kN·m" : "US customary (ft, lb, lbf, kt EAS); loads in lbf and lbf·ft"],
    ["Design weights", `MTOW ${q("mass", b.mtow)} ${sym("mass")} · MZFW ${q("mass", b.mzfw)} ${sym("mass")} · minimum ${q("mass", b.minWeight)} ${sym("mass")}`],
    ["Design speeds (EAS)", `VS1 ${q("speed", b.vs1)} · VA ${q("speed", b.va)} · VC ${q("speed", b.vc)} · VD ${q("speed", b.vd)} ${sym("speed")}`],
    ["Altitudes", `${b.altitudes.map((a) => q("altitude", a, 5)).join(", ")} ${sym("altitude")} (ISA)`],
    ["Wing reference area", `${q("area", b.wingArea)} ${sym("area")}`],
    ["Aircraft CLmax", `${formatNumber(b.clMax)} positive, ${formatNumber(b.clMaxNegative)} negative (flaps up)`],
    ["Method choice", `${RULE_LABELS[s.inputs.envelope.compressibility]}; ${SPANWISE_LABELS[s.inputs.envelope.spanwise]}, ${s.inputs.envelope.stations} output stations per semispan`],
    ["Semispan structural mass", `${q("mass", s.inputs.loads.semispanMass)} ${sym("mass")} (inertia relief)`],
  ]);
  w.subheading("Scope");
  w.para(
    `This report covers the wing loads of case ${s.case.reference}: the spanwise lift and pitching-moment distributions, corrected for compressibility, and the shear force, bending moment and torsion about the wing reference axis along the semispan for every load case of the manoeuvre and gust envelope listed in section 3, with their envelope. Loads are limit loads (no factor of safety applied) for the symmetric, flaps-up, clean-wing conditions given.`,
  );
  w.para("It does not cover: the fuselage, tail or control surfaces; asymmetric, rolling, yawing or ground conditions; high-lift devices; engine, fuel and landing-gear point loads other than the distributed structural mass; aeroelastic effects, dynamic gust response, flutter, fatigue or damage tolerance; stress analysis or the strength of the structure; transonic or supercritical flow.");
}

function methodStatement(w: Writer, s: ReportSnapshot) {
  w.heading("Method statement");
  w.para(
    `Published methods only. This case was computed with ${RULE_LABELS[s.inputs.envelope.compressibility]} for the sections and the ${SPANWISE_LABELS[s.inputs.envelope.spanwise].toLowerCase()} for the span, engine version ${s.engineVersion}. The three compressibility rules are shown side by side for the critical case.`,
  );
  for (const m of METHODS) {
    w.subheading(m.title);
    w.bullets(m.body, { size: 8.6 });
  }
  w.table(
    [
      { header: "Method", width: 120 },
      { header: "Basis", width: 150 },
      { header: "Validity limit", width: 0 },
    ],
    VALIDITY.map((r) => [...r]),
    { caption: "Validity limits of the methods used", size: 7.8 },
  );
}

function inputs(w: Writer, s: ReportSnapshot, q: Fmt, sym: Sym) {
  const p = s.inputs.planform;
  const L = sym("length");
  w.heading("Inputs", { newPage: true });
  w.subheading("Planform");
  w.table(
    [
      { header: "Station", width: 50 },
      { header: `y [${L}]`, width: 70, align: "right" },
      { header: `Leading edge x [${L}]`, width: 90, align: "right" },
      { header: `Chord [${L}]`, width: 80, align: "right" },
      { header: "Twist [°]", width: 70, align: "right" },
      { header: "", width: 0 },
    ],
    p.stations.map((st, i) => [`${i + 1}`, q("length", st.y), q("length", st.xLe), q("length", st.chord), formatNumber(st.twist), i === 0 ? "root" : i === p.stations.length - 1 ? "tip" : ""]),
    { size: 8 },
  );
  const stations: WingStation[] = (s.exchange.wing.stations as WingStation[]).map((st) => ({ ...st }));
  const g = wingGeometry(stations);
  planformDrawing(w, p, g, s);
  w.subheading("Derived geometry");
  const cols2: Column[] = [
    { header: "Quantity", width: 160 },
    { header: "Value", width: 90, align: "right" },
    { header: "Quantity", width: 160 },
    { header: "Value", width: 0, align: "right" },
  ];
  const left: [string, string][] = [
    [`Wing area, both sides [${sym("area")}]`, q("area", g.area)],
    [`Span [${L}]`, q("length", g.span)],
    [`Semispan [${L}]`, q("length", g.semispan)],
    ["Aspect ratio [–]", formatNumber(g.aspectRatio)],
    ["Taper ratio (tip/root) [–]", formatNumber(g.taperRatio)],
  ];
  const right: [string, string][] = [
    [`Mean aerodynamic chord [${L}]`, q("length", g.mac)],
    [`MAC spanwise position y [${L}]`, q("length", g.yMac)],
    [`MAC leading edge x [${L}]`, q("length", g.xLeMac)],
    [`Mean geometric chord S/b [${L}]`, q("length", g.meanGeometricChord)],
    ["Reference axis, root / tip [chord]", `${formatNumber(p.axisRoot)} / ${formatNumber(p.axisTip)}`],
  ];
  w.table(cols2, left.map((l, i) => [...l, ...(right[i] ?? ["", ""])]), { size: 8 });
  w.table(
    [
      { header: "Panel", width: 50 },
      { header: `From y [${L}]`, width: 70, align: "right" },
      { header: `To y [${L}]`, width: 70, align: "right" },
      { header: `Area, one side [${sym("area")}]`, width: 90, align: "right" },
      { header: "Sweep LE [°]", width: 70, align: "right" },
      { header: "Sweep c/4 [°]", width: 70, align: "right" },
      { header: "Sweep TE [°]", width: 0, align: "right" },
    ],
    g.panels.map((pn, i) => [`${i + 1}`, q("length", pn.yInner), q("length", pn.yOuter), q("area", pn.area), formatNumber(pn.sweepLeDeg, 3), formatNumber(pn.sweepQuarterChordDeg, 3), formatNumber(pn.sweepTrailingEdgeDeg, 3)]),
    { size: 8, caption: "Panels between planform stations" },
  );

  w.subheading("Section data (incompressible, two-dimensional)");
  const sec = s.inputs.sections;
  w.table(
    [
      { header: `y [${L}]`, width: 70, align: "right" },
      { header: "Lift slope a0 [1/rad]", width: 90, align: "right" },
      { header: "Zero-lift angle αL0 [°]", width: 100, align: "right" },
      { header: "cm,ac [–]", width: 70, align: "right" },
      { header: "clmax [–]", width: 70, align: "right" },
      { header: "Cp,min [–]", width: 0, align: "right" },
    ],
    sec.rows.map((r) => [q("length", r.y), formatNumber(r.a0), formatNumber(r.alphaL0), formatNumber(r.cmAc), formatNumber(r.clMax), formatNumber(r.cpMin)]),
    { size: 8 },
  );
  const src = sec.source;
  w.para(
    `Source of the section data: ${src.kind === "upload" ? `uploaded file ${src.filename ?? ""}${src.sha256 ? ` (SHA-256 ${src.sha256})` : ""}` : src.kind === "import" ? "imported exchange document" : "typed in the sections step"}. Values between section stations are interpolated linearly and held constant outside them.`,
    { size: 8.2, color: MUTED },
  );

  w.subheading("Load cases");
  const env = s.inputs.envelope;
  const disp = s.inputs.distribution.dispositions;
  const analysed = new Set(s.result.cases.map((c) => c.id));
  w.para(`${env.cases.length} load cases in the envelope step, ${s.result.cases.length} analysed. Weight is the whole aircraft; nz the limit load factor; cases given by angle of attack show α instead.`, { size: 8.2, color: MUTED });
  w.table(
    [
      { header: "Case", width: 50 },
      { header: "Kind", width: 40 },
      { header: "Mach", width: 34, align: "right" },
      { header: `Alt. [${sym("altitude")}]`, width: 36, align: "right" },
      { header: `Weight [${sym("force")}]`, width: 40, align: "right" },
      { header: "nz / α [–/°]", width: 42, align: "right" },
      { header: "Status", width: 58 },
      { header: "Rule it comes from", width: 0 },
    ],
    env.cases.map((c) => [
      c.id,
      c.kind,
      formatNumber(c.mach, 4),
      q("altitude", c.altitude, 5),
      c.weight !== undefined ? q("force", c.weight) : "—",
      c.alpha !== undefined ? `α ${formatNumber(c.alpha)}°` : formatNumber(c.nz),
      c.excluded ? "excluded" : disp[c.id]?.action === "exclude" ? "excluded (flag)" : disp[c.id] ? "justified (flag)" : analysed.has(c.id) ? "analysed" : "—",
      c.rule || "entered by hand",
    ]),
    { size: 6.9, caption: "Load cases of the envelope", rowColor: (i) => (env.cases[i]!.excluded || disp[env.cases[i]!.id]?.action === "exclude" ? MUTED : undefined) },
  );
}

/** The semispan drawn to scale with pdfkit paths: outline, stations, MAC, reference axis, scale bar. */
function planformDrawing(w: Writer, p: ReportSnapshot["inputs"]["planform"], g: ReturnType<typeof wingGeometry>, s: ReportSnapshot) {
  const doc = w.doc;
  const st = p.stations;
  const span = g.semispan;
  const xMin = Math.min(...st.map((t) => t.xLe));
  const xMax = Math.max(...st.map((t) => t.xLe + t.chord));
  const boxW = W - 20;
  const maxH = 170;
  const scale = Math.min(boxW / span, maxH / (xMax - xMin));
  const height = (xMax - xMin) * scale;
  w.ensure(height + 58);
  const top = w.y + 14;
  const left = M.left + 10;
  const X = (y: number) => left + y * scale;
  const Y = (x: number) => top + (x - xMin) * scale;
  w.text(`Semispan planform to scale (1 : ${formatNumber(1000 / ((scale * 25.4) / 72), 3)} at print size), x aft, y outboard`, M.left, w.y, { size: 8, weight: 600, color: MUTED, oneLine: true });
  // Outline: leading edge root to tip, tip chord, trailing edge back to the root.
  doc.moveTo(X(st[0]!.y), Y(st[0]!.xLe));
  for (const t of st.slice(1)) doc.lineTo(X(t.y), Y(t.xLe));
  for (const t of [...st].reverse()) doc.lineTo(X(t.y), Y(t.xLe + t.chord));
  doc.closePath().lineWidth(0.9).fillColor("#f4f7fa").strokeColor(INK).fillAndStroke();
  // Planform stations.
  for (const t of st.slice(1, -1)) doc.moveTo(X(t.y), Y(t.xLe)).lineTo(X(t.y), Y(t.xLe + t.chord)).lineWidth(0.4).dash(2, { space: 2 }).strokeColor(MUTED).stroke().undash();
  // Reference axis: straight from its root chord fraction to its tip chord fraction.
  const root = st[0]!;
  const tip = st[st.length - 1]!;
  doc.moveTo(X(root.y), Y(root.xLe + p.axisRoot * root.chord)).lineTo(X(tip.y), Y(tip.xLe + p.axisTip * tip.chord)).lineWidth(0.8).dash(6, { space: 2 }).strokeColor("#a82424").stroke().undash();
  // MAC at its spanwise position.
  doc.moveTo(X(g.yMac), Y(g.xLeMac)).lineTo(X(g.yMac), Y(g.xLeMac + g.mac)).lineWidth(1.4).strokeColor(ACCENT).stroke();
  w.text(`MAC ${formatQuantity(s.inputs.basis.units, "length", g.mac)}`, X(g.yMac) + 3, Y(g.xLeMac + g.mac / 2) - 4, { size: 7, color: ACCENT, oneLine: true });
  w.text("root", X(0) + 2, Y(root.xLe + root.chord) + 2, { size: 7, color: MUTED, oneLine: true });
  w.text("tip", X(tip.y) - 12, Y(tip.xLe + tip.chord) + 2, { size: 7, color: MUTED, oneLine: true });
  // Scale bar of 1 m (or 1 ft) below the drawing.
  const yBar = top + height + 16;
  const unitLen = s.inputs.basis.units === "SI" ? 1 : 0.3048;
  doc.moveTo(left, yBar).lineTo(left + unitLen * scale, yBar).lineWidth(1.2).strokeColor(INK).stroke();
  doc.moveTo(left, yBar - 3).lineTo(left, yBar + 3).moveTo(left + unitLen * scale, yBar - 3).lineTo(left + unitLen * scale, yBar + 3).lineWidth(0.6).stroke();
  w.text(s.inputs.basis.units === "SI" ? "1 m" : "1 ft", left + unitLen * scale + 4, yBar - 4, { size: 7, oneLine: true });
  // Legend.
  const lx = left + 80;
  doc.moveTo(lx, yBar).lineTo(lx + 18, yBar).lineWidth(0.8).dash(6, { space: 2 }).strokeColor("#a82424").stroke().undash();
  w.text(`Reference axis (${formatNumber(p.axisRoot)} c root → ${formatNumber(p.axisTip)} c tip)`.replace("→", "to"), lx + 22, yBar - 4, { size: 7, oneLine: true });
  const mx = lx + 200;
  doc.moveTo(mx, yBar).lineTo(mx + 18, yBar).lineWidth(1.4).strokeColor(ACCENT).stroke();
  w.text("Mean aerodynamic chord", mx + 22, yBar - 4, { size: 7, oneLine: true });
  const sx = mx + 120;
  doc.moveTo(sx, yBar).lineTo(sx + 18, yBar).lineWidth(0.4).dash(2, { space: 2 }).strokeColor(MUTED).stroke().undash();
  w.text("Planform station", sx + 22, yBar - 4, { size: 7, oneLine: true });
  w.y = yBar + 14;
}

function resultsVn(w: Writer, s: ReportSnapshot, units: UnitSystem, q: Fmt, sym: Sym) {
  const b = s.inputs.basis;
  const sets = vnSets(b, s.inputs.planform, s.inputs.sections, { compressibility: s.inputs.envelope.compressibility, spanwise: s.inputs.envelope.spanwise });
  const set = sets[0]!;
  // Heading, V–n caption and chart stay together.
  w.heading("Results", { keep: 320 });
  w.chart(vnOption(`V–n diagram, ${set.label}`, set.points, { area: b.wingArea, clMax: b.clMax, clMaxNegative: b.clMaxNegative, weightN: set.weightKg * G0 }, { symbol: sym("speed"), fromSI: (v) => fromSI(units, "speed", v) }), 250);
  w.para(
    `Gust velocities ${q("speed", set.gustAtVc)} ${sym("speed")} at VC and ${q("speed", set.gustAtVd)} ${sym("speed")} at VD (${set.gustRule}); airplane lift slope ${formatNumber(set.liftSlope)} /rad from the spanwise solver at the VC Mach number (wing alone). ${sets.length} weight and altitude combinations in all; the others are in the load-case table.`,
    { size: 8.2, color: MUTED },
  );
  w.table(
    [
      { header: "Point", width: 56 },
      { header: `VEAS [${sym("speed")}]`, width: 64, align: "right" },
      { header: "nz [–]", width: 54, align: "right" },
      { header: "Rule", width: 0 },
    ],
    set.points.map((pt) => [pt.name, q("speed", pt.veas), formatNumber(pt.nz), pt.rule]),
    { size: 7.6, caption: `Corner and gust points, ${set.label}` },
  );
}

function resultsDistribution(w: Writer, s: ReportSnapshot, crit: ResultCase, q: Fmt, sym: Sym) {
  const d = distributionView(s.exchange, crit.id);
  // Heading, introduction and the first chart stay together.
  w.subheading(`Spanwise distributions of the critical case ${crit.id}`, 260);
  w.para(
    `Critical case: the largest root bending moment magnitude over all analysed cases. Mach ${formatNumber(d.mach)}, altitude ${q("altitude", d.altitude, 5)} ${sym("altitude")}, CL ${formatNumber(d.CL)}, root-chord α ${formatNumber(d.alphaDeg)}°, critical Mach number ${formatNumber(d.machCritical)} (${d.regime}). Rule in use: ${RULE_LABELS[d.rule]}.`,
    { size: 8.4 },
  );
  const h = 178;
  for (const option of [loadingOption(d), clOption(d), rulesOption(d, "cl"), rulesOption(d, "cm"), machCriticalOption(d)]) {
    w.ensure(h + 20);
    w.chart(option, h);
  }
  w.table(
    [
      { header: "Rule", width: 150 },
      { header: "CL [–]", width: 70, align: "right" },
      { header: "Wing lift slope [1/rad]", width: 110, align: "right" },
      { header: "Critical Mach [–]", width: 0, align: "right" },
    ],
    d.rules.map((r) => [RULE_LABELS[r.rule], formatNumber(r.CL), formatNumber(r.clAlpha), formatNumber(r.machCritical)]),
    { size: 7.8, caption: `The three compressibility rules at the critical case ${crit.id}` },
  );
}

function resultsLoads(w: Writer, s: ReportSnapshot, crit: ResultCase, units: UnitSystem, q: Fmt, sym: Sym) {
  const env = s.result.envelope;
  const F = sym("force");
  const Mo = sym("moment");
  w.subheading(`Shear, bending and torsion: envelope of all cases with the critical case ${crit.id}`, 240);
  const scaleOf = (qty: LoadQuantity) => {
    const quantity: Quantity = qty === "shear" ? "force" : "moment";
    return { symbol: sym(quantity), scale: (v: number) => fromSI(units, quantity, v) };
  };
  const h = 185;
  for (const qty of ["shear", "bending", "torsion"] as const) {
    w.ensure(h + 20);
    w.chart(loadsOption(qty, { y: env.map((e) => e.y), max: env.map((e) => e[`${qty}Max`]), min: env.map((e) => e[`${qty}Min`]), caseId: crit.id, caseValues: crit.stations?.map((st) => st[qty]) }, scaleOf(qty)), h);
  }
  if (!crit.stations) w.para("Station tables were left out of the stored results (summary output): the critical case is shown by its root loads only.", { size: 8.2, color: WARN });

  const idW = Math.max(30, ...env.flatMap((e) => [e.shearMaxCase, e.shearMinCase, e.bendingMaxCase, e.bendingMinCase, e.torsionMaxCase, e.torsionMinCase].map((c) => w.widthOf(c, { size: 6.6 })))) + 6;
  const valW = (W - 34 - 6 * idW) / 6;
  w.table(
    [
      { header: `y [${sym("length")}]`, width: 34, align: "right" },
      ...(["Shear", "Bending", "Torsion"] as const).flatMap((name) => {
        const u = name === "Shear" ? F : Mo;
        return [
          { header: `${name} max [${u}]`, width: valW, align: "right" as const },
          { header: "case", width: idW },
          { header: `${name} min [${u}]`, width: valW, align: "right" as const },
          { header: "case", width: idW },
        ];
      }),
    ],
    env.map((e) => [
      q("length", e.y),
      q("force", e.shearMax),
      e.shearMaxCase,
      q("force", e.shearMin),
      e.shearMinCase,
      q("moment", e.bendingMax),
      e.bendingMaxCase,
      q("moment", e.bendingMin),
      e.bendingMinCase,
      q("moment", e.torsionMax),
      e.torsionMaxCase,
      q("moment", e.torsionMin),
      e.torsionMinCase,
    ]),
    { size: 6.6, caption: "Envelope by station with the case that gives each extreme" },
  );

  const sorted = [...s.result.cases].sort((a, b) => Math.abs(b.root.bending) - Math.abs(a.root.bending));
  w.table(
    [
      { header: "Case", width: 64 },
      { header: "Mach", width: 40, align: "right" },
      { header: `Alt. [${sym("altitude")}]`, width: 44, align: "right" },
      { header: "CL [–]", width: 42, align: "right" },
      { header: "α [°]", width: 40, align: "right" },
      { header: "Critical Mach", width: 48, align: "right" },
      { header: "Regime", width: 62 },
      { header: `Root shear [${F}]`, width: 54, align: "right" },
      { header: `Root bending [${Mo}]`, width: 56, align: "right" },
      { header: `Root torsion [${Mo}]`, width: 0, align: "right" },
    ],
    sorted.map((c) => [
      c.id,
      formatNumber(c.mach),
      q("altitude", c.altitude, 5),
      formatNumber(c.cl),
      formatNumber(c.alpha),
      formatNumber(c.machCritical),
      c.regime === "supercritical" ? "supercritical" : c.regime,
      q("force", c.root.shear),
      q("moment", c.root.bending),
      q("moment", c.root.torsion),
    ]),
    { size: 6.9, caption: "Root loads of every analysed case, by root bending magnitude", rowColor: (i) => (sorted[i]!.regime === "supercritical" ? WARN : undefined) },
  );
}

function flagsAndCautions(w: Writer, s: ReportSnapshot) {
  w.heading("Flagged cases and their dispositions");
  if (s.flags.length === 0) {
    w.para("No case was flagged: every analysed case is below its critical Mach number and no station exceeds its section clmax.");
  } else {
    w.para(`${s.flags.length} case${s.flags.length > 1 ? "s were" : " was"} flagged in the distribution step. Each carries the engineer's disposition: excluded from the loads, or kept with a written justification.`, { size: 8.4 });
    w.table(
      [
        { header: "Case", width: 60 },
        { header: "Why it was flagged", width: 210 },
        { header: "Disposition", width: 60 },
        { header: "Comment", width: 0 },
      ],
      s.flags.map((f) => [f.id, f.reasons.join("; "), f.action === "exclude" ? "excluded" : f.action === "justify" ? "kept, justified" : f.action, f.comment || "—"]),
      { size: 7.2 },
    );
  }
  w.heading("Assumptions and cautions");
  w.bullets([
    "These results support, and never replace, what the certifying authority accepts. The applicable regulations and licensed engineering practice govern; the engineer who signs remains responsible for the results and their use.",
    "The compressibility rules are subsonic rules: they are valid only below the critical Mach number. Cases at or above it are computed for completeness, marked supercritical and flagged; their loads are not a basis for substantiation without other evidence.",
    "Linear aerodynamics: lift is linear in angle of attack up to the section clmax; stations above clmax are flagged, and no stall redistribution is modelled.",
    "Loads are limit loads about a straight reference axis, for a rigid wing, symmetric flight, flaps up. Inertia relief comes only from the semispan structural mass spread in proportion to chord; engines, fuel and other point masses are not included unless they were folded into that mass.",
    "Gust loads come from the Pratt formula with the wing's lift slope (the tail's contribution is left to the engineer). For transport aeroplanes these are a preliminary estimate: 14 CFR 25.341(a) asks for a dynamic discrete-gust analysis.",
    "Section data are two-dimensional and incompressible as entered; their source and the planform are the engineer's responsibility and are recorded by revision and hash in this report.",
    "The input hash on every page identifies the exact exchange document the results were computed from; recomputing it with the same engine version reproduces these numbers.",
  ]);
}

function signatures(w: Writer, s: ReportSnapshot) {
  w.heading("Signatures", { newPage: true });
  w.para(
    "Each step was signed on the revision shown; its hash is the SHA-256 of the canonical serialisation of that revision (case, step, revision and data). The approval for issue signs the hashes of every step's signed revision. The release by quality signs the SHA-256 of this PDF's bytes, so it is recorded in Spanwright after issue and listed with the report there. Times are UTC.",
    { size: 8.4, color: MUTED },
  );
  const cols: Column[] = [
    { header: "Name", width: 92 },
    { header: "Role", width: 54 },
    { header: "Meaning", width: 96 },
    { header: "Signed (UTC)", width: 86 },
    { header: "Revision", width: 40, align: "right" },
    { header: "Revision hash (SHA-256)", width: 0 },
  ];
  const row = (g: SignatureLine) => [g.name, g.role, g.meaning, utc(g.signedAt), g.revision === null ? "—" : `${g.revision}`, g.revisionHash];
  const groups = [...STEP_KEYS.map((k) => ({ key: k as string | null, title: `${STEP_LABEL[k]} step` })), { key: null, title: "Approval of the case for issue" }];
  const other = s.signatures.filter((g) => g.step !== null && !(STEP_KEYS as readonly string[]).includes(g.step));
  for (const grp of groups) {
    const lines = s.signatures.filter((g) => g.step === grp.key);
    if (lines.length === 0) {
      w.ensure(30);
      w.text(`${grp.title}: no signature recorded.`, M.left, w.y, { size: 8.4, color: MUTED, oneLine: true });
      w.y += 16;
      continue;
    }
    w.table(cols, lines.map(row), { caption: grp.title, size: 7.6 });
  }
  if (other.length) w.table(cols, other.map(row), { caption: "Other signatures", size: 7.6 });
}

/** Header and footer on every buffered page, written last so the page count is known. */
function decorate(doc: PDFKit.PDFDocument, s: ReportSnapshot) {
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
