import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseSteps } from "~/db/schema";
import { loader as basisLoader } from "~/routes/cases/basis";
import { loader as envelopeLoader } from "~/routes/cases/envelope";
import { loader as massesLoader } from "~/routes/cases/masses";
import { loader as planformLoader } from "~/routes/cases/planform";
import { loader as sectionsLoader } from "~/routes/cases/sections";
import { request, rowTextOf, run, seededDemoCase } from "./helpers";

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

const pages = { basis: basisLoader, planform: planformLoader, sections: sectionsLoader, masses: massesLoader, envelope: envelopeLoader } as const;

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
    const body = page.body as { revision: number; values: { compressibility: string; spanwise: string; stations: string; cases: unknown[] }; window: { total: number; rows: { id: string }[] } | null };
    const [stored] = await db.select({ revision: caseSteps.revision, data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const data = stored!.data as { compressibility: string; spanwise: string; stations: number; cases: { id: string }[] };
    expect(body.revision).toBe(stored!.revision);
    expect(body.values).toMatchObject({ compressibility: data.compressibility, spanwise: data.spanwise, stations: String(data.stations), cases: [] });
    expect(body.window!.total).toBe(CASES);
    expect(body.window!.rows.map((r) => r.id)).toEqual(data.cases.slice(0, body.window!.rows.length).map((c) => c.id));
    expect(body.window!.rows.length).toBeGreaterThan(0);
  });
});
