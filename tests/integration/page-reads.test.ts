import { and, desc, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { auditLog, cases, caseSteps, sessions, users } from "~/db/schema";
import { STEPS } from "~/domain/steps";
import { loader as layoutLoader } from "~/routes/cases/case-layout";
import { loader as overviewLoader } from "~/routes/cases/overview";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { cookieFor, demoUser, queriesOf, readsStepData, request, run, seed } from "./helpers";

// The reads every page of a case makes (session, case, step states, history, checks) are prepared
// statements. What the pages show is checked here against the rows themselves, read with plain SQL.

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  const [c] = await db.select({ id: cases.id }).from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  cookie = await cookieFor("engineer");
});

/** The layout and overview loaders of one page, run side by side, as the server does. */
async function page() {
  return (async () => {
    const args = { request: request(`/cases/${caseId}`, { cookie }), params: { caseId } };
    const [layout, overview] = await Promise.all([run(layoutLoader, args), run(overviewLoader, args)]);
    expect(layout.status).toBe(200);
    expect(overview.status).toBe(200);
    return {
      layout: layout.body as { steps: { key: string; status: string; revision: number }[] },
      overview: overview.body as { steps: { key: string; status: string; revision: number; updatedByName: string | null; approval: { kind: string } | null }[]; history: { id: number; action: string }[] },
    };
  })();
}

async function storedSteps() {
  const rows = await db.execute<{ step: string; status: string; revision: number; name: string | null }>(
    sql`select s.step, s.status, s.revision, u.name from case_steps s left join users u on u.id = s.updated_by where s.case_id = ${caseId}`,
  );
  return new Map(rows.rows.map((r) => [r.step, r]));
}

describe("the pages of a case read what is stored", () => {
  it("the step rail and the overview show each step's stored status, revision and author, and the last 20 history entries", async () => {
    const stored = await storedSteps();
    const { layout, overview } = await page();
    expect(layout.steps.map((s) => s.key)).toEqual(STEPS.map((s) => s.key));
    for (const s of layout.steps) {
      expect({ status: s.status, revision: s.revision }).toEqual({ status: stored.get(s.key)?.status ?? "empty", revision: stored.get(s.key)?.revision ?? 0 });
    }
    for (const s of overview.steps) {
      expect({ status: s.status, revision: s.revision, by: s.updatedByName }).toEqual({ status: stored.get(s.key)?.status ?? "empty", revision: stored.get(s.key)?.revision ?? 0, by: stored.get(s.key)?.name ?? null });
    }
    // A step shows its check where it has a check signature that was not voided.
    const signed = await db.execute<{ step: string }>(
      sql`select distinct g.step from signatures g left join signature_voids v on v.signature_id = g.id where g.case_id = ${caseId} and g.report_id is null and g.step is not null and g.meaning = 'checked' and v.id is null`,
    );
    expect(overview.steps.filter((s) => s.approval?.kind === "signed").map((s) => s.key).sort()).toEqual(signed.rows.map((r) => r.step).sort());
    const history = await db
      .select({ id: auditLog.id, action: auditLog.action })
      .from(auditLog)
      .where(and(eq(auditLog.entityType, "case"), eq(auditLog.entityId, caseId)))
      .orderBy(desc(auditLog.id))
      .limit(20);
    expect(history.length).toBeGreaterThan(0);
    expect(overview.history.map((h) => ({ id: h.id, action: h.action }))).toEqual(history);
  });

  it("the header, step rail and overview read the steps' states, not their data", async () => {
    const sent = await queriesOf(page);
    expect(sent.filter((text) => text.includes('"case_steps"')).length).toBeGreaterThan(0);
    expect(readsStepData(sent)).toEqual([]);
  });

  it("a saved step shows its new revision on the very next page, in the rail and the overview", async () => {
    const before = await page();
    const planform = before.layout.steps.find((s) => s.key === "planform")!;
    const steps = await getCaseSteps(caseId);
    const u = demoUser("engineer");
    const [actor] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.email, u.email));
    const data = structuredClone(steps.planform.data!) as { stations: { twist: number }[] };
    data.stations[0]!.twist += 0.5;
    await saveStep({ caseId, step: "planform", baseRevision: planform.revision, data, actor: actor! });
    const after = await page();
    expect(after.layout.steps.find((s) => s.key === "planform")!.revision).toBe(planform.revision + 1);
    const shown = after.overview.steps.find((s) => s.key === "planform")!;
    expect(shown.revision).toBe(planform.revision + 1);
    expect(shown.updatedByName).toBe(actor!.name);
    const [row] = await db.select({ revision: caseSteps.revision }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    expect(row!.revision).toBe(planform.revision + 1);
  });

  it("the prepared reads work again after the database pool is closed and opened anew", async () => {
    await page();
    await closeDb();
    const { overview } = await page();
    expect(overview.steps).toHaveLength(STEPS.length);
  });

  it("an expired session is refused by the prepared session read (redirect to sign-in)", async () => {
    const expiring = await cookieFor("checker");
    const args = { request: request(`/cases/${caseId}`, { cookie: expiring }), params: { caseId } };
    expect((await run(overviewLoader, args)).status).toBe(200);
    const [checker] = await db.select({ id: users.id }).from(users).where(eq(users.email, demoUser("checker").email));
    await db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.userId, checker!.id));
    const refused = await run(overviewLoader, args);
    expect(refused.status).toBe(302);
    expect(refused.headers.get("Location")).toMatch(/^\/login\?/);
  });
});
