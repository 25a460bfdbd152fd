import { STEPS } from "~/domain/steps";
import { formatNumber } from "~/domain/units";
import { criticalCase } from "~/domain/results";
import { db, type Db, type Tx } from "~/db/client.server";
import { cases, organisations, programmes, reports, type Report } from "~/db/schema";
import { compareReports } from "~/domain/report-comparison";
import { ISSUED_REPORT_STATUSES } from "~/domain/vocabulary";
import { ENGINE_VERSION, easFromMach, gustAlleviationFactor, gustMassRatio, isa, plungeGustResponse, wingGeometry, type WingStation } from "~/engine";
import { attributionOf, exchangeDocumentText } from "~/exchange";
import type { MassesFigure, ReportFigures, ReportSnapshot, SignatureLine } from "~/reports/snapshot";
import { and, desc, eq, inArray, lt } from "drizzle-orm";
import { buildCaseFile, buildSectionsFile, caseInputs, parseOrThrow, resultsFor } from "./analysis.server";
import { getCaseSteps } from "./case-steps.server";
import { balanceRows, effectiveMasses, massCaseSummaries } from "./masses.server";
import { DomainError } from "~/domain/errors";
import { distributionView, flaggedCases } from "./distribution.server";
import { vnSets } from "./envelope.server";
import { liveSignatures } from "./review.server";
import { ruleSensitivity, spanwiseComparison } from "./comparisons.server";
import { rootCriticalCases } from "~/domain/comparisons";

/*
 * What a report is made of: the snapshot frozen when it is issued, the figures drawn from it, the
 * PDF rendered from both, and what changed between two versions.
 */

/** Signature lines of a case (live ones) for the report's signature page. */
async function signatureLines(caseId: string, database: Db | Tx): Promise<SignatureLine[]> {
  const live = await liveSignatures(caseId, database);
  return live
    .filter((s) => s.reportId === null)
    .sort((a, b) => a.signedAt.getTime() - b.signedAt.getTime())
    .map((s) => ({ step: s.step, name: s.signerName, role: s.role, meaning: s.meaning, signedAt: s.signedAt.toISOString(), revision: s.revision, revisionHash: s.revisionHash }));
}

/** Freezes everything the report is made from. */
export async function buildSnapshot(report: Report, database: Db | Tx = db): Promise<ReportSnapshot> {
  const [row] = await database
    .select({ c: cases, p: programmes, o: organisations })
    .from(cases)
    .innerJoin(programmes, eq(programmes.id, cases.programmeId))
    .innerJoin(organisations, eq(organisations.id, cases.organisationId))
    .where(eq(cases.id, report.caseId));
  const steps = await getCaseSteps(report.caseId, database);
  const inputs = caseInputs(steps);
  if (!inputs.basis || !inputs.planform || !inputs.sections || !inputs.envelope || !inputs.loads) throw new Error("a step of the case has no valid data");
  const exchange = buildCaseFile(row!.c.title, inputs);
  const sections = buildSectionsFile(inputs);
  const { result, inputHash } = await resultsFor(report.caseId, exchange, report.requestedBy, sections, { database });
  const flags = flaggedCases((await resultsFor(report.caseId, buildCaseFile(row!.c.title, inputs, "envelope"), report.requestedBy, sections, { database })).result, inputs.basis.units).map((f) => ({
    ...f,
    action: inputs.distribution?.dispositions[f.id]?.action ?? "none",
    comment: inputs.distribution?.dispositions[f.id]?.comment ?? "",
  }));
  const snapshot: ReportSnapshot = {
    reportId: report.id,
    reportNumber: report.reportNumber,
    version: report.version,
    issuedAt: new Date().toISOString(),
    organisation: row!.o.name,
    programme: { code: row!.p.code, name: row!.p.name, aircraft: row!.p.aircraft },
    case: { id: row!.c.id, reference: row!.c.reference, title: row!.c.title, description: row!.c.description },
    revisions: Object.fromEntries(STEPS.map((s) => [s.key, steps[s.key].revision])),
    inputHash,
    engineVersion: ENGINE_VERSION,
    inputs: { basis: inputs.basis, planform: inputs.planform, sections: inputs.sections, envelope: inputs.envelope, distribution: inputs.distribution ?? { dispositions: {} }, loads: inputs.loads, masses: effectiveMasses(inputs) },
    exchange,
    result,
    documents: { case: exchangeDocumentText(exchange), ...(sections ? { sections: exchangeDocumentText(sections) } : {}) },
    sensitivity: ruleSensitivity(exchange, result, sections),
    // The spanwise comparison is of a case's symmetric condition: a rolling case's two sides share one.
    spanwise: [...new Set(rootCriticalCases(result.envelope[0]).map((c) => attributionOf(c.id).id))].map((id) => spanwiseComparison(exchange, id, sections)),
    flags,
    signatures: await signatureLines(report.caseId, database),
  };
  const previous = await previousIssued(report, database);
  return previous ? { ...snapshot, comparison: compareReports(previous, snapshot) } : snapshot;
}

/** The snapshot of the newest issued (or released) version before this one, if any. */
async function previousIssued(report: Report, database: Db | Tx): Promise<ReportSnapshot | null> {
  const [row] = await database
    .select({ snapshot: reports.snapshot })
    .from(reports)
    .where(and(eq(reports.caseId, report.caseId), lt(reports.version, report.version), inArray(reports.status, [...ISSUED_REPORT_STATUSES])))
    .orderBy(desc(reports.version))
    .limit(1);
  return (row?.snapshot as unknown as ReportSnapshot | undefined) ?? null;
}

