import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq, sql } from "drizzle-orm";
import S3rver from "s3rver";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listCapturedMail } from "~/server/dev-services/mail";
import { db } from "~/db/client.server";
import { caseSteps, cases, reports, signatures, signatureVoids, users } from "~/db/schema";
import { action as reviewAction, loader as reviewLoader } from "~/routes/cases/review";
import { action as reportsAction } from "~/routes/cases/reports";
import { action as verifyAction } from "~/routes/reports";
import { loader as pdfLoader } from "~/routes/api/v1/report-pdf";
import { loader as caseReportsLoader } from "~/routes/api/v1/case-reports";
import { STEPS } from "~/domain/steps";
import { reportStage, type ReportStatus } from "~/domain/vocabulary";
import { formatQuantity } from "~/domain/units";
import { saveStep } from "~/services/case-steps.server";
import { setMemberRoles } from "~/services/organisation.server";
import { createReportRow, generateReport } from "~/services/reports.server";
import { listKeys, resetS3Client } from "~/services/storage.server";
import { resetEnvCache } from "~/utils/env.server";
import { canonical, cookieFor, demoUser, form, request, run, seed, routeArgs } from "./helpers";

let caseId = "";
let orgId = "";
const cookies: Record<string, string> = {};

const sha = (b: string | Uint8Array) => createHash("sha256").update(b).digest("hex");

const review = (who: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie: cookies[who], body: form(fields) }), params: { caseId } });

async function approveAll() {
  for (const s of STEPS) {
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, s.key)));
    if (row!.status === "approved") continue;
    if (row!.status !== "submitted") expect((await review("engineer", { intent: "submit", step: s.key, password: demoUser("engineer").password })).status).toBe(200);
    expect((await review("checker", { intent: "approve", step: s.key, password: demoUser("checker").password })).status).toBe(200);
  }
}

beforeAll(async () => {
  await seed();
  for (const who of ["engineer", "checker", "quality", "outsider"]) cookies[who] = await cookieFor(who as never);
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  orgId = c!.organisationId;
});

