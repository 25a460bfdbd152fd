import { href } from "react-router";
import { and, asc, desc, eq, inArray, max, sql } from "drizzle-orm";
import { STEPS } from "~/domain/steps";
import { chainHead, sha256Hex, writeAudit } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { cases, caseSteps, memberships, programmes, reports, signatureVoids, signatures, users, type Report } from "~/db/schema";
import { ISSUED_REPORT_STATUSES, PENDING_REPORT_STATUSES, type Role } from "~/domain/vocabulary";
import { boss, QUEUES, REPORT_JOB_OPTIONS } from "~/jobs/boss.server";
import type { ReportSnapshot } from "~/reports/snapshot";
import { env } from "~/utils/env.server";
import { analysisInputHash, buildCaseFile, buildSectionsFile, caseInputs, parseOrThrow, parseSectionsOrThrow } from "./analysis.server";
import { getCaseSteps } from "./case-steps.server";
import { anchorChain } from "./audit-trail.server";
import { sendMail } from "./mail.server";
import { buildSnapshot, renderReport, versionChanges } from "./report-contents.server";
import { liveSignatures, revisionAuthors } from "./review.server";
import { deleteObject, putObject, getObjectBytes } from "./storage.server";
import type { Actor, CurrentUser } from "~/domain/people";
import { DomainError } from "~/domain/errors";
import { isUuid } from "./programmes.server";


async function mailRole(organisationId: string, role: Role, subject: string, paragraphs: string[], path: string) {
  const rows = await db.select({ email: users.email, roles: memberships.roles }).from(memberships).innerJoin(users, eq(users.id, memberships.userId)).where(eq(memberships.organisationId, organisationId));
  for (const r of rows.filter((x) => x.roles.includes(role))) {
    await sendMail({ to: r.email, organisationId, subject, paragraphs, link: { href: `${env().APP_ORIGIN}${path}`, label: "Open in Spanwright" } }).catch((e: unknown) => console.warn(`mail not sent: ${String(e)}`));
  }
}

/** The report number printed on every page: programme, case and version. */
export function reportNumber(programmeCode: string, caseReference: string, version: number): string {
  return `${programmeCode}-${caseReference}-R${String(version).padStart(2, "0")}`;
}

/**
 * Queues the next version of the case's report. Allowed once every step is approved and the case
 * carries a valid "approved for issue" signature; the job is sent after the row is committed.
 */
export async function requestReport(input: { caseId: string; actor: Actor }): Promise<Report> {
  const row = await createReportRow(input);
  const queue = await boss();
  await queue.send(QUEUES.generateReport, { reportId: row.id }, { ...REPORT_JOB_OPTIONS, singletonKey: row.id });
  return row;
}

/** The queued report row of the next version, after every check; the caller generates or enqueues it. */
export async function createReportRow(input: { caseId: string; actor: Actor }, database: Db | Tx = db): Promise<Report> {
  const [current] = await database.select().from(cases).where(eq(cases.id, input.caseId));
  if (!current) throw new DomainError("Case not found.", { field: "caseId", kind: "not-found" });
  const currentInputs = caseInputs(await getCaseSteps(input.caseId, database));
  const currentFile = parseOrThrow(buildCaseFile(current.title, currentInputs));
  const inputHash = analysisInputHash(currentFile, parseSectionsOrThrow(buildSectionsFile(currentInputs), currentFile));
  const [latest] = await database.select().from(reports).where(and(eq(reports.caseId, input.caseId), inArray(reports.status, [...ISSUED_REPORT_STATUSES]))).orderBy(desc(reports.version)).limit(1);
  if (latest?.inputHash === inputHash) throw new DomainError(`Nothing has changed since version ${latest.version} (${latest.reportNumber}): that report stands.`, { field: "case", kind: "conflict" });
  return database.transaction(async (tx) => {
    const [c] = await tx.select().from(cases).where(eq(cases.id, input.caseId)).for("update");
    if (!c) throw new DomainError("Case not found.", { field: "caseId", kind: "not-found" });
    const steps = await tx.select().from(caseSteps).where(eq(caseSteps.caseId, input.caseId));
    if (steps.length < STEPS.length || steps.some((s) => s.status !== "approved")) throw new DomainError("Every step must be approved before a report can be issued.", { field: "steps", kind: "conflict" });
    const live = await liveSignatures(input.caseId, tx);
    if (!live.some((s) => s.meaning === "approved for issue" && s.step === null && s.reportId === null)) {
      throw new DomainError("A checker must approve the case for issue before a report is requested.", { field: "case", kind: "conflict" });
    }
    const pending = await tx.select({ id: reports.id }).from(reports).where(and(eq(reports.caseId, input.caseId), inArray(reports.status, [...PENDING_REPORT_STATUSES])));
    if (pending.length) throw new DomainError("A report of this case is already being generated.", { field: "case", kind: "conflict" });
    const [{ last }] = (await tx.select({ last: max(reports.version) }).from(reports).where(eq(reports.caseId, input.caseId))) as [{ last: number | null }];
    const version = (last ?? 0) + 1;
    const [p] = await tx.select().from(programmes).where(eq(programmes.id, c.programmeId));
    const [r] = await tx
      .insert(reports)
      .values({ organisationId: c.organisationId, caseId: c.id, version, reportNumber: reportNumber(p!.code, c.reference, version), requestedBy: input.actor.id, progressNote: "waiting for the report worker to take it" })
      .returning();
    await writeAudit(tx, { organisationId: c.organisationId, actor: input.actor, action: "report.request", entityType: "report", entityId: r!.id, after: { caseId: c.id, version, reportNumber: r!.reportNumber } });
    return r!;
  });
}

