import PDFDocument from "pdfkit";
import { criticalCase } from "~/domain/results";
import type { UnitSystem } from "~/domain/units";
import { basisAndScope } from "./pdf/basis.server";
import { ruleSensitivity, spanwiseMethods } from "./pdf/comparisons.server";
import { cover } from "./pdf/cover.server";
import { documents } from "./pdf/documents.server";
import { flagsAndCautions } from "./pdf/flags.server";
import { registerFonts } from "./pdf/fonts.server";
import { inputs } from "./pdf/inputs.server";
import { massesAndBalance } from "./pdf/masses.server";
import { decorate, formatters, M, Writer, type Section } from "./pdf/layout.server";
import { methodStatement } from "./pdf/method.server";
import { resultsDistribution } from "./pdf/results-distribution.server";
import { resultsGust } from "./pdf/results-gust.server";
import { resultsLoads } from "./pdf/results-loads.server";
import { resultsVn } from "./pdf/results-vn.server";
import { signatures } from "./pdf/signatures.server";
import { versionChanges } from "./pdf/version-changes.server";
import type { ReportFigures, ReportSnapshot } from "./snapshot";

/** The report's sections in order, each with the progress shown when it starts. */
const SECTIONS: [pct: number, note: string, write: (section: Section) => void][] = [
  [5, "Cover", cover],
  [15, "Basis and method", basisAndScope],
  [20, "Basis and method", methodStatement],
  [30, "Inputs", inputs],
  [38, "Masses and balance", massesAndBalance],
  [45, "V–n diagram", resultsVn],
  [52, "Tuned discrete gust", resultsGust],
  [60, "Distributions of the critical case", resultsDistribution],
  [75, "Shear, bending and torsion", resultsLoads],
  [80, "Rule sensitivity", ruleSensitivity],
  [84, "Spanwise methods compared", spanwiseMethods],
  [86, "Changes from the previous version", versionChanges],
  [88, "Flags, cautions and signatures", flagsAndCautions],
  [89, "Attached documents", documents],
  [90, "Flags, cautions and signatures", signatures],
];

/**
 * Renders the signed report of a case as an A4 PDF from its frozen snapshot: cover, basis and
 * scope, method statement, inputs with a to-scale planform, masses and the balance per case, results (V–n, tuned gust, distributions of the
 * critical case, shear/bending/torsion envelopes, tables), flags and dispositions, cautions and
 * signatures, with a footer naming report, version, input hash and page on every page.
 *
 * Deterministic: the same snapshot (and its figures, computed from it) gives the same bytes. Dates
 * in the PDF come from `issuedAt`, and pdfkit derives the document ID from the info dictionary (an
 * MD5 of its entries), so nothing depends on the clock or on chance. Display units follow the basis
 * (SI or US customary).
 */
export async function renderReportPdf(s: ReportSnapshot, figures: ReportFigures, opts: { onProgress?: (pct: number, note: string) => void } = {}): Promise<Uint8Array> {
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
  const units: UnitSystem = s.inputs.basis.units;
  const section: Section = { w: new Writer(doc), s, figures, units, ...formatters(units), crit: criticalCase(s.result.cases) };
  for (const [pct, note, write] of SECTIONS) {
    progress(pct, note);
    write(section);
  }

  progress(95, "Page footers");
  decorate(doc, s);
  doc.end();
  await finished;
  progress(100, "Done");
  return new Uint8Array(Buffer.concat(chunks));
}
