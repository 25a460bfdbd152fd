import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseSteps } from "~/db/schema";
import { loader as envelopeLoader } from "~/routes/cases/envelope";
import { CASE_CELLS, caseRows, type CaseCells } from "~/routes/cases/envelope.cells";
import { loadCaseRowValues } from "~/routes/cases/envelope.schema";
import type { EnvelopeData } from "~/domain/step-data";
import { request, rowTextOf, run, withSeededDemoCase } from "./helpers";

// The envelope page of the demo case (228 load cases, every one on the page): its cases are read and
// checked once per content of the step, not on every request, and a write of the step is seen at once.

let caseId = "";
let cookie = "";

withSeededDemoCase((demo) => ({ caseId, cookie } = demo));

type Page = { revision: number; units: "SI" | "US"; cases: CaseCells[] };
const page = async () => {
  let body: Page | undefined;
  const received = await rowTextOf(async () => {
    const res = await run(envelopeLoader as never, { request: request(`/cases/${caseId}/envelope`, { cookie }), params: { caseId } });
    expect(res.status).toBe(200);
    body = res.body as Page;
  });
  return { body: body!, received };
};
const storedText = async () => (await db.execute<{ n: number }>(sql`select length(data::text) as n from case_steps where case_id = ${caseId} and step = 'envelope'`)).rows[0]!.n;

describe("the envelope page's load cases", () => {
  it("are read once per content of the step: a second request receives none of them, and a write is seen at once", async () => {
    const first = await page();
    expect(first.body.cases.length).toBe(228);
    const second = await page();
    expect(second.body).toEqual(first.body);
    // Before: every request received the step's 228 cases (and checked them with the step's schema).
    expect(second.received).toBeLessThan((await storedText()) / 10);
    // A write by any path (here straight into the table) changes the digest: the next request reads it.
    await db.execute(sql`update case_steps set data = jsonb_set(data, '{cases,0,altitude}', '4321') where case_id = ${caseId} and step = 'envelope'`);
    const third = await page();
    const [stored] = await db.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    expect((stored!.data as { cases: { altitude: number }[] }).cases[0]!.altitude).toBe(4321);
    expect(caseRows(third.body.cases)[0]!.altitude).not.toBe(caseRows(first.body.cases)[0]!.altitude);
    expect(third.received).toBeGreaterThan((await storedText()) / 2);
  });
});

describe("the envelope page's data", () => {
  // The form's rows were sent as objects naming each of their 14 cells: 71 KB of the demo page's data
  // (as JSON), which the server encoded and the browser decoded cell by cell on every visit.
  it("carries each load case as the array of its cells, which the form reads as the grid's values of the stored case", async () => {
    const { body } = await page();
    const [stored] = await db.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const cases = (stored!.data as EnvelopeData).cases;
    expect(body.cases).toHaveLength(cases.length);
    for (const row of body.cases) expect(row).toHaveLength(CASE_CELLS.length);
    expect(caseRows(body.cases)).toEqual(cases.map((c) => loadCaseRowValues(c, body.units)));
  });
});