/**
 * Records the job's progress for the reports page, only while the job is generating: the renderer's
 * progress writes are not awaited, and a late one must not overwrite what a failed attempt recorded.
 */
export async function setProgress(reportId: string, progress: number, note: string) {
  await db.update(reports).set({ progress, progressNote: note }).where(and(eq(reports.id, reportId), eq(reports.status, "generating")));
}

/**
 * The job: snapshot → PDF → S3 → database, so that no half-issued report can exist. The object goes
 * to a key unique to this report version; only then, in one transaction, does the row become
 * "issued" with the object's size and SHA-256. If that transaction fails the object is removed; if
 * the upload fails nothing is recorded and the job is retried. A finished report is left alone.
 */
export async function generateReport(reportId: string, attempt: { retryCount: number; retryLimit: number } = { retryCount: 0, retryLimit: 0 }, database: Db | Tx = db): Promise<void> {
  const [report] = await database.select().from(reports).where(eq(reports.id, reportId));
  if (!report || report.status === "issued" || report.status === "released") return;
  await database.update(reports).set({ status: "generating", attempts: report.attempts + 1, failure: null }).where(eq(reports.id, reportId));
  let key: string | null = null;
  try {
    await setProgress(reportId, 10, "freezing the inputs and results");
    const snapshot = await buildSnapshot(report);
    // Progress is only shown to people: a lost update (database away mid-render) must not become an
    // unhandled rejection; the next awaited step reports the outage.
    const pdf = await renderReport(snapshot, { onProgress: (pct, note) => void setProgress(reportId, 20 + Math.round(pct * 0.6), note).catch(() => {}) });
    await setProgress(reportId, 85, "storing the PDF");
    const sha256 = sha256Hex(pdf);
    const bucket = env().S3_BUCKET_REPORTS;
    key = `cases/${report.caseId}/${report.reportNumber}.pdf`;
    // The stored PDF carries the audit trail's head as it stood when the report was made.
    const head = await chainHead(database, report.organisationId);
    await putObject(bucket, key, pdf, "application/pdf", sha256, { "audit-seq": String(head?.seq ?? 0), "audit-hash": head?.hash ?? "" });
    await database.transaction(async (tx) => {
      const [locked] = await tx.select().from(reports).where(eq(reports.id, reportId)).for("update");
      if (!locked || locked.status === "issued" || locked.status === "released") throw new DomainError("already issued", { field: "report", kind: "conflict" });
      await tx
        .update(reports)
        .set({ status: "issued", progress: 100, progressNote: "issued", bucket, key, size: pdf.byteLength, sha256, inputHash: snapshot.inputHash, engineVersion: snapshot.engineVersion, snapshot: snapshot as unknown as Record<string, unknown>, issuedAt: new Date(snapshot.issuedAt) })
        .where(eq(reports.id, reportId));
      await tx.update(cases).set({ status: "issued", updatedAt: new Date() }).where(eq(cases.id, report.caseId));
      await writeAudit(tx, { organisationId: report.organisationId, actor: null, action: "report.issue", entityType: "report", entityId: reportId, after: { reportNumber: report.reportNumber, version: report.version, key, size: pdf.byteLength, sha256, inputHash: snapshot.inputHash } });
    });
  } catch (error) {
    if (error instanceof DomainError && error.message === "already issued") return;
    // The object of a report that did not become issued must not linger.
    if (key) await removeUnrecorded(env().S3_BUCKET_REPORTS, key);
    const last = attempt.retryCount >= attempt.retryLimit;
    const message = error instanceof Error ? error.message : String(error);
    await db
      .update(reports)
      .set({ status: last ? "failed" : "queued", progress: 0, progressNote: last ? "failed" : `attempt ${report.attempts + 1} failed; retrying`, failure: message.slice(0, 500) })
      .where(and(eq(reports.id, reportId), inArray(reports.status, [...PENDING_REPORT_STATUSES])))
      .catch(() => {});
    throw error;
  }
  // The issue is anchored outside the database at once (the periodic checkpoint catches up if not).
  await anchorChain(report.organisationId, `report ${report.reportNumber} issued`).catch((error: unknown) =>
    console.warn(`audit checkpoint after ${report.reportNumber} not written: ${error instanceof Error ? error.message : String(error)}`),
  );
  await mailRole(report.organisationId, "quality", `${report.reportNumber} issued`, [`Report ${report.reportNumber} (version ${report.version}) has been issued and waits for release.`], `/reports`);
  const [requester] = await database.select({ email: users.email }).from(users).where(eq(users.id, report.requestedBy));
  if (requester) {
    await sendMail({ to: requester.email, organisationId: report.organisationId, subject: `${report.reportNumber} issued`, paragraphs: [`Your report ${report.reportNumber} has been generated and issued.`], link: { href: env().APP_ORIGIN + href("/cases/:caseId/reports", { caseId: report.caseId }), label: "Open the reports of the case" } }).catch(() => {});
  }
}

