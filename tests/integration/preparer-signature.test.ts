import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditLog, caseSteps, cases, signatureVoids, signatures, stepComments, users } from "~/db/schema";
import { action as reviewAction } from "~/routes/cases/review";
import { saveStep } from "~/services/case-steps.server";
import { setMemberRoles } from "~/services/organisation.server";
import { canonical, cookieFor, demoUser, form, request, run, seed } from "./helpers";

/*
 * Issue 10, item 5: the engineer who submits a step signs it, meaning "prepared", with the same
 * fresh proof as a checker's signature, on the hash of exactly the revision submitted; the signature
 * is voided like the others when the case changes, and its signer does not check the case.
 */

let caseId = "";
let orgId = "";
const cookies: Record<string, string> = {};
const ids: Record<string, string> = {};

const review = (who: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie: cookies[who], body: form(fields) }), params: { caseId } });
const roles = (who: string, r: ("engineer" | "checker")[]) => setMemberRoles({ organisationId: orgId, userId: ids[who]!, roles: r, actor: { id: ids.admin!, email: demoUser("admin").email } });

async function stepRow(step: string) {
  const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step as never)));
  return row!;
}

const prepared = () => db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "prepared")));

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  orgId = c!.organisationId;
  for (const who of ["engineer", "checker", "admin"] as const) {
    cookies[who] = await cookieFor(who);
    const [u] = await db.select().from(users).where(eq(users.email, demoUser(who).email));
    ids[who] = u!.id;
  }
});

describe("the preparer's signature at submission", () => {
  it("is required: a submission without a password, or with a wrong one, is refused and nothing is written", async () => {
    const before = await stepRow("basis");
    const audits = (await db.select().from(auditLog)).length;
    const none = await review("engineer", { intent: "submit", step: "basis" });
    expect(none.status).toBe(401);
    expect((none.body as { message: string }).message).toMatch(/password/i);
    const wrong = await review("engineer", { intent: "submit", step: "basis", password: "not-my-password" });
    expect(wrong.status).toBe(401);
    expect((await stepRow("basis")).status).toBe(before.status);
    expect(await db.select().from(signatures).where(eq(signatures.caseId, caseId))).toHaveLength(0);
    expect(await db.select().from(stepComments).where(and(eq(stepComments.caseId, caseId), eq(stepComments.kind, "submitted")))).toHaveLength(0);
    // Only the refused passwords are audited (auth.signature.password-refused), no submission.
    const after = await db.select().from(auditLog);
    expect(after.slice(audits).map((a) => a.action)).not.toContain("step.basis.submit");
  });

  it("with the password, submits the step and records a signature meaning prepared on the hash of the revision submitted", async () => {
    const res = await review("engineer", { intent: "submit", step: "basis", password: demoUser("engineer").password, comment: "Basis per the G-1 paper." });
    expect(res.status).toBe(200);
    const row = await stepRow("basis");
    expect(row.status).toBe("submitted");
    const sigs = await prepared();
    expect(sigs).toHaveLength(1);
    expect(sigs[0]).toMatchObject({ step: "basis", revision: row.revision, signerId: ids.engineer, signerName: demoUser("engineer").name, role: "engineer", meaning: "prepared", confirmedBy: "password", reportId: null });
    // The hash is the SHA-256 of the canonical {caseId, step, revision, data}: the revision the checker will sign.
    const expected = createHash("sha256").update(canonical({ caseId, step: "basis", revision: row.revision, data: row.data })).digest("hex");
    expect(sigs[0]!.revisionHash).toBe(expected);
  });

  it("keeps its signer from checking the case: the checker who prepared a step may not approve one", async () => {
    // Marek, given the engineer role too, submits the planform Erin wrote: he prepared it.
    await roles("checker", ["checker", "engineer"]);
    const submitted = await review("checker", { intent: "submit", step: "planform", password: demoUser("checker").password });
    await roles("checker", ["checker"]);
    expect(submitted.status).toBe(200);
    const own = await review("checker", { intent: "approve", step: "basis", password: demoUser("checker").password });
    expect(own.status).toBe(403);
    expect((own.body as { message: string }).message).toMatch(/preparer.*separation of duties/);
    expect(await db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "checked")))).toHaveLength(0);
    expect((await stepRow("basis")).status).toBe("submitted");
  });

  it("is voided when the case changes: an edit of the step voids it and sends a submitted step downstream back to draft", async () => {
    expect((await review("checker", { intent: "return", step: "basis", comment: "VD must follow 23.335(b)." })).status).toBe(200);
    const basis = await stepRow("basis");
    const data = structuredClone(basis.data) as Record<string, unknown>;
    data.regulations = `${data.regulations as string}; G-1 issue paper rev. B`;
    await saveStep({ caseId, step: "basis", baseRevision: basis.revision, data, actor: { id: ids.engineer!, email: demoUser("engineer").email } });
    const voided = await db.select({ step: signatures.step, meaning: signatures.meaning, reason: signatureVoids.reason }).from(signatureVoids).innerJoin(signatures, eq(signatures.id, signatureVoids.signatureId));
    expect(voided.map((v) => `${v.step}:${v.meaning}`).sort()).toEqual(["basis:prepared", "planform:prepared"]);
    expect(voided[0]!.reason).toMatch(/basis changed to revision \d+/);
    expect((await stepRow("planform")).status).toBe("draft");
    // Submitted again, the new revision carries a new signature.
    expect((await review("engineer", { intent: "submit", step: "basis", password: demoUser("engineer").password })).status).toBe(200);
    const live = (await prepared()).filter((s) => s.step === "basis" && s.revision === basis.revision + 1);
    expect(live).toHaveLength(1);
  });
});
