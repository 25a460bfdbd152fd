import { and, desc, eq, inArray } from "drizzle-orm";
import { writeAudit } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { reportReruns, reports, users } from "~/db/schema";
import type { Actor } from "~/domain/people";
import { DomainError } from "~/domain/errors";
import { compareValues } from "~/domain/reproduction";
import { ISSUED_REPORT_STATUSES } from "~/domain/vocabulary";
import { ENGINE_VERSION } from "~/engine";
import { boss, QUEUES } from "~/jobs/boss.server";
import { DIRECT_MACH_LIMIT, exchangeDocumentText, runCaseAsync, type CaseFileInput, type SectionsFile } from "~/exchange";
import type { ReportSnapshot } from "~/reports/snapshot";
import { parseOrThrow, parseSectionsOrThrow } from "./analysis.server";
import { ruleSensitivity, spanwiseComparison } from "./comparisons.server";
import { runEngineAsync } from "./engine.server";

/*
 * "Re-run this report": the numbers of an issued report recomputed from its own stored input
 * snapshot (the attached documents, exactly as a reader of the PDF would have them) with the engine
 * of the day, in the job queue with progress, and compared number by number with what was issued.
 */

const OPEN = ["queued", "running"] as const;

/** What the reports page shows of a report's latest re-run. */
export interface RerunView {
  id: string;
  reportId: string;
  status: (typeof reportReruns.$inferSelect)["status"];
  progress: number;
  progressNote: string;
  requestedBy: string;
  createdAt: Date;
  finishedAt: Date | null;
  engineVersion: string | null;
  /** The engine the report was issued with. */
  issuedEngine: string | null;
  identical: boolean | null;
  compared: number | null;
  differing: number | null;
  differences: { path: string; issued: string; now: string }[];
  failure: string | null;
}

/**
 * Queues a re-run of an issued (or released) report of the case (another case's report is not found
 * through it). One at a time per report.
 * @throws DomainError (not-found) for another organisation's or an unissued report; (conflict) while one runs
 */
export async function requestRerun(input: { organisationId: string; caseId: string; reportId: string; actor: Actor }, database: Db | Tx = db): Promise<{ id: string }> {
  const row = await database.transaction(async (tx) => {
    const [r] = await tx
      .select({ id: reports.id, status: reports.status, reportNumber: reports.reportNumber })
      .from(reports)
      .where(and(eq(reports.id, input.reportId), eq(reports.organisationId, input.organisationId), eq(reports.caseId, input.caseId)))
      .for("update");
    if (!r || !(ISSUED_REPORT_STATUSES as readonly string[]).includes(r.status)) throw new DomainError("reportId: only an issued report can be re-run, and this one was not found among them.", { field: "reportId", kind: "not-found" });
    const open = await tx.select({ id: reportReruns.id }).from(reportReruns).where(and(eq(reportReruns.reportId, r.id), inArray(reportReruns.status, [...OPEN])));
    if (open.length) throw new DomainError(`${r.reportNumber} is being re-run already: wait for that run to finish.`, { field: "reportId", kind: "conflict" });
    const [run] = await tx.insert(reportReruns).values({ organisationId: input.organisationId, reportId: r.id, requestedBy: input.actor.id, progressNote: "waiting for a worker" }).returning({ id: reportReruns.id });
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "report.rerun", entityType: "report", entityId: r.id, after: { rerunId: run!.id, engine: ENGINE_VERSION } });
    return run!;
  });
  await (await boss()).send(QUEUES.rerunReport, { rerunId: row.id }, { singletonKey: row.id, retryLimit: 1, expireInSeconds: 30 * 60 });
  return row;
}

async function progress(id: string, pct: number, note: string) {
  await db.update(reportReruns).set({ progress: pct, progressNote: note }).where(and(eq(reportReruns.id, id), eq(reportReruns.status, "running")));
}

/** The input documents of a snapshot as the PDF attaches them (older snapshots: serialised from `exchange`). */
function documentsOf(s: ReportSnapshot): { caseDoc: CaseFileInput; sections?: SectionsFile } {
  const caseText = s.documents?.case ?? exchangeDocumentText(s.exchange);
  return { caseDoc: JSON.parse(caseText) as CaseFileInput, sections: s.documents?.sections ? (JSON.parse(s.documents.sections) as SectionsFile) : undefined };
}

/**
 * The job: recomputes the report's results (and, where it printed them, the rule sensitivity and
 * the spanwise methods) from the snapshot's documents, compares every value with the issued ones
 * and stores the verdict with the recomputed numbers. Idempotent: a finished run is left alone.
 */