/** What the report draws beyond the snapshot's numbers, computed from the snapshot alone. */
export function reportFigures(s: ReportSnapshot): ReportFigures {
  const sets = vnSets(s.inputs.basis, s.inputs.planform, s.inputs.sections, { compressibility: s.inputs.envelope.compressibility, spanwise: s.inputs.envelope.spanwise }, s.inputs.masses);
  const stations: WingStation[] = (s.exchange.wing.stations as WingStation[]).map((st) => ({ ...st }));
  const geometry = wingGeometry(stations);
  return {
    vn: { set: sets[0]!, count: sets.length },
    critical: distributionView(s.exchange, criticalCase(s.result.cases).id),
    geometry,
    eas: Object.fromEntries(s.inputs.envelope.cases.map((c) => [c.id, easFromMach(c.mach, c.altitude)])),
    masses: massesFigure(s),
    gusts: sets.map((set) => ({
      label: set.label,
      ...(set.massCase ? { massCase: set.massCase } : {}),
      ...(set.tuned ? { tuned: set.tuned } : { pratt: prattBeside(set.weightKg * G0 / s.inputs.basis.wingArea, set.altitude, geometry.meanGeometricChord, set.liftSlope) }),
    })),
  };
}

const G0 = 9.80665;

/**
 * Pratt's alleviation factor beside the response it was derived from: the rigid aircraft in plunge
 * through a 1-cos gust 25 mean chords long (NACA Report 1206), at the set's mass ratio with the lift
 * slope at V_C.
 */
function prattBeside(wingLoading: number, altitude: number, meanChord: number, liftSlope: number) {
  const massRatio = gustMassRatio(wingLoading, isa(altitude).density, meanChord, liftSlope, G0);
  const r = plungeGustResponse({ massRatio, gradientSemichords: 25, history: true });
  return { massRatio, prattKg: gustAlleviationFactor(massRatio), k: r.peak, sAtPeak: r.sAtPeak, history: r.history };
}

/** The report's mass cases and the balance of every trimmed case, from the snapshot's own case document. */
function massesFigure(s: ReportSnapshot): MassesFigure | null {
  const m = s.inputs.masses;
  if (!m) return null;
  const cases = massCaseSummaries(m, s.inputs.basis);
  try {
    const balance = balanceRows(parseOrThrow(s.exchange), s.inputs.envelope.cases, m).map((r) => ({
      caseId: r.caseId,
      kind: r.kind,
      massCase: r.massCase,
      weight: r.weight,
      nz: r.nz,
      balanceNz: r.balanceNz,
      tailLoad: r.tailLoad,
      wingLift: r.wingLift,
      source: r.source,
    }));
    return { cases, balance, problem: null };
  } catch (error) {
    if (error instanceof DomainError) return { cases, balance: [], problem: error.message };
    throw error;
  }
}

/** The PDF of a snapshot: its figures computed, then every section rendered (pdfkit, server-side charts). */
export async function renderReport(s: ReportSnapshot, opts: { onProgress?: (pct: number, note: string) => void } = {}): Promise<Uint8Array> {
  const { renderReportPdf } = await import("~/reports/pdf.server");
  return renderReportPdf(s, reportFigures(s), opts);
}

/** Inputs and root loads of two report versions side by side: what a checker reads before signing the next. */
export function versionChanges(older: ReportSnapshot, newer: ReportSnapshot) {
  const rows: { item: string; before: string; after: string }[] = [];
  for (const key of Object.keys(newer.revisions)) {
    if (older.revisions[key] !== newer.revisions[key]) rows.push({ item: `${key} revision`, before: String(older.revisions[key]), after: String(newer.revisions[key]) });
  }
  const flat = (s: ReportSnapshot) => ({
    "MTOW [kg]": s.inputs.basis.mtow,
    "VC [m/s]": s.inputs.basis.vc,
    "VD [m/s]": s.inputs.basis.vd,
    "Stations": s.inputs.planform.stations.length,
    "Root chord [m]": s.inputs.planform.stations[0]?.chord,
    "Semispan [m]": s.inputs.planform.stations[s.inputs.planform.stations.length - 1]?.y,
    "Load cases": s.exchange.cases.length,
    "Compressibility rule": s.inputs.envelope.compressibility,
    "Spanwise solver": s.inputs.envelope.spanwise,
    "Semispan mass [kg]": s.inputs.masses?.structureKg ?? s.inputs.loads.semispanMass,
    "Mass items": s.inputs.masses?.items.map((i) => `${i.id} ${i.kg} kg`).join(", ") ?? "",
    "Mass cases": s.inputs.masses?.massCases.map((m) => m.id).join(", ") ?? "",
  });
  const a = flat(older);
  const b = flat(newer);
  for (const k of Object.keys(b) as (keyof typeof b)[]) if (a[k] !== b[k]) rows.push({ item: k, before: String(a[k]), after: String(b[k]) });
  const root = (s: ReportSnapshot) => s.result.envelope[0];
  const ra = root(older);
  const rb = root(newer);
  if (ra && rb) {
    for (const [label, x, y] of [
      ["Root shear max [kN]", ra.shearMax / 1000, rb.shearMax / 1000],
      ["Root bending max [kN·m]", ra.bendingMax / 1000, rb.bendingMax / 1000],
      ["Root bending min [kN·m]", ra.bendingMin / 1000, rb.bendingMin / 1000],
      ["Root torsion max [kN·m]", ra.torsionMax / 1000, rb.torsionMax / 1000],
    ] as const) {
      rows.push({ item: label, before: formatNumber(x, 5), after: formatNumber(y, 5) });
    }
  }
  return rows;
}