/**
 * Deletes the object of a report whose recording failed, trying a few times: the failure that got
 * us here (a database or network outage) may have disturbed the store's connection too. An object
 * that still cannot be deleted is said in the log; it is never referenced, and the job's next
 * attempt writes the same key again.
 */
async function removeUnrecorded(bucket: string, key: string): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    try {
      await deleteObject(bucket, key);
      return;
    } catch (error) {
      if (attempt === 3) {
        console.warn(`could not remove the unrecorded report object ${bucket}/${key}: ${error instanceof Error ? error.message : String(error)}`);
        return;
      }
      await new Promise((r) => setTimeout(r, 200 * attempt));
    }
  }
}

/** An issued report of this case (another case's report, even of the same organisation, is not found here). */
async function issuedReport(database: Db | Tx, input: { reportId: string; caseId: string; organisationId: string }, lock = false): Promise<Report & { sha256: string }> {
  const query = database
    .select()
    .from(reports)
    .where(and(eq(reports.id, input.reportId), eq(reports.caseId, input.caseId), eq(reports.organisationId, input.organisationId)));
  const [r] = lock ? await query.for("update") : await query;
  if (!r) throw new DomainError("Report not found in this case.", { field: "reportId", kind: "not-found" });
  if (r.status !== "issued" || !r.sha256) throw new DomainError(`Only an issued report can be released (this one is ${r.status}).`, { field: "status", kind: "conflict" });
  return { ...r, sha256: r.sha256 };
}

/** What a release signature would bind if made now: the issued PDF's SHA-256 (see review.signatureTarget). */
export async function releaseTarget(input: { reportId: string; caseId: string; organisationId: string }, database: Db | Tx = db): Promise<string> {
  return (await issuedReport(database, input)).sha256;
}

/**
 * Quality's release: a signature with meaning "released" on exactly the issued PDF bytes, of a
 * report of this case (a report of another case, even of the same organisation, is not found here).
 * Nobody signs two roles on one report: whoever wrote a revision of the case or signed it (as
 * preparer or checker) does not release its report. `expectedHash`, when given, is the PDF hash the signer was shown.
 */