describe("review of each step", () => {
  it("makes a submitted step read-only and tells the checkers by e-mail", async () => {
    expect((await review("engineer", { intent: "submit", step: "basis", password: demoUser("engineer").password, comment: "Basis per the agreed G-1 issue paper." })).status).toBe(200);
    const mail = await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: demoUser("checker").email });
    expect(mail.some((m) => m.subject.includes("basis submitted for check") && (m.html ?? "").includes(`/cases/${caseId}/review`))).toBe(true);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
    await expect(saveStep({ caseId, step: "basis", baseRevision: row!.revision, data: row!.data!, actor: { id: row!.updatedBy!, email: demoUser("engineer").email } })).rejects.toThrow(/read-only/);
  });

  it("refuses approval by an engineer, by a wrong password, and by the author of the revision", async () => {
    expect((await review("engineer", { intent: "approve", step: "basis", password: demoUser("engineer").password })).status).toBe(403);
    const wrong = await review("checker", { intent: "approve", step: "basis", password: "not-my-password" });
    expect(wrong.status).toBe(401);
    // Erin edited every revision of the demo case; given the checker role too, she still may not approve them.
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const [sam] = await db.select().from(users).where(eq(users.email, demoUser("admin").email));
    await setMemberRoles({ organisationId: orgId, userId: erin!.id, roles: ["engineer", "checker"], actor: { id: sam!.id, email: sam!.email } });
    const own = await review("engineer", { intent: "approve", step: "basis", password: demoUser("engineer").password });
    expect(own.status).toBe(403);
    expect((own.body as { message: string }).message).toMatch(/separation of duties/);
    await setMemberRoles({ organisationId: orgId, userId: erin!.id, roles: ["engineer"], actor: { id: sam!.id, email: sam!.email } });
    expect(await db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "checked")))).toHaveLength(0);
  });

  it("returns a step with the checker's comment, and tells the engineer", async () => {
    const res = await review("checker", { intent: "return", step: "basis", comment: "VD must follow 23.335(b) for this wing loading.", anchor: "VD" });
    expect(res.status).toBe(200);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
    expect(row!.status).toBe("returned");
    const mail = await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: demoUser("engineer").email });
    expect(mail.some((m) => m.subject.includes("basis returned") && m.text.includes("23.335(b)"))).toBe(true);
  });

  it("approves steps in order: a later step waits, saying for which, until those before it are approved", async () => {
    const [planform] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    if (planform!.status !== "submitted") expect((await review("engineer", { intent: "submit", step: "planform", password: demoUser("engineer").password })).status).toBe(200);
    const early = await review("checker", { intent: "approve", step: "planform", password: demoUser("checker").password });
    expect(early.status).toBe(409);
    expect((early.body as { message: string }).message).toMatch(/planform step waits for the approval of basis/);
    const [after] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    expect(after!.status).toBe("submitted");
    expect(await db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "checked")))).toHaveLength(0);
  });

  it("records an approval as a signature on the exact revision: signer, role, meaning, UTC time and hash", async () => {
    await approveAll();
    const sigs = await db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "checked")));
    expect(sigs).toHaveLength(STEPS.length);
    const [basis] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
    const sig = sigs.find((s) => s.step === "basis")!;
    expect(sig).toMatchObject({ signerName: "Marek Oduya", role: "checker", meaning: "checked", revision: basis!.revision, confirmedBy: "password" });
    expect(sig.revisionHash).toBe(sha(canonical({ caseId, step: "basis", revision: basis!.revision, data: basis!.data })));
    await expect(db.execute(sql`UPDATE signatures SET meaning = 'released'`)).rejects.toMatchObject({ cause: expect.objectContaining({ message: expect.stringMatching(/append-only/) }) });
  });

  it("makes no revision and voids nothing when a step is saved unchanged, numbers back through display rounding included", async () => {
    expect((await review("checker", { intent: "approve-case", password: demoUser("checker").password })).status).toBe(200);
    // The engineers, who request the report, are told the case is approved for issue.
    const mail = await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: demoUser("engineer").email });
    expect(mail.some((m) => m.subject.includes("TN-WL-001: approved for issue") && (m.html ?? "").includes(`/cases/${caseId}/reports`))).toBe(true);
    const [planform] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    // As a chord shown in feet to ten figures and typed back comes out in metres.
    const data = structuredClone(planform!.data) as { stations: { chord: number }[] };
    data.stations[1]!.chord = Number(((data.stations[1]!.chord / 0.3048).toPrecision(10) as unknown as number) * 0.3048);
    const saved = await saveStep({ caseId, step: "planform", baseRevision: planform!.revision, data, actor: { id: erin!.id, email: erin!.email } });
    expect(saved).toMatchObject({ revision: planform!.revision, unchanged: true });
    expect(await db.select().from(signatureVoids)).toHaveLength(0);
    const [after] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    expect(after).toMatchObject({ revision: planform!.revision, status: "approved" });
  });

  it("voids the approval of an edited step, of every step downstream and of the case, and says so", async () => {
    const [planform] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const data = planform!.data as { stations: { chord: number }[] };
    data.stations[0]!.chord = 2.15;
    await saveStep({ caseId, step: "planform", baseRevision: planform!.revision, data, actor: { id: erin!.id, email: erin!.email } });
    const voids = await db.select({ step: signatures.step, meaning: signatures.meaning, reason: signatureVoids.reason }).from(signatureVoids).innerJoin(signatures, eq(signatures.id, signatureVoids.signatureId));
    const downstream = ["distribution", "envelope", "loads", "masses", "planform", "sections"];
    expect(voids.filter((v) => v.meaning !== "prepared").map((v) => v.step ?? v.meaning).sort()).toEqual(["approved for issue", ...downstream].sort());
    // The preparer's signatures of the same steps go with them.
    expect(voids.filter((v) => v.meaning === "prepared").map((v) => v.step).sort()).toEqual(downstream.sort());
    expect(voids[0]!.reason).toMatch(/planform changed to revision \d+/);
    const state = await run(reviewLoader, { request: request(`/cases/${caseId}/review`, { cookie: cookies.checker }), params: { caseId } });
    const steps = (state.body as { steps: { key: string; status: string }[] }).steps;
    expect(steps.find((s) => s.key === "basis")!.status).toBe("approved");
    expect(steps.filter((s) => s.key !== "basis").every((s) => s.status === "draft")).toBe(true);
  });
});

