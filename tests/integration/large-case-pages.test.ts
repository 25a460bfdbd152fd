import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseSteps } from "~/db/schema";
import { loader as basisLoader } from "~/routes/cases/basis";
import { loader as envelopeLoader } from "~/routes/cases/envelope";
import { loader as loadsLoader } from "~/routes/cases/loads";
import { loader as massesLoader } from "~/routes/cases/masses";
import { loader as planformLoader } from "~/routes/cases/planform";
import { loader as sectionsLoader } from "~/routes/cases/sections";
import { getCaseStepsDigest } from "~/services/case-steps.server";
import { queriesOf, request, rowTextOf, run, seededDemoCase } from "./helpers";
import { caseRows, type CaseCells } from "~/routes/cases/envelope.cells";

// A case of many load cases: the pages of its other steps, and the envelope page itself, read the
// steps they show and the envelope's method, count and first rows — not its whole list of cases.

const CASES = 20_000;
let caseId = "";
let cookie = "";
let storedText = 0;

beforeAll(async () => {
  ({ caseId, cookie } = await seededDemoCase());
  // The demo's load cases repeated, each copy with ids of its own, written straight into the step (a large import's result).
  await db.execute(sql`
    update case_steps set data = jsonb_set(data, '{cases}', (
      select jsonb_agg(jsonb_set(c.value, '{id}', to_jsonb(format('%s-%s', c.value ->> 'id', k))) order by k, c.ordinality)
      from generate_series(1, ${CASES}::int / jsonb_array_length(data -> 'cases') + 1) as k, jsonb_array_elements(data -> 'cases') with ordinality as c
    ))
    where case_id = ${caseId} and step = 'envelope'`);
  await db.execute(sql`
    update case_steps set data = jsonb_set(data, '{cases}', (select jsonb_agg(v order by i) from jsonb_array_elements(data -> 'cases') with ordinality as e(v, i) where i <= ${CASES}))
    where case_id = ${caseId} and step = 'envelope'`);
  const [row] = await db.execute<{ n: number; size: number }>(sql`select jsonb_array_length(data -> 'cases') as n, length(data::text) as size from case_steps where case_id = ${caseId} and step = 'envelope'`).then((r) => r.rows);
  expect(row!.n).toBe(CASES);
  storedText = row!.size;
});

/** Queries that read or compute from the envelope step's stored data (its count, its rows, a hash of its text), as sent. */
const envelopeDataQueries = (sent: string[]) => sent.filter((text) => text.includes("case_steps") && text.includes("'envelope'") && /"data"|\bdata\b/.test(text));

const pages = { basis: basisLoader, planform: planformLoader, sections: sectionsLoader, masses: massesLoader, envelope: envelopeLoader, loads: loadsLoader } as const;

describe("the pages of a case with a large envelope", () => {
  for (const [name, loader] of Object.entries(pages)) {
    it(`the ${name} page does not read the envelope's load cases`, async () => {
      let status = 0;
      const received = await rowTextOf(async () => {
        status = (await run(loader as never, { request: request(`/cases/${caseId}/${name}`, { cookie }), params: { caseId } })).status;
      });
      expect(status).toBe(200);
      // Before: every page read every step whole, the envelope's 20 000 cases (MBs of JSON) among them.
      expect(received).toBeLessThan(storedText / 20);
    });
  }

  it("the envelope page shows the method, the count and the first rows as stored", async () => {
    const page = await run(envelopeLoader as never, { request: request(`/cases/${caseId}/envelope`, { cookie }), params: { caseId } });
    const body = page.body as { revision: number; values: { compressibility: string; spanwise: string; stations: string }; cases: CaseCells[]; window: { total: number; rows: CaseCells[] } | null };
    const [stored] = await db.select({ revision: caseSteps.revision, data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const data = stored!.data as { compressibility: string; spanwise: string; stations: number; cases: { id: string }[] };
    expect(body.revision).toBe(stored!.revision);
    expect(body.values).toMatchObject({ compressibility: data.compressibility, spanwise: data.spanwise, stations: String(data.stations) });
    expect(body.cases).toEqual([]);
    expect(body.window!.total).toBe(CASES);
    expect(caseRows(body.window!.rows).map((r) => r.id)).toEqual(data.cases.slice(0, body.window!.rows.length).map((c) => c.id));
    expect(body.window!.rows.length).toBeGreaterThan(0);
  });

  it("the loads page counts the analysed cases as stored, without reading them", async () => {
    const page = await run(loadsLoader as never, { request: request(`/cases/${caseId}/loads`, { cookie }), params: { caseId } });
    const [stored] = await db.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const [distribution] = await db.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "distribution")));
    const dispositions = ((distribution?.data as { dispositions?: Record<string, { action: string }> } | undefined)?.dispositions ?? {}) as Record<string, { action: string }>;
    // Analysed: not excluded in the envelope, nor by a disposition "exclude".
    const analysed = (stored!.data as { cases: { id: string; excluded?: boolean }[] }).cases.filter((c) => !c.excluded && dispositions[c.id]?.action !== "exclude").length;
    expect((page.body as { caseCount: number; ready: boolean }).caseCount).toBe(analysed);
    expect((page.body as { ready: boolean }).ready).toBe(true);
  });

  for (const name of ["basis", "envelope"] as const) {
    it(`the ${name} page takes the envelope's count and first rows without PostgreSQL reading its data`, async () => {
      const sent = await queriesOf(() => run(pages[name] as never, { request: request(`/cases/${caseId}/${name}`, { cookie }), params: { caseId } }));
      // Before: count and rows were taken out of the 20 000 stored cases on every request (jsonb_array_length(data -> 'cases'), …).
      expect(envelopeDataQueries(sent)).toEqual([]);
    });
  }
});

describe("the digest of a case's steps", () => {
  it("is read without PostgreSQL hashing the steps' data, and follows every write of them", async () => {
    const md5s = async () => (await db.execute<{ step: string; digest: string }>(sql`select step, md5(data::text) as digest from case_steps where case_id = ${caseId}`)).rows;
    const expected = (rows: { step: string; digest: string }[]) => rows.map((r) => `${r.step}:${r.digest}`).sort().join(";");
    let digest = "";
    const sent = await queriesOf(async () => {
      digest = await getCaseStepsDigest(caseId);
    });
    // Before: md5("case_steps"."data"::text) of every step on every call (hundreds of ms for a large envelope).
    expect(sent.filter((text) => /md5\(/.test(text))).toEqual([]);
    // PostgreSQL's MD5 of each step's jsonb text, as documented in getCaseStepsDigest.
    expect(digest).toBe(expected(await md5s()));
    // A write that bypasses the services (as this file's set-up does) moves it too.
    await db.execute(sql`update case_steps set data = jsonb_set(data, '{cases,0,nz}', '2.5') where case_id = ${caseId} and step = 'envelope'`);
    const after = await getCaseStepsDigest(caseId);
    expect(after).not.toBe(digest);
    expect(after).toBe(expected(await md5s()));
  });
});