export async function releaseReport(input: { reportId: string; caseId: string; organisationId: string; current: CurrentUser; role: Role; confirmedBy: "password" | "sso"; expectedHash?: string }, database: Db | Tx = db) {
  const actor = input.current.user;
  const released = await database.transaction(async (tx) => {
    const r = await issuedReport(tx, input, true);
    if (input.expectedHash !== undefined && input.expectedHash !== r.sha256) throw new DomainError("The report you asked to sign has changed since: sign anew.", { field: "reportId", kind: "conflict" });
    const signed = (await liveSignatures(r.caseId, tx)).filter((s) => s.reportId === null && s.signerId === actor.id);
    const wrote = (await revisionAuthors(tx, r.caseId)).has(actor.id);
    if (wrote || signed.length) {
      const why = wrote ? "wrote revisions of this case" : `signed this case as ${signed[0]!.meaning === "prepared" ? "its preparer" : signed[0]!.role}`;
      throw new DomainError(`You ${why}: someone else must release its report (nobody signs two roles on one report).`, { field: "reportId", kind: "forbidden" });
    }
    const [sig] = await tx
      .insert(signatures)
      .values({ organisationId: r.organisationId, caseId: r.caseId, reportId: r.id, signerId: actor.id, signerName: actor.name, role: input.role, meaning: "released", confirmedBy: input.confirmedBy, revisionHash: r.sha256 })
      .returning();
    const now = new Date();
    await tx.update(reports).set({ status: "released", releasedAt: now }).where(eq(reports.id, r.id));
    await tx.update(cases).set({ status: "released", updatedAt: now }).where(eq(cases.id, r.caseId));
    await writeAudit(tx, { organisationId: r.organisationId, actor, action: "report.release", entityType: "report", entityId: r.id, after: { signatureId: sig!.id, sha256: r.sha256 } });
    return r;
  });
  await mailRole(released.organisationId, "engineer", `${released.reportNumber} released`, [`${actor.name} released report ${released.reportNumber}.`], href("/cases/:caseId/reports", { caseId: released.caseId }));
  await mailRole(released.organisationId, "checker", `${released.reportNumber} released`, [`${actor.name} released report ${released.reportNumber}.`], href("/cases/:caseId/reports", { caseId: released.caseId }));
}

export interface ReportListItem {
  id: string;
  caseId: string;
  version: number;
  reportNumber: string;
  status: Report["status"];
  progress: number;
  progressNote: string;
  failure: string | null;
  sha256: string | null;
  size: number | null;
  createdAt: Date;
  issuedAt: Date | null;
  releasedAt: Date | null;
  signatures: { name: string; role: string; meaning: string; signedAt: Date; revisionHash: string }[];
}

/** Every report of the organisation with the reference and title of its case. */
export async function listReportsWithCases(organisationId: string, database: Db | Tx = db) {
  const [list, refs] = await Promise.all([
    listReports(organisationId, undefined, database),
    database.select({ id: cases.id, reference: cases.reference, title: cases.title }).from(cases).where(eq(cases.organisationId, organisationId)),
  ]);
  return list.map((r) => ({ ...r, case: refs.find((c) => c.id === r.caseId) ?? null }));
}

