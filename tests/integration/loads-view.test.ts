import fs from "node:fs";
import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { caseResults, caseSteps, programmes, resultCases, users } from "~/db/schema";
import type { CaseFileInput, CaseResult } from "~/exchange";
import { loader as loadsLoader } from "~/routes/api/case-loads";
import { loader as breakdownLoader } from "~/routes/api/case-loads-breakdown";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { loader as pageLoader } from "~/routes/cases/loads";
import { computeQueuedResults, forgetDerivedForTests } from "~/services/analysis.server";
import { importCase } from "~/services/case-import.server";
import { forgetLoadsViewForTests } from "~/services/loads-view.server";
import * as masses from "~/services/masses.server";
import { cookieFor, demoUser, queriesOf, request, rowFieldsOf, rowTextOf, seed, routeArgs } from "./helpers";

// Every balance of trimmed cases goes through balanceRows: the cases it is handed are counted here.
vi.mock("~/services/masses.server", async (importOriginal) => {
  const actual = await importOriginal<typeof masses>();
  return { ...actual, balanceRows: vi.fn(actual.balanceRows) };
});
const balanced = () => vi.mocked(masses.balanceRows).mock.calls.reduce((n, [file]) => n + file.cases.length, 0);

// The loads page of a large case file gets the envelope, the root loads of the most critical cases
// and the case on the plots, not the whole result document (which stays the results API's).

const CASES = 1200;
let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
  const sweep: CaseFileInput = { ...base, cases: Array.from({ length: CASES }, (_, i) => ({ id: `v${i}`, mach: 0.3 + 0.05 * (i % 6), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })) };
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  caseId = (await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "VIEW-1200", title: "Loads view", document: sweep, actor: { id: erin!.id, email: erin!.email } })).id;
  await computeQueuedResults(caseId);
}, 300_000);

const get = async (path: string, loader: typeof loadsLoader) => (await loader((await routeArgs(request(path, { cookie }), { caseId })) as never)) as Response;

/** A web process that has read nothing yet: no derived value, no ranked root loads, no facts of listed cases. */
function freshProcess() {
  forgetDerivedForTests();
  forgetLoadsViewForTests();
}

/** Characters of the stored result's JSON text. */
const storedResultText = async () => (await db.execute<{ n: number }>(sql`select length(result::text) as n from case_results where case_id = ${caseId}`)).rows[0]!.n;

