import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseSteps, cases, reports, signatures, users } from "~/db/schema";
import { STEPS } from "~/domain/steps";
import { action as reportsAction } from "~/routes/cases/reports";
import { action as reviewAction } from "~/routes/cases/review";
import { setMemberRoles } from "~/services/organisation.server";
import { createReportRow, generateReport } from "~/services/reports.server";
import { cookieFor, demoUser, form, request, run, seed } from "./helpers";

/*
 * Issue 9, items 6 and 11: separation of duties at the level of the case and of the report, and a
 * report released only through its own case. Erin wrote every revision of the demo case; Marek
 * checks it; Priya is quality. Holding several roles must not let one person sign twice.
 */

let caseId = "";
let otherCaseId = "";
let orgId = "";
const cookies: Record<string, string> = {};
const ids: Record<string, string> = {};

const review = (who: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie: cookies[who], body: form(fields) }), params: { caseId } });
const release = (who: string, throughCase: string, reportId: string) =>
  run(reportsAction, { request: request(`/cases/${throughCase}/reports`, { method: "POST", cookie: cookies[who], body: form({ intent: "release", reportId, password: demoUser(who as never).password }) }), params: { caseId: throughCase } });
const roles = (who: string, r: ("engineer" | "checker" | "quality")[]) => setMemberRoles({ organisationId: orgId, userId: ids[who]!, roles: r, actor: { id: ids.admin!, email: demoUser("admin").email } });

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  const [other] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = c!.id;
  otherCaseId = other!.id;
  orgId = c!.organisationId;
  for (const who of ["engineer", "checker", "quality", "admin"] as const) {
    cookies[who] = await cookieFor(who);
    const [u] = await db.select().from(users).where(eq(users.email, demoUser(who).email));
    ids[who] = u!.id;
  }
});

describe("separation of duties on one case", () => {
  it("keeps anyone who wrote a revision of the case from approving it for issue, whatever roles they hold", async () => {
    for (const s of STEPS) {
      const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, s.key)));
      if (row!.status !== "submitted") expect((await review("engineer", { intent: "submit", step: s.key, password: demoUser("engineer").password })).status).toBe(200);
      expect((await review("checker", { intent: "approve", step: s.key, password: demoUser("checker").password })).status).toBe(200);
    }
    await roles("engineer", ["engineer", "checker"]);
    const own = await review("engineer", { intent: "approve-case", password: demoUser("engineer").password });
    await roles("engineer", ["engineer"]);
    expect(own.status).toBe(403);
    expect((own.body as { message: string }).message).toMatch(/wrote revisions of this case.*separation of duties/);
    expect(await db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "approved for issue")))).toHaveLength(0);
    expect((await review("checker", { intent: "approve-case", password: demoUser("checker").password })).status).toBe(200);
  });

  it("releases a report only through its own case: another case's URL does not find it", { timeout: 120_000 }, async () => {
    const row = await createReportRow({ caseId, actor: { id: ids.engineer!, email: demoUser("engineer").email } });
    await generateReport(row.id);
    const through = await release("quality", otherCaseId, row.id);
    expect(through.status).toBe(404);
    const [r] = await db.select().from(reports).where(eq(reports.id, row.id));
    expect(r!.status).toBe("issued");
    expect(await db.select().from(signatures).where(eq(signatures.reportId, row.id))).toHaveLength(0);
  });

  it("lets nobody sign two roles on one report: the checker of the case, made quality too, does not release it; the author neither", async () => {
    const [r] = await db.select().from(reports).where(and(eq(reports.caseId, caseId), eq(reports.status, "issued")));
    await roles("checker", ["checker", "quality"]);
    const byChecker = await release("checker", caseId, r!.id);
    await roles("checker", ["checker"]);
    expect(byChecker.status).toBe(403);
    expect((byChecker.body as { message: string }).message).toMatch(/signed this case as checker.*two roles on one report/);
    await roles("engineer", ["engineer", "quality"]);
    const byAuthor = await release("engineer", caseId, r!.id);
    await roles("engineer", ["engineer"]);
    expect(byAuthor.status).toBe(403);
    expect((byAuthor.body as { message: string }).message).toMatch(/wrote revisions of this case/);
    expect(await db.select().from(signatures).where(eq(signatures.reportId, r!.id))).toHaveLength(0);
    expect((await release("quality", caseId, r!.id)).status).toBe(200);
    expect(await db.select({ meaning: signatures.meaning, name: signatures.signerName }).from(signatures).where(eq(signatures.reportId, r!.id))).toEqual([{ meaning: "released", name: "Priya Lindqvist" }]);
  });
});
