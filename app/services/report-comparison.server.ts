import { and, asc, eq, inArray } from "drizzle-orm";
import { db, type Db, type Tx } from "~/db/client.server";
import { cases, organisations, reports } from "~/db/schema";
import { DomainError } from "~/domain/errors";
import { compareReports, type ReportComparison } from "~/domain/report-comparison";
import type { UnitSystem } from "~/domain/units";
import { ISSUED_REPORT_STATUSES } from "~/domain/vocabulary";
import type { ReportSnapshot } from "~/reports/snapshot";

/** An issued version of a case's report, as the comparison page lists it. */
export interface IssuedVersion {
  id: string;
  version: number;
  reportNumber: string;
  issuedAt: string;
}

export interface VersionComparisonView {
  versions: IssuedVersion[];
  fromId: string | null;
  toId: string | null;
  units: UnitSystem;
  comparison: ReportComparison | null;
}

async function issued(organisationId: string, caseId: string, database: Db | Tx) {
  return database
    .select({ id: reports.id, version: reports.version, reportNumber: reports.reportNumber, issuedAt: reports.issuedAt, snapshot: reports.snapshot })
    .from(reports)
    .where(and(eq(reports.organisationId, organisationId), eq(reports.caseId, caseId), inArray(reports.status, [...ISSUED_REPORT_STATUSES])))
    .orderBy(asc(reports.version));
}

/**
 * Two issued versions of a case's report compared (the two newest unless chosen), the earlier one
 * always as "from". Only the organisation's own reports of this case are read.
 * @throws DomainError naming `from` or `to` for a version that is not an issued report of the case, or the same one twice
 */
export async function compareReportVersions(input: { organisationId: string; caseId: string; fromId?: string | null; toId?: string | null }, database: Db | Tx = db): Promise<VersionComparisonView> {
  const rows = await issued(input.organisationId, input.caseId, database);
  const versions = rows.map((r) => ({ id: r.id, version: r.version, reportNumber: r.reportNumber, issuedAt: (r.issuedAt ?? new Date(0)).toISOString() }));
  const pick = (id: string | null | undefined, field: "from" | "to", fallback: (typeof rows)[number] | undefined) => {
    if (!id) return fallback;
    const hit = rows.find((r) => r.id === id);
    if (!hit) throw new DomainError(`${field}: no issued version of this case's report has that id.`, { field, kind: "not-found" });
    return hit;
  };
  let a = pick(input.fromId, "from", rows[rows.length - 2]);
  let b = pick(input.toId, "to", rows[rows.length - 1]);
  if (!a || !b) {
    const units = ((rows[0]?.snapshot as unknown as ReportSnapshot | undefined)?.inputs.basis.units ?? "SI") as UnitSystem;
    return { versions, fromId: a?.id ?? null, toId: b?.id ?? null, units, comparison: null };
  }
  if (a.id === b.id) throw new DomainError("to: choose two different versions to compare.", { field: "to", kind: "invalid" });
  if (a.version > b.version) [a, b] = [b, a];
  const older = a.snapshot as unknown as ReportSnapshot;
  const newer = b.snapshot as unknown as ReportSnapshot;
  return { versions, fromId: a.id, toId: b.id, units: newer.inputs.basis.units, comparison: compareReports(older, newer) };
}

/**
 * The comparison of two issued versions as a PDF (not a report: unsigned, and says so).
 * @throws DomainError as compareReportVersions, and when the case has fewer than two issued versions
 */
export async function comparisonPdf(input: { organisationId: string; caseId: string; fromId?: string | null; toId?: string | null }, database: Db | Tx = db): Promise<{ fileName: string; bytes: Uint8Array }> {
  const view = await compareReportVersions(input, database);
  if (!view.comparison) throw new DomainError("The case has fewer than two issued versions of its report: there is nothing to compare.", { field: "to", kind: "conflict" });
  const [head] = await database
    .select({ reference: cases.reference, title: cases.title, organisation: organisations.name })
    .from(cases)
    .innerJoin(organisations, eq(organisations.id, cases.organisationId))
    .where(eq(cases.id, input.caseId));
  const { renderComparisonPdf } = await import("~/reports/comparison-pdf.server");
  const c = view.comparison;
  const bytes = await renderComparisonPdf(c, { organisation: head!.organisation, caseReference: head!.reference, caseTitle: head!.title }, view.units);
  return { fileName: `${head!.reference}-report-v${c.from.version}-vs-v${c.to.version}.pdf`.replace(/[^A-Za-z0-9._-]+/g, "_"), bytes };
}