/** Reports of one case (or of the organisation), with every signature that stands behind each. */
export async function listReports(organisationId: string, caseId?: string, database: Db | Tx = db): Promise<ReportListItem[]> {
  // Of the snapshot (a version's input and result, megabytes for a large case) only its signatures.
  const rows = await database
    .select({
      id: reports.id,
      caseId: reports.caseId,
      version: reports.version,
      reportNumber: reports.reportNumber,
      status: reports.status,
      progress: reports.progress,
      progressNote: reports.progressNote,
      failure: reports.failure,
      sha256: reports.sha256,
      size: reports.size,
      requestedAt: reports.requestedAt,
      issuedAt: reports.issuedAt,
      releasedAt: reports.releasedAt,
      frozenSignatures: sql<ReportSnapshot["signatures"] | null>`${reports.snapshot} -> 'signatures'`,
    })
    .from(reports)
    .where(caseId ? and(eq(reports.organisationId, organisationId), eq(reports.caseId, caseId)) : eq(reports.organisationId, organisationId))
    .orderBy(desc(reports.requestedAt));
  const caseIds = [...new Set(rows.map((r) => r.caseId))];
  const sigs = caseIds.length
    ? await database.select({ s: signatures, v: signatureVoids.id }).from(signatures).leftJoin(signatureVoids, eq(signatureVoids.signatureId, signatures.id)).where(inArray(signatures.caseId, caseIds)).orderBy(asc(signatures.signedAt))
    : [];
  return rows.map((r) => {
    // A report carries the case signatures frozen into its snapshot, plus its own release.
    const frozen = (r.frozenSignatures ?? []).map((s) => ({ name: s.name, role: s.role, meaning: s.meaning, signedAt: new Date(s.signedAt), revisionHash: s.revisionHash }));
    const own = sigs.filter((x) => x.s.reportId === r.id && !x.v).map((x) => ({ name: x.s.signerName, role: x.s.role, meaning: x.s.meaning, signedAt: x.s.signedAt, revisionHash: x.s.revisionHash }));
    return { id: r.id, caseId: r.caseId, version: r.version, reportNumber: r.reportNumber, status: r.status, progress: r.progress, progressNote: r.progressNote, failure: r.failure, sha256: r.sha256, size: r.size, createdAt: r.requestedAt, issuedAt: r.issuedAt, releasedAt: r.releasedAt, signatures: [...frozen, ...own] };
  });
}

export async function getReport(organisationId: string, reportId: string, database: Db | Tx = db) {
  const [r] = await database.select().from(reports).where(and(eq(reports.id, reportId), eq(reports.organisationId, organisationId)));
  return r ?? null;
}

/** The stored PDF bytes, checked against the recorded SHA-256 before they are handed out. */
export async function reportBytes(r: Report): Promise<Uint8Array> {
  if (!r.key || !r.bucket || !r.sha256) throw new DomainError("This report has no PDF yet.", { field: "report", kind: "conflict" });
  const bytes = await getObjectBytes(r.bucket, r.key);
  if (sha256Hex(bytes) !== r.sha256) throw new Error(`stored report ${r.key} does not match its recorded SHA-256`);
  return bytes;
}

/**
 * The stored PDF of a report for a download, with the download recorded in the audit log.
 * @throws DomainError (not-found) for a report of another organisation or one without a PDF yet
 */
export async function downloadReport(input: { organisationId: string; reportId: string; actor: Actor }, database: Db | Tx = db): Promise<{ report: Report; bytes: Uint8Array }> {
  const report = isUuid(input.reportId) ? await getReport(input.organisationId, input.reportId) : null;
  if (!report || !report.sha256) throw new DomainError("The report was not found, or you have no access to it.", { kind: "not-found" });
  const bytes = await reportBytes(report);
  await database.transaction((tx) => writeAudit(tx, { organisationId: report.organisationId, actor: input.actor, action: "report.download", entityType: "report", entityId: report.id }));
  return { report, bytes };
}

/** Which issued report of the organisation a PDF is, by the SHA-256 of its bytes. */
export async function verifyPdf(organisationId: string, bytes: Uint8Array, database: Db | Tx = db) {
  const sha256 = sha256Hex(bytes);
  const [r] = await database.select().from(reports).where(and(eq(reports.organisationId, organisationId), eq(reports.sha256, sha256)));
  return { sha256, report: r ?? null };
}



/** The two newest issued versions of a case's report, and what changed between them; null before a second version. */
export async function latestVersionChanges(caseId: string, database: Db | Tx = db) {
  // The snapshots (input and result of each version, megabytes for a large case) of the two newest only, and only when there are two.
  const newest = await database
    .select({ id: reports.id })
    .from(reports)
    .where(and(eq(reports.caseId, caseId), inArray(reports.status, [...ISSUED_REPORT_STATUSES])))
    .orderBy(desc(reports.version))
    .limit(2);
  if (newest.length < 2) return null;
  const issued = await database
    .select({ version: reports.version, snapshot: reports.snapshot })
    .from(reports)
    .where(inArray(reports.id, newest.map((r) => r.id)))
    .orderBy(asc(reports.version));
  const [older, newer] = issued as [(typeof issued)[number], (typeof issued)[number]];
  return { from: older.version, to: newer.version, rows: versionChanges(older.snapshot as unknown as ReportSnapshot, newer.snapshot as unknown as ReportSnapshot) };
}
