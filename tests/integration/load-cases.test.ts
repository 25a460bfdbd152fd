import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseSteps, cases, users } from "~/db/schema";
import type { EnvelopeData } from "~/domain/step-data";
import { loader as windowLoader } from "~/routes/api/case-load-cases";
import { action as envelopeAction, loader as envelopeLoader } from "~/routes/cases/envelope";
import { saveStep } from "~/services/case-steps.server";
import { cookieFor, demoUser, request, run, seed, routeArgs } from "./helpers";
import { caseRows, type CaseCells } from "~/routes/cases/envelope.cells";

// A case file larger than the whole-grid form: the page gets a window of rows, the grid asks for
// the rest by range, and edits of single rows are saved on the revision they were made on.

const TOTAL = 3000;
let caseId = "";
let cookie = "";

async function stored(id = caseId): Promise<{ revision: number; data: EnvelopeData }> {
  const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, id), eq(caseSteps.step, "envelope")));
  return { revision: row!.revision, data: row!.data as unknown as EnvelopeData };
}

const post = (body: unknown) =>
  run(envelopeAction, { request: request(`/cases/${caseId}/envelope`, { method: "POST", cookie, body: JSON.stringify(body), headers: { "Content-Type": "application/json" } }), params: { caseId } });

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  // The demo's method, with many cases, saved as the envelope of the demo's second case.
  const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = c!.id;
  const [u] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  const method = await stored(demo!.id);
  const [own] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  const many = Array.from({ length: TOTAL }, (_, i) => ({ id: `L${i + 1}`, kind: "manual" as const, rule: "imported", mach: 0.3, altitude: i, weight: 40000, nz: 1, excluded: false }));
  await saveStep({ caseId, step: "envelope", baseRevision: own?.revision ?? 0, data: { ...method.data, cases: many }, actor: { id: u!.id, email: u!.email } });
});

describe("a large case file's load cases", () => {
  it("the page carries the first rows and the count, not every case", async () => {
    const page = await run(envelopeLoader, { request: request(`/cases/${caseId}/envelope`, { cookie }), params: { caseId } });
    const body = page.body as { cases: CaseCells[]; window: { total: number; rows: CaseCells[] } };
    expect(body.cases).toHaveLength(0);
    expect(body.window.total).toBe(TOTAL);
    expect(body.window.rows.length).toBeLessThanOrEqual(100);
    expect(caseRows(body.window.rows)[0]!.id).toBe("L1");
  });

  it("a range of rows is answered in the case's units, with the revision and the total", async () => {
    const res = (await windowLoader((await routeArgs(request(`/api/cases/${caseId}/load-cases?offset=2990&limit=100`, { cookie }), { caseId })) as never)) as Response;
    const body = (await res.json()) as { revision: number; total: number; rows: { id: string; altitude: string; weight: string }[] };
    expect(body.total).toBe(TOTAL);
    expect(body.revision).toBe((await stored()).revision);
    expect(body.rows.map((r) => r.id)).toEqual(Array.from({ length: 10 }, (_, i) => `L${2991 + i}`));
    expect(body.rows[0]!.altitude).toBe("2990");
    // Weight shown as a mass: 40 000 N / g0 (9.80665 m/s², ISO 80000-3 standard gravity) = 4078.9 kg.
    expect(Number(body.rows[0]!.weight)).toBeCloseTo(40000 / 9.80665, 6);
    const tooMany = (await windowLoader((await routeArgs(request(`/api/cases/${caseId}/load-cases?offset=0&limit=100000`, { cookie }), { caseId })) as never)) as Response;
    expect(((await tooMany.json()) as { rows: unknown[] }).rows).toHaveLength(500);
    const bad = (await windowLoader((await routeArgs(request(`/api/cases/${caseId}/load-cases?offset=-1`, { cookie }), { caseId })) as never)) as Response;
    expect(bad.status).toBe(400);
  });

  it("an edited row far down is saved alone; every other row stays as stored", async () => {
    const before = await stored();
    const row = { id: "L2501", kind: "manual", rule: "imported", mach: "0.456", altitude: "2500", weight: "", nz: "", alpha: "4", excluded: false };
    const res = await post({ intent: "rows", revision: before.revision, changed: [{ index: 2500, row }], removed: [2999], added: [{ id: "NEW1", kind: "manual", rule: "added by hand", mach: "0.2", altitude: "0", weight: "", nz: "", alpha: "2", excluded: false }] });
    expect(res.status).toBe(200);
    const after = await stored();
    expect(after.revision).toBe(before.revision + 1);
    expect(after.data.cases).toHaveLength(TOTAL);
    expect(after.data.cases[2500]).toMatchObject({ id: "L2501", mach: 0.456, alpha: 4 });
    expect(after.data.cases[2500]!.weight).toBeUndefined();
    expect(after.data.cases[2998]!.id).toBe("L2999");
    expect(after.data.cases[2999]!.id).toBe("NEW1");
    expect(after.data.cases.slice(0, 2500)).toEqual(before.data.cases.slice(0, 2500));
  });

  it("a bad row is refused naming the row as shown, and a stale revision is refused; nothing is written", async () => {
    const before = await stored();
    const bad = await post({ intent: "rows", revision: before.revision, changed: [{ index: 1200, row: { id: "L1201", kind: "manual", rule: "", mach: "1.3", altitude: "0", weight: "", nz: "", alpha: "2", excluded: false } }], removed: [], added: [] });
    expect(bad.status).toBe(400);
    expect((bad.body as { fieldErrors: Record<string, string[]> }).fieldErrors["cases.1200.mach"]?.join(" ")).toMatch(/Mach must be at least 0 and below 1/);
    const duplicate = await post({ intent: "rows", revision: before.revision, changed: [], removed: [], added: [{ id: "L7", kind: "manual", rule: "", mach: "0.2", altitude: "0", weight: "", nz: "", alpha: "2", excluded: false }] });
    expect(duplicate.status).toBe(400);
    expect(Object.keys((duplicate.body as { fieldErrors: Record<string, string[]> }).fieldErrors)).toContain("added.0.id");
    const stale = await post({ intent: "rows", revision: before.revision - 1, changed: [], removed: [5], added: [] });
    expect(stale.status).toBe(409);
    const missing = await post({ intent: "rows", revision: before.revision, changed: [], removed: [TOTAL + 5], added: [] });
    expect(missing.status).toBe(400);
    expect(await stored()).toEqual(before);
  });
});