// Each report renders a PDF of the demo case (four mass cases at three altitudes): a generous limit, so a
// busy machine cannot fail them (no timing in the checks).
describe("reports", { timeout: 240_000 }, () => {
  let s3dir = "";
  let spare: S3rver | undefined;
  afterAll(async () => {
    await spare?.close().catch(() => {});
    if (s3dir) fs.rmSync(s3dir, { recursive: true, force: true });
  });

  it("is refused until the case is approved for issue", async () => {
    const res = await run(reportsAction, { request: request(`/cases/${caseId}/reports`, { method: "POST", cookie: cookies.engineer, body: form({ intent: "request" }) }), params: { caseId } });
    expect(res.status).toBe(409);
    expect(await db.select().from(reports)).toHaveLength(0);
  });

  // Two PDFs and the store's retries: a generous limit, so a busy machine cannot fail it.
  it("leaves no half-issued report when S3 is down, and completes once it returns", { timeout: 180_000 }, async () => {
    await approveAll();
    expect((await review("checker", { intent: "approve-case", password: demoUser("checker").password })).status).toBe(200);
    // A store of our own that we can take down and bring back.
    s3dir = fs.mkdtempSync(path.join(os.tmpdir(), "sw-s3-"));
    spare = new S3rver({ port: 0, address: "127.0.0.1", silent: true, directory: s3dir, configureBuckets: [{ name: "spanwright-reports", configs: [] }] });
    const { port } = await spare.run();
    const saved = process.env.S3_ENDPOINT;
    process.env.S3_ENDPOINT = `http://127.0.0.1:${port}`;
    resetEnvCache();
    resetS3Client();
    await spare.close();
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const row = await createReportRow({ caseId, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
    await expect(generateReport(row.id, { retryCount: 0, retryLimit: 3 })).rejects.toThrow();
    const [afterFailure] = await db.select().from(reports).where(eq(reports.id, row.id));
    expect(afterFailure).toMatchObject({ status: "queued", sha256: null, key: null });
    spare = new S3rver({ port, address: "127.0.0.1", silent: true, directory: s3dir, configureBuckets: [{ name: "spanwright-reports", configs: [] }] });
    await spare.run();
    resetS3Client();
    await generateReport(row.id, { retryCount: 1, retryLimit: 3 });
    const [issued] = await db.select().from(reports).where(eq(reports.id, row.id));
    expect(issued!.status).toBe("issued");
    expect(await listKeys("spanwright-reports")).toEqual([issued!.key]);
    await spare.close();
    spare = undefined;
    process.env.S3_ENDPOINT = saved;
    resetEnvCache();
    resetS3Client();
    // The harness's store has none of this report: re-issue there for the remaining checks. An
    // issued report cannot be deleted (reports_append_only); only a test switches that off.
    await db.execute(sql`ALTER TABLE reports DISABLE TRIGGER reports_append_only`);
    await db.execute(sql`DELETE FROM reports WHERE id = ${row.id}`);
    await db.execute(sql`ALTER TABLE reports ENABLE TRIGGER reports_append_only`);
  });

  it("removes the stored PDF when the database refuses to record it", async () => {
    await db.execute(sql`CREATE FUNCTION refuse_issue() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN IF NEW.status = 'issued' THEN RAISE EXCEPTION 'database refused'; END IF; RETURN NEW; END; $$`);
    await db.execute(sql`CREATE TRIGGER refuse_issue BEFORE UPDATE ON reports FOR EACH ROW EXECUTE FUNCTION refuse_issue()`);
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const row = await createReportRow({ caseId, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
    const before = await listKeys("spanwright-reports", `cases/${caseId}/`);
    await expect(generateReport(row.id, { retryCount: 3, retryLimit: 3 })).rejects.toMatchObject({ cause: expect.objectContaining({ message: "database refused" }) });
    expect(await listKeys("spanwright-reports", `cases/${caseId}/`)).toEqual(before);
    const [failed] = await db.select().from(reports).where(eq(reports.id, row.id));
    expect(failed).toMatchObject({ status: "failed", sha256: null });
    await db.execute(sql`DROP TRIGGER refuse_issue ON reports`);
    await db.execute(sql`DELETE FROM reports WHERE id = ${row.id}`);
  });

  it("issues a PDF whose S3 bytes match PostgreSQL and whose text holds the title, the root bending moment and every signer", async () => {
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const row = await createReportRow({ caseId, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
    // What the reports page polls: the stage in words beside the bar, queued until a worker takes it.
    const polled = async () => ((await ((await caseReportsLoader((await routeArgs(request(`/api/v1/cases/${caseId}/reports`, { cookie: cookies.engineer }), { caseId })) as never)) as Response).json()) as { reports: { id: string; status: ReportStatus; progressNote: string }[] }).reports.find((r) => r.id === row.id)!;
    const queued = await polled();
    expect(reportStage(queued.status, queued.progressNote)).toBe("Queued");
    expect(queued.progressNote).toMatch(/waiting for the report worker/);
    // Every progress note the job writes, recorded by the database as it is written.
    await db.execute(sql`CREATE TABLE progress_log (n serial, status text, note text)`);
    await db.execute(sql`CREATE FUNCTION log_progress() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN INSERT INTO progress_log (status, note) VALUES (NEW.status, NEW.progress_note); RETURN NEW; END $$`);
    await db.execute(sql`CREATE TRIGGER log_progress AFTER UPDATE ON reports FOR EACH ROW EXECUTE FUNCTION log_progress()`);
    await generateReport(row.id);
    await db.execute(sql`DROP TRIGGER log_progress ON reports`);
    const log = (await db.execute(sql`SELECT status, note FROM progress_log ORDER BY n`)).rows as { status: ReportStatus; note: string }[];
    await db.execute(sql`DROP TABLE progress_log; DROP FUNCTION log_progress`);
    const stages = log.filter((l) => l.note !== queued.progressNote).map((l) => reportStage(l.status, l.note));
    expect(stages[0]).toBe("Rendering");
    expect(stages).toContain("Storing");
    expect(stages.at(-1)).toBe("Issued");
    expect(stages.slice(0, -1).every((st) => st === "Rendering" || st === "Storing")).toBe(true);
    const done = await polled();
    expect(reportStage(done.status, done.progressNote)).toBe("Issued");
    const [issued] = await db.select().from(reports).where(eq(reports.id, row.id));
    const download = await run(pdfLoader, { request: request(`/api/v1/reports/${row.id}/pdf`, { cookie: cookies.quality }), params: { reportId: row.id } });
    expect(download.status).toBe(200);
    expect(download.headers.get("Content-Type")).toBe("application/pdf");
    const res = await pdfLoader((await routeArgs(request(`/api/v1/reports/${row.id}/pdf`, { cookie: cookies.quality }), { reportId: row.id })) as never);
    const bytes = new Uint8Array(await (res as Response).arrayBuffer());
    expect(sha(bytes)).toBe(issued!.sha256);
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "sw-pdf-")), "r.pdf");
    fs.writeFileSync(file, bytes);
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    const snapshot = issued!.snapshot as { case: { title: string }; result: { cases: { root: { bending: number } }[] } };
    expect(text).toContain(snapshot.case.title);
    const critical = snapshot.result.cases.reduce((a, c) => (Math.abs(c.root.bending) > Math.abs(a.root.bending) ? c : a));
    // The loads step's critical root bending moment, printed with the pages' own number format.
    expect(text).toContain(formatQuantity("SI", "moment", critical.root.bending));
    const signers = new Set((issued!.snapshot as { signatures: { name: string }[] }).signatures.map((g) => g.name));
    // Erin prepared the steps, Marek checked them and approved the case for issue.
    expect([...signers].sort()).toEqual(["Erin Hale", "Marek Oduya"]);
    for (const name of signers) expect(text).toContain(name);
  });

  it("lets quality release it with a signature, and nobody else", async () => {
    const [r] = await db.select().from(reports).where(eq(reports.status, "issued"));
    const byEngineer = await run(reportsAction, { request: request(`/cases/${caseId}/reports`, { method: "POST", cookie: cookies.engineer, body: form({ intent: "release", reportId: r!.id, password: demoUser("engineer").password }) }), params: { caseId } });
    expect(byEngineer.status).toBe(403);
    const ok = await run(reportsAction, { request: request(`/cases/${caseId}/reports`, { method: "POST", cookie: cookies.quality, body: form({ intent: "release", reportId: r!.id, password: demoUser("quality").password }) }), params: { caseId } });
    expect(ok.status).toBe(200);
    const res = await caseReportsLoader((await routeArgs(request(`/api/v1/cases/${caseId}/reports`, { cookie: cookies.quality }), { caseId })) as never);
    const json = (await (res as Response).json()) as { reports: { status: string; sha256: string; signatures: { name: string; meaning: string }[] }[] };
    expect(json.reports[0]).toMatchObject({ status: "released", sha256: r!.sha256 });
    expect(json.reports[0]!.signatures.map((s) => `${s.name}:${s.meaning}`)).toEqual(expect.arrayContaining(["Marek Oduya:checked", "Marek Oduya:approved for issue", "Priya Lindqvist:released"]));
  });

  it("keeps the outsider away from the report and its PDF", async () => {
    const [r] = await db.select().from(reports).where(eq(reports.caseId, caseId));
    const res = (await pdfLoader((await routeArgs(request(`/api/v1/reports/${r!.id}/pdf`, { cookie: cookies.outsider }), { reportId: r!.id })) as never)) as Response;
    expect(res.status).toBe(404);
    expect(res.headers.get("Content-Type")).not.toBe("application/pdf");
  });

  it("verifies an uploaded PDF against the issued ones", async () => {
    const [r] = await db.select().from(reports).where(eq(reports.caseId, caseId));
    const res = (await pdfLoader((await routeArgs(request(`/api/v1/reports/${r!.id}/pdf`, { cookie: cookies.quality }), { reportId: r!.id })) as never)) as Response;
    const bytes = new Uint8Array(await res.arrayBuffer());
    const check = async (b: Uint8Array) => {
      const body = new FormData();
      body.append("pdf", new File([b as Uint8Array<ArrayBuffer>], "r.pdf", { type: "application/pdf" }));
      return run(verifyAction, { request: request("/reports", { method: "POST", cookie: cookies.quality, body }) });
    };
    expect(((await check(bytes)).body as { verdict: { match: boolean; reportNumber: string } }).verdict).toMatchObject({ match: true, reportNumber: r!.reportNumber });
    const altered = bytes.slice();
    altered[altered.length - 10] = (altered[altered.length - 10]! + 1) % 256;
    expect(((await check(altered)).body as { verdict: { match: boolean } }).verdict.match).toBe(false);
  });
});
