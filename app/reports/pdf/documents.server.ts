import { createHash } from "node:crypto";
import { exchangeDocumentText, stableDocumentText } from "~/exchange";
import type { ReportSnapshot } from "../snapshot";
import { M, MUTED, utc, type Section } from "./layout.server";

/** One file attached to the report PDF. */
export interface ReportDocument {
  name: string;
  /** What the file is, as the PDF's file specification and the report's table say it. */
  description: string;
  /** PDF 2.0 / PDF/A-3 relationship of the file to the report: the inputs are its source, the results its data. */
  relationship: "Source" | "Data";
  text: string;
  sha256: string;
  bytes: number;
}

const fileStem = (s: ReportSnapshot) => s.reportNumber.replace(/[^A-Za-z0-9._-]+/g, "_");

/**
 * The files a report carries: the case as `spanwright.case/1` (as frozen when it was issued), its
 * richer section data where it has them, and the results as `spanwright.result/1`. The result is
 * written with sorted keys, so the bytes are the same whether the snapshot is fresh or read back from
 * the database.
 */
export function reportDocuments(s: ReportSnapshot): ReportDocument[] {
  const stem = fileStem(s);
  const files: Omit<ReportDocument, "sha256" | "bytes">[] = [
    { name: `${stem}.case.json`, description: `Case ${s.case.reference} as spanwright.case/1: the input the results were computed from`, relationship: "Source", text: s.documents?.case ?? exchangeDocumentText(s.exchange) },
    ...(s.documents?.sections
      ? [{ name: `${stem}.sections.json`, description: `Richer section data of case ${s.case.reference} as spanwright.sections/1 (read with --sections)`, relationship: "Source" as const, text: s.documents.sections }]
      : []),
    { name: `${stem}.result.json`, description: `Results of case ${s.case.reference} as spanwright.result/1, engine ${s.result.engine}`, relationship: "Data", text: stableDocumentText(s.result) },
  ];
  return files.map((f) => {
    const bytes = Buffer.from(f.text, "utf8");
    return { ...f, sha256: createHash("sha256").update(bytes).digest("hex"), bytes: bytes.byteLength };
  });
}

/**
 * Attaches the documents to the PDF (dated at the issue time, so the bytes stay deterministic) and
 * writes the section that lists them with their SHA-256 and says how to compute the results again.
 */
export function documents({ w, s }: Section) {
  const files = reportDocuments(s);
  const issued = new Date(s.issuedAt);
  for (const f of files) {
    // pdfkit takes the relationship (AFRelationship) although its type declarations do not list it.
    const options: PDFKit.Mixins.PDFAttachmentOptions & { relationship: ReportDocument["relationship"] } = { name: f.name, type: "application/json", description: f.description, relationship: f.relationship, creationDate: issued, modifiedDate: issued };
    w.doc.file(Buffer.from(f.text, "utf8"), options);
  }
  const [caseFile] = files;
  const sections = files.find((f) => f.name.endsWith(".sections.json"));
  const result = files[files.length - 1]!;
  w.heading("Attached documents and how to reproduce the results");
  w.para(
    `This PDF carries, as file attachments, the documents its results were computed from and the results themselves, frozen when it was issued (${utc(s.issuedAt)}). A PDF reader lists them in its attachments panel; "pdfdetach -saveall" (poppler-utils) writes them to files. Each file's SHA-256 below is of its exact bytes, so a copy can be checked with any SHA-256 tool.`,
  );
  w.table(
    [
      { header: "File", width: 150 },
      { header: "Contents", width: 0 },
      { header: "Size [bytes]", width: 56, align: "right" },
    ],
    files.map((f) => [f.name, f.description, `${f.bytes}`]),
    { caption: "Attached files", size: 7.6 },
  );
  w.table(
    [
      { header: "File", width: 150 },
      { header: "SHA-256", width: 0 },
    ],
    files.map((f) => [f.name, f.sha256]),
    { caption: "SHA-256 of each attached file", size: 7.6 },
  );
  w.subheading("Computing the results again");
  w.para("The case document is in Spanwright's exchange format, which its command line and its API read. In a copy of Spanwright:", { size: 8.6 });
  const command = `npm run -s analyze -- ${caseFile!.name}${sections ? ` --sections ${sections.name}` : ""} > rerun.result.json`;
  w.ensure(20);
  w.text(command, M.left + 12, w.y, { size: 8.4, weight: 600, oneLine: true });
  w.y += 16;
  w.para(
    `With engine version ${s.result.engine}, every number of rerun.result.json equals the number in ${result.name}. A later engine may differ; Spanwright's "re-run this report" recomputes the results with the current engine and lists every difference. The input hash in the page footer (${s.inputHash.slice(0, 16)}…) is the SHA-256 of the case as the engine reads it (keys sorted, defaults filled in${sections ? ", with its section data" : ""}), which is why it differs from the file's own SHA-256.`,
    { size: 8.6 },
  );
  w.para("The attachments are part of the signed bytes: quality's release signs the SHA-256 of the whole PDF, attachments included.", { size: 8.4, color: MUTED });
}
