import PDFDocument from "pdfkit";
import type { ReportComparison } from "~/domain/report-comparison";
import type { UnitSystem } from "~/domain/units";
import { registerFonts } from "./pdf/fonts.server";
import { formatters, LINE, M, MUTED, PAGE, utc, W, Writer } from "./pdf/layout.server";
import { writeComparison } from "./pdf/version-changes.server";

/**
 * A comparison of any two issued versions of a case's report as an A4 PDF: the same section the
 * next version of the report prints (app/reports/pdf/version-changes.server.ts), for the pair the
 * reader chose. It is not a report and carries no signature: it says so on every page. Dated by
 * the later version's issue, so the same pair always gives the same bytes.
 */
export async function renderComparisonPdf(c: ReportComparison, head: { organisation: string; caseReference: string; caseTitle: string }, units: UnitSystem): Promise<Uint8Array> {
  const dated = new Date(c.to.issuedAt);
  const doc = new PDFDocument({
    size: "A4",
    margins: M,
    bufferPages: true,
    pdfVersion: "1.7",
    lang: "en-GB",
    displayTitle: true,
    info: {
      Title: `${c.from.reportNumber} v${c.from.version} against v${c.to.version} — ${head.caseReference}`,
      Author: head.organisation,
      Subject: `Comparison of two issued versions of the wing loads report of case ${head.caseReference}`,
      Creator: "Spanwright",
      Producer: "Spanwright (pdfkit)",
      CreationDate: dated,
      ModDate: dated,
    },
  });
  const chunks: Buffer[] = [];
  doc.on("data", (b: Buffer) => chunks.push(b));
  const finished = new Promise<void>((resolve, reject) => {
    doc.on("end", () => resolve());
    doc.on("error", reject);
  });
  registerFonts(doc);
  const w = new Writer(doc);
  const { q, sym } = formatters(units);
  w.text(`Version ${c.from.version} against version ${c.to.version}`, M.left, M.top, { size: 16, weight: 600 });
  w.y = M.top + 24;
  w.para(`${head.caseReference} · ${head.caseTitle} · ${head.organisation}`, { color: MUTED });
  w.para(
    "A comparison of two issued reports, drawn from their stored snapshots. It is not itself a report and carries no signature: each version's signed PDF is the record. Results support, and never replace, what the certifying authority accepts; the applicable regulations and licensed practice govern.",
    { size: 8.4 },
  );
  writeComparison(w, c, units, q, sym);
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const saved = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.moveTo(M.left, PAGE.height - 34).lineTo(M.left + W, PAGE.height - 34).lineWidth(0.4).strokeColor(LINE).stroke();
    w.text(`Comparison of ${c.from.reportNumber} and ${c.to.reportNumber} · not a report, unsigned · page ${i - range.start + 1} of ${range.count}`, M.left, PAGE.height - 28, { size: 7.6, color: MUTED, oneLine: true });
    w.text(`Later version issued ${utc(c.to.issuedAt)}`, M.left, PAGE.height - 28, { size: 7.6, color: MUTED, width: W, align: "right" });
    doc.page.margins.bottom = saved;
  }
  doc.end();
  await finished;
  return new Uint8Array(Buffer.concat(chunks));
}