export async function runRerun(rerunId: string): Promise<void> {
  const [run] = await db.select().from(reportReruns).where(eq(reportReruns.id, rerunId));
  if (!run || run.status === "done" || run.status === "failed") return;
  await db.update(reportReruns).set({ status: "running", progress: 2, progressNote: "reading the report's input snapshot" }).where(eq(reportReruns.id, rerunId));
  try {
    const [report] = await db.select({ snapshot: reports.snapshot }).from(reports).where(eq(reports.id, run.reportId));
    const s = report!.snapshot as unknown as ReportSnapshot;
    const { caseDoc, sections: sectionsDoc } = documentsOf(s);
    const file = parseOrThrow(caseDoc);
    const sections = parseSectionsOrThrow(sectionsDoc, file);
    const machs = Math.min(new Set(file.cases.map((c) => c.mach)).size, DIRECT_MACH_LIMIT);
    const result = await runEngineAsync(() =>
      runCaseAsync(file, {
        sections,
        onProgress: (p) =>
          p.phase === "solves"
            ? progress(rerunId, 5 + Math.min(60, Math.round((60 * p.done) / Math.max(1, machs))), `spanwise solves: ${p.done} made`)
            : progress(rerunId, 65 + Math.round((10 * p.done) / Math.max(1, p.total)), `load cases: ${p.done} of ${p.total}`),
      }),
    );
    const recomputed: Record<string, unknown> = { result };
    const issued: Record<string, unknown> = { result: s.result };
    if (s.sensitivity) {
      await progress(rerunId, 78, "critical cases under each compressibility rule");
      recomputed.sensitivity = ruleSensitivity(caseDoc, result, sections);
      issued.sensitivity = s.sensitivity;
    }
    if (s.spanwise) {
      await progress(rerunId, 88, "critical cases by each spanwise method");
      recomputed.spanwise = s.spanwise.map((c) => spanwiseComparison(caseDoc, c.caseId, sections));
      issued.spanwise = s.spanwise;
    }
    await progress(rerunId, 96, "comparing every number");
    const verdict = compareValues(issued, recomputed, { ignore: ["result.engine"] });
    await db
      .update(reportReruns)
      .set({
        status: "done",
        progress: 100,
        progressNote: "done",
        engineVersion: ENGINE_VERSION,
        identical: verdict.differing === 0,
        compared: verdict.compared,
        differing: verdict.differing,
        differences: verdict.differences,
        result: JSON.parse(JSON.stringify(recomputed)) as Record<string, unknown>,
        finishedAt: new Date(),
      })
      .where(eq(reportReruns.id, rerunId));
  } catch (error) {
    // A refusal of the snapshot by today's engine or contract is the run's answer, not a fault to retry.
    const message = error instanceof Error ? error.message : String(error);
    await db.update(reportReruns).set({ status: "failed", progress: 0, progressNote: "failed", failure: message.slice(0, 500), engineVersion: ENGINE_VERSION, finishedAt: new Date() }).where(eq(reportReruns.id, rerunId));
    if (!(error instanceof DomainError)) throw error;
  }
}

/** The latest re-run of each of the given reports of the organisation. */
export async function latestReruns(organisationId: string, reportIds: string[], database: Db | Tx = db): Promise<Record<string, RerunView>> {
  if (!reportIds.length) return {};
  const rows = await database
    .select({ r: reportReruns, by: users.name, issuedEngine: reports.engineVersion })
    .from(reportReruns)
    .innerJoin(users, eq(users.id, reportReruns.requestedBy))
    .innerJoin(reports, eq(reports.id, reportReruns.reportId))
    .where(and(eq(reportReruns.organisationId, organisationId), inArray(reportReruns.reportId, reportIds)))
    .orderBy(desc(reportReruns.createdAt));
  const out: Record<string, RerunView> = {};
  for (const { r, by, issuedEngine } of rows) {
    if (out[r.reportId]) continue;
    out[r.reportId] = {
      id: r.id,
      reportId: r.reportId,
      status: r.status,
      progress: r.progress,
      progressNote: r.progressNote,
      requestedBy: by,
      createdAt: r.createdAt,
      finishedAt: r.finishedAt,
      engineVersion: r.engineVersion,
      issuedEngine,
      identical: r.identical,
      compared: r.compared,
      differing: r.differing,
      differences: r.differences ?? [],
      failure: r.failure,
    };
  }
  return out;
}