describe("the loads view answers from the ranked root loads kept with the result", () => {
  it("a fresh process reads neither the result document nor more than a small part of its text, for the critical case or another", async () => {
    const whole = await storedResultText();
    for (const query of ["", "?case=v7"]) {
      freshProcess();
      let res: Response | undefined;
      const received = await rowTextOf(async () => {
        res = await get(`/api/cases/${caseId}/loads${query}`, loadsLoader);
      });
      expect(res!.status).toBe(200);
      // Before: the whole stored result (1 200 cases here, tens of MB for 100 000) sent by PostgreSQL to rank its root loads.
      expect(received, query).toBeLessThan(whole / 10);
    }
  });

  it("a fresh process receives the envelope's rows of the cases it lists, not the whole envelope", async () => {
    freshProcess();
    let view: { cases: { id: string }[]; info: { cases: Record<string, unknown> } } | undefined;
    const fields = await rowFieldsOf(async () => {
      view = await (await get(`/api/cases/${caseId}/loads`, loadsLoader)).json();
    });
    // Each envelope row carries its kind (the exchange input and the result do not): count the rows received.
    const rows = fields.reduce((n, text) => n + (text.match(/"kind": ?"/g)?.length ?? 0), 0);
    const named = Object.keys(view!.info.cases).length;
    expect(named).toBeLessThan(CASES);
    // Before: every step read whole for them (1 200 envelope rows here, 100 000 and 13 MB for the large case).
    // (A few other values received may name a kind too.)
    expect(rows).toBeGreaterThanOrEqual(named);
    expect(rows).toBeLessThan(named + 5);
  });

  it("a result stored before the ranked root loads were kept has them made once, the same as kept at store time", async () => {
    const [row] = await db.select({ id: caseResults.id, rootLoads: caseResults.rootLoads }).from(caseResults).where(eq(caseResults.caseId, caseId));
    expect(row!.rootLoads).not.toBeNull();
    freshProcess();
    const kept = await (await get(`/api/cases/${caseId}/loads`, loadsLoader)).json();
    await db.update(caseResults).set({ rootLoads: null }).where(eq(caseResults.id, row!.id));
    freshProcess();
    const made = await (await get(`/api/cases/${caseId}/loads`, loadsLoader)).json();
    expect(made).toEqual(kept);
    const [after] = await db.select({ rootLoads: caseResults.rootLoads }).from(caseResults).where(eq(caseResults.id, row!.id));
    expect(after!.rootLoads).toEqual(row!.rootLoads);
    freshProcess();
    const received = await rowTextOf(() => get(`/api/cases/${caseId}/loads`, loadsLoader));
    expect(received).toBeLessThan((await storedResultText()) / 10);
  });
});

describe("the loads page's view of a large case file", () => {
  it("sends the envelope, 500 root-load rows with every extreme case among them, and the critical case with its stations", async () => {
    const full = await get(`/api/v1/cases/${caseId}/results`, resultsLoader as never);
    const fullText = await full.text();
    const result = JSON.parse(fullText) as CaseResult;
    const res = await get(`/api/cases/${caseId}/loads`, loadsLoader);
    expect(res.status).toBe(200);
    const text = await res.text();
    const view = JSON.parse(text) as { caseCount: number; envelope: CaseResult["envelope"]; cases: { id: string; stations?: unknown }[]; current: { id: string; stations: unknown[] } };
    expect(view.caseCount).toBe(CASES);
    expect(view.envelope).toEqual(result.envelope);
    expect(view.cases).toHaveLength(500);
    expect(view.cases.every((c) => c.stations === undefined)).toBe(true);
    const ids = new Set(view.cases.map((c) => c.id));
    const root = result.envelope[0]!;
    for (const id of [root.shearMaxCase, root.shearMinCase, root.bendingMaxCase, root.bendingMinCase, root.torsionMaxCase, root.torsionMinCase]) expect(ids.has(id), id).toBe(true);
    // The plotted case is the one of largest |root bending|, with its station table.
    const critical = result.cases.reduce((a, b) => (Math.abs(b.root.bending) > Math.abs(a.root.bending) ? b : a));
    expect(view.current.id).toBe(critical.id);
    expect(view.current.stations.length).toBeGreaterThan(0);
    // A small fraction of the whole document.
    expect(text.length).toBeLessThan(fullText.length / 4);
  });

  it("another case is sent with its stations when asked for, whether listed or not", async () => {
    const res = await get(`/api/cases/${caseId}/loads?case=v7`, loadsLoader);
    const view = (await res.json()) as { current: { id: string; stations: unknown[] } };
    expect(view.current.id).toBe("v7");
    expect(view.current.stations.length).toBeGreaterThan(0);
  });
});

describe("what the loads page itself sends for a large case file", () => {
  it("carries no per-case table in the page; mass case and balance come with the results, for the cases listed", async () => {
    const page = (await pageLoader((await routeArgs(request(`/cases/${caseId}/loads`, { cookie }), { caseId })) as never)) as Record<string, unknown>;
    // Before: a mass case and a balance row for each of the 1 200 cases, in the page's own data.
    expect(JSON.stringify(page).length).toBeLessThan(10_000);
    expect(page).not.toHaveProperty("info");
    const view = (await (await get(`/api/cases/${caseId}/loads?case=v7`, loadsLoader)).json()) as { cases: { id: string }[]; current: { id: string }; envelope: Record<string, unknown>[]; info: { cases: Record<string, unknown>; balance: { caseId: string }[] } };
    const named = new Set([view.current.id, ...view.cases.map((c) => c.id), ...view.envelope.flatMap((row) => Object.entries(row).filter(([k]) => k.endsWith("Case")).map(([, v]) => String(v)))]);
    expect(new Set(Object.keys(view.info.cases))).toEqual(named);
    // Every case of this file is trimmed (weight and nz): each listed one has its balance row, no other.
    expect(new Set(view.info.balance.map((b) => b.caseId))).toEqual(named);
    expect(named.size).toBeLessThan(CASES);
  });
});

describe("the breakdown of one case (GET /api/cases/:caseId/case-loads)", () => {
  it("takes the case out of the stored input: a fresh process receives a small part of the envelope, and the net loads are the stored result's", async () => {
    const envelopeText = (await db.execute<{ n: number }>(sql`select length(data::text) as n from case_steps where case_id = ${caseId} and step = 'envelope'`)).rows[0]!.n;
    freshProcess();
    let res: Response | undefined;
    const before = balanced();
    const received = await rowTextOf(async () => {
      res = await get(`/api/cases/${caseId}/case-loads?case=v7`, breakdownLoader as never);
    });
    expect(res!.status).toBe(200);
    // Before: every step read whole (here the envelope's 1 200 cases; 13 MB of it for 100 000) and the case file built and checked on every request.
    expect(received).toBeLessThan(envelopeText / 10);
    expect(balanced() - before).toBe(0);
    const b = (await res!.json()) as { caseId: string; y: number[]; net: { shear: number[]; bending: number[]; torsion: number[] } };
    expect(b.caseId).toBe("v7");
    // The same case as the stored result's (solved in the sweep): its root loads, to the sweep's tolerance.
    const [stored] = (await db.execute<{ c: CaseResult["cases"][number] }>(sql`select jsonb_path_query_first(result, '$.cases[*] ? (@.id == "v7")') as c from case_results where case_id = ${caseId}`)).rows;
    const root = stored!.c.root;
    expect(Math.abs(b.net.bending[0]! - root.bending)).toBeLessThan(1e-4 * Math.abs(root.bending));
    expect(Math.abs(b.net.shear[0]! - root.shear)).toBeLessThan(1e-4 * Math.abs(root.shear));
    // A case the input does not have is still refused by name.
    const missing = await get(`/api/cases/${caseId}/case-loads?case=nope`, breakdownLoader as never);
    expect(missing.status).toBe(404);
  });
});

describe("one case of a stored result is read by its key", () => {
  /** Queries that take the stored input's or result's load cases apart (for 100 000 cases a scan of megabytes in PostgreSQL). */
  const walksStoredCases = (sent: string[]) => sent.filter((text) => text.includes("case_results") && /jsonb_array_elements|jsonb_path_query/.test(text));
  const unlistedCases = async () => {
    const view = (await (await get(`/api/cases/${caseId}/loads`, loadsLoader)).json()) as { cases: { id: string }[]; info: { cases: Record<string, unknown> } };
    return Array.from({ length: CASES }, (_, i) => `v${i}`).filter((id) => !(id in view.info.cases));
  };
  const unlistedCase = async () => (await unlistedCases())[0]!;

  it("the loads view of a case not listed and the breakdown of a case take it from its own row, not out of the stored input and result", async () => {
    const id = await unlistedCase();
    for (const [path, loader] of [[`/api/cases/${caseId}/loads?case=${id}`, loadsLoader], [`/api/cases/${caseId}/case-loads?case=${id}`, breakdownLoader]] as const) {
      freshProcess();
      let status = 0;
      const sent = await queriesOf(async () => {
        status = (await get(path, loader as never)).status;
      });
      expect(status, path).toBe(200);
      // Before: PostgreSQL walked the stored result's cases (jsonb_path_query_first) and the input's (jsonb_array_elements) for the one asked for.
      expect(walksStoredCases(sent), path).toEqual([]);
    }
  });

  it("a case not listed, once the listed ones are known, is picked out of the envelope without making a row of each of its cases", async () => {
    const [id, other] = await unlistedCases();
    await get(`/api/cases/${caseId}/loads?case=${id}`, loadsLoader);
    let status = 0;
    const sent = await queriesOf(async () => {
      status = (await get(`/api/cases/${caseId}/loads?case=${other}`, loadsLoader)).status;
    });
    expect(status).toBe(200);
    // Before: jsonb_array_elements over the envelope's cases for the one asked for (0.55–0.65 s for 100 000 in PostgreSQL).
    expect(sent.filter((text) => text.includes("case_steps") && text.includes("jsonb_array_elements"))).toEqual([]);
    expect(sent.some((text) => text.includes("case_steps") && text.includes("jsonb_path_query_array"))).toBe(true);
  });

  it("keeps every case of the stored input and result in its own row, in the input's order", async () => {
    const [row] = await db.select({ id: caseResults.id, input: caseResults.input, result: caseResults.result, inputHead: caseResults.inputHead }).from(caseResults).where(eq(caseResults.caseId, caseId));
    const rows = await db.select().from(resultCases).where(eq(resultCases.resultId, row!.id)).orderBy(resultCases.ordinal);
    const input = row!.input as unknown as CaseFileInput;
    const result = row!.result as unknown as CaseResult;
    expect(rows.map((r) => r.input)).toEqual(input.cases);
    expect(rows.map((r) => r.result)).toEqual(result.cases);
    expect(rows.map((r) => r.loadCase)).toEqual(input.cases.map((c) => c.id));
    const { cases: _cases, ...head } = input;
    expect(row!.inputHead).toEqual({ head, sections: null });
  });

  it("a result stored before its cases were kept in rows answers the same, out of the stored input and result", async () => {
    const id = await unlistedCase();
    const paths = [`/api/cases/${caseId}/loads?case=${id}`, `/api/cases/${caseId}/case-loads?case=${id}`, `/api/cases/${caseId}/case-loads?case=v7`] as const;
    const answer = (path: string) => get(path, (path.includes("case-loads") ? breakdownLoader : loadsLoader) as never).then((r) => r.json());
    freshProcess();
    const kept = await Promise.all(paths.map(answer));
    const [row] = await db.select({ id: caseResults.id, inputHead: caseResults.inputHead }).from(caseResults).where(eq(caseResults.caseId, caseId));
    const rows = await db.select().from(resultCases).where(eq(resultCases.resultId, row!.id));
    await db.update(caseResults).set({ inputHead: null }).where(eq(caseResults.id, row!.id));
    await db.delete(resultCases).where(eq(resultCases.resultId, row!.id));
    try {
      freshProcess();
      expect(await Promise.all(paths.map(answer))).toEqual(kept);
    } finally {
      await db.update(caseResults).set({ inputHead: row!.inputHead }).where(eq(caseResults.id, row!.id));
      await db.insert(resultCases).values(rows);
    }
  });
});

describe("the balance of the listed cases is worked out once per content of the steps", () => {
  it("a repeated request balances no case again, another case only itself, and a change to the steps balances afresh", async () => {
    const view = async (query = "") => (await (await get(`/api/cases/${caseId}/loads${query}`, loadsLoader)).json()) as { cases: { id: string }[]; info: { balance: { caseId: string }[] } };
    const first = await view();
    const before = balanced();
    const again = await view();
    // Before: every listed case (500 and those the envelope names) balanced again on every request.
    expect(balanced() - before).toBe(0);
    expect(again.info).toEqual(first.info);
    // A case not listed: its own row only, beside the listed ones.
    const unlisted = Array.from({ length: CASES }, (_, i) => `v${i}`).find((id) => !first.info.balance.some((b) => b.caseId === id))!;
    const other = await view(`?case=${unlisted}`);
    expect(balanced() - before).toBe(1);
    expect(new Set(other.info.balance.map((b) => b.caseId))).toEqual(new Set([...first.info.balance.map((b) => b.caseId), unlisted]));
    // Anything written to a step (here a note of the loads step, by hand, as any other path could) is seen at once:
    // the old result is not answered while the worker computes the new steps' (its job, run here), then balanced afresh.
    await db.insert(caseSteps).values({ caseId, step: "loads", data: { notes: "Balanced afresh." } });
    expect((await get(`/api/cases/${caseId}/loads`, loadsLoader)).status).toBe(202);
    await computeQueuedResults(caseId, db, "final");
    const mid = balanced();
    await view();
    expect(balanced() - mid).toBeGreaterThan(0);
  });
});
