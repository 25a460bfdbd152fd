import fs from "node:fs";
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { cases, caseSteps, programmes, resultInputs, users } from "~/db/schema";
import type { EnvelopeData } from "~/domain/step-data";
import * as exchange from "~/exchange";
import type { CaseFileInput, CaseResult } from "~/exchange";
import { QUEUES, stopBoss } from "~/jobs/boss.server";
import { loader as viewLoader } from "~/routes/api/case-distribution";
import { loader as searchLoader } from "~/routes/api/case-load-case-search";
import { loader as loadsLoader } from "~/routes/api/case-loads";
import { loader as spanwiseLoader } from "~/routes/api/case-spanwise-methods";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { loader as pageLoader } from "~/routes/cases/distribution";
import { computeQueuedResults, currentAnalysisInput, currentResultsOrQueue, forgetDerivedForTests } from "~/services/analysis.server";
import { importCase } from "~/services/case-import.server";
import { saveStep } from "~/services/case-steps.server";
import { dispositionBlockers } from "~/services/distribution.server";
import * as masses from "~/services/masses.server";
import { cookieFor, demoUser, queriesOf, request, routeArgs, run, seed } from "./helpers";

// Building a case file checks its mass case names (checkMassCaseNames) and checking it runs the
// exchange's parseCase: both counted here, so the test sees whether a reader built or checked the file
// (issue 14, "a case at scale": the first page after a save, in each web process, built the whole file).
vi.mock("~/exchange", async (importOriginal) => {
  const actual = await importOriginal<typeof exchange>();
  return { ...actual, parseCase: vi.fn(actual.parseCase) };
});
vi.mock("~/services/masses.server", async (importOriginal) => {
  const actual = await importOriginal<typeof masses>();
  return { ...actual, checkMassCaseNames: vi.fn(actual.checkMassCaseNames) };
});
const checks = () => vi.mocked(exchange.parseCase).mock.calls.length;
/** How many load cases each check of a case file made since `from` was called had. */
const checked = (from: number) => vi.mocked(exchange.parseCase).mock.calls.slice(from).map(([doc]) => (doc as { cases?: unknown[] }).cases?.length ?? 0);
const builds = () => vi.mocked(masses.checkMassCaseNames).mock.calls.length;

const CASES = 3000;
const TITLE = "Input at scale";
let caseId = "";
let cookie = "";
let actor = { id: "", email: "" };

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
  const sweep: CaseFileInput = { ...base, cases: Array.from({ length: CASES }, (_, i) => ({ id: `H${i + 1}`, mach: 0.3 + 0.05 * (i % 9), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })) };
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  actor = { id: erin!.id, email: erin!.email };
  caseId = (await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "HASH-3000", title: TITLE, document: sweep, actor })).id;
  // The job worker's sweeps (its own function, as the worker runs it): what the distribution step examines and what the loads step uses.
  await computeQueuedResults(caseId, db, "envelope");
  await computeQueuedResults(caseId, db, "final");
}, 300_000);

afterAll(async () => {
  await stopBoss();
});

const distributionPage = async () => (await run(pageLoader, { request: request(`/cases/${caseId}/distribution`, { cookie }), params: { caseId } })).body as { page: { state: string; cases?: number } };
const get = async (loader: (args: never) => unknown, path: string) => (await loader((await routeArgs(request(path, { cookie }), { caseId })) as never)) as Response;

describe("a web process that has built nothing finds a large case's stored results by its steps' digest", () => {
  it("answers the distribution page, the loads view and the results API without building or checking the case file", async () => {
    forgetDerivedForTests();
    const [checksBefore, built] = [checks(), builds()];

    let page = { page: { state: "" } } as Awaited<ReturnType<typeof distributionPage>>;
    const sent = await queriesOf(async () => {
      page = await distributionPage();
    });
    expect(page.page).toMatchObject({ state: "ready", cases: CASES });
    // The page's method, first case and flags come from the summary kept beside the result. Before: the first
    // request of each process had PostgreSQL take them out of the stored result (3.4 s for 100 000 cases).
    expect(sent.filter((text) => text.includes("case_results") && /"result"|\br\.result\b/.test(text))).toEqual([]);

    const loads = await get(loadsLoader, `/api/cases/${caseId}/loads`);
    expect(loads.status).toBe(200);
    const view = (await loads.json()) as { caseCount: number; inputHash: string; info: { cases: Record<string, unknown> } };
    expect(view.caseCount).toBe(CASES);
    expect(Object.keys(view.info.cases).length).toBeGreaterThan(0);

    const results = await get(resultsLoader, `/api/v1/cases/${caseId}/results`);
    expect(results.status).toBe(200);
    expect(((await results.json()) as CaseResult).cases).toHaveLength(CASES);

    // Before: the three built the whole file and checked all 3 000 cases, six checks in all.
    expect(checks() - checksBefore).toBe(0);
    expect(builds() - built).toBe(0);

    // The shown case's distribution and its spanwise methods take that case out of the stored input and check it alone.
    const from = checks();
    const one = await get(viewLoader, `/api/cases/${caseId}/distribution?case=H7`);
    expect(one.status).toBe(200);
    expect(((await one.json()) as { caseId: string }).caseId).toBe("H7");
    const methods = await get(spanwiseLoader, `/api/cases/${caseId}/spanwise-methods?case=H7`);
    expect(methods.status).toBe(200);
    expect(((await methods.json()) as { comparison: { caseId: string } }).comparison.caseId).toBe("H7");
    expect(checked(from)).toEqual([1, 1]);
    expect(builds() - built).toBe(0);

    // The stored key is the one a build gives now.
    const input = await currentAnalysisInput(caseId, TITLE);
    expect(results.headers.get("X-Spanwright-Input-Sha256")).toBe(input.inputHash);
    expect(view.inputHash).toBe(input.inputHash);
  }, 120_000);

  it("answers the load-case search and the distribution step's submission check without building or checking the case file", async () => {
    forgetDerivedForTests();
    const [checksBefore, built] = [checks(), builds()];
    const search = await get(searchLoader, `/api/cases/${caseId}/load-case-search?q=H29`);
    expect(search.status).toBe(200);
    // Ids beginning with the text, in the file's order: H29, then H290…H299, H2900…
    expect(((await search.json()) as { matches: { id: string }[] }).matches.slice(0, 2).map((m) => m.id)).toEqual(["H29", "H290"]);
    const blockers = await dispositionBlockers(caseId, TITLE);
    expect(blockers.every((b) => !b.includes("still being computed"))).toBe(true);
    // Before: the search built the whole file and checked its 3 000 cases, and the check took it from the search (checks [3000]).
    expect(checked(checksBefore)).toEqual([]);
    expect(builds() - built).toBe(0);
  }, 120_000);

  it("never answers an old result: after a step is saved the page waits for the new input's sweep", async () => {
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const data = structuredClone(row!.data) as unknown as EnvelopeData;
    data.cases[0]!.nz = 1.1;
    await saveStep({ caseId, step: "envelope", baseRevision: row!.revision, data: data as unknown as Record<string, unknown>, actor });
    forgetDerivedForTests();
    const page = await distributionPage();
    expect(page.page).toMatchObject({ state: "pending", cases: CASES });
    const loads = await get(loadsLoader, `/api/cases/${caseId}/loads`);
    expect(loads.status).toBe(202);
    const results = await get(resultsLoader, `/api/v1/cases/${caseId}/results`);
    expect(results.status).toBe(202);
  }, 120_000);

  it("queues the worker at import and at every save: until it has built the input no reader builds or checks the file, then each reads what it stored", async () => {
    const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
    const n = 800;
    const sweep: CaseFileInput = { ...base, cases: Array.from({ length: n }, (_, i) => ({ id: `Q${i + 1}`, mach: 0.3 + 0.05 * (i % 9), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })) };
    const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
    const title = "Queued at save";
    const id = (await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "QUEUED-800", title, document: sweep, actor })).id;
    const waiting = async () =>
      (await db.execute<{ scope: string }>(sql`select data ->> 'scope' as scope from pgboss.job where name = ${QUEUES.computeResults} and data ->> 'caseId' = ${id} and state = 'created' order by 1`)).rows.map((r) => r.scope);
    // Before: nothing was queued until a page asked, and that page built and checked the whole file first.
    expect(await waiting()).toEqual(["envelope", "final"]);

    forgetDerivedForTests();
    const [checksBefore, built] = [checks(), builds()];
    const page = (await run(pageLoader, { request: request(`/cases/${id}/distribution`, { cookie }), params: { caseId: id } })).body as { page: { state: string; cases?: number; progress?: unknown } };
    expect(page.page).toEqual({ state: "pending", cases: n, progress: null });
    const of = async (loader: (args: never) => unknown, path: string) => (await loader((await routeArgs(request(path, { cookie }), { caseId: id })) as never)) as Response;
    expect((await of(loadsLoader, `/api/cases/${id}/loads`)).status).toBe(202);
    expect((await of(resultsLoader, `/api/v1/cases/${id}/results`)).status).toBe(202);
    expect((await of(searchLoader, `/api/cases/${id}/load-case-search?q=Q12`)).status).toBe(409);
    expect(await dispositionBlockers(id, title)).toEqual([expect.stringContaining("still being computed")]);
    expect(checks() - checksBefore).toBe(0);
    expect(builds() - built).toBe(0);

    // The worker's jobs, as it runs them; then a fresh process reads what they stored.
    await computeQueuedResults(id, db, "envelope");
    await computeQueuedResults(id, db, "final");
    await db.execute(sql`delete from pgboss.job where data ->> 'caseId' = ${id}`);
    forgetDerivedForTests();
    const [checksAfter, builtAfter] = [checks(), builds()];
    const ready = (await run(pageLoader, { request: request(`/cases/${id}/distribution`, { cookie }), params: { caseId: id } })).body as { page: { state: string; cases?: number } };
    expect(ready.page).toMatchObject({ state: "ready", cases: n });
    const search = await of(searchLoader, `/api/cases/${id}/load-case-search?q=Q12`);
    expect(search.status).toBe(200);
    const found = ((await search.json()) as { matches: { id: string }[] }).matches.map((m) => m.id);
    // Ids beginning with the text first, in the file's order (Q12, Q120…Q129), then those holding it elsewhere (none here).
    expect(found.slice(0, 3)).toEqual(["Q12", "Q120", "Q121"]);
    expect((await dispositionBlockers(id, title)).every((b) => !b.includes("still being computed"))).toBe(true);
    expect(checks() - checksAfter).toBe(0);
    expect(builds() - builtAfter).toBe(0);

    // A save queues the new steps' results again.
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, id), eq(caseSteps.step, "envelope")));
    const data = structuredClone(row!.data) as unknown as EnvelopeData;
    data.cases[1]!.nz = 1.3;
    await saveStep({ caseId: id, step: "envelope", baseRevision: row!.revision, data: data as unknown as Record<string, unknown>, actor });
    expect(await waiting()).toEqual(["envelope", "final"]);
  }, 300_000);

  it("keeps the record of an input while the case's steps make it or its result is stored, and drops the others", async () => {
    const [demo] = await db.select({ id: cases.id, title: cases.title }).from(cases).where(eq(cases.reference, "TN-WL-001"));
    const recorded = async () => (await db.select({ inputHash: resultInputs.inputHash }).from(resultInputs).where(eq(resultInputs.caseId, demo!.id))).map((r) => r.inputHash).sort();
    // A change of one load case's altitude: a new input.
    const saveAltitude = async (altitude: number) => {
      const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, demo!.id), eq(caseSteps.step, "envelope")));
      const data = structuredClone(row!.data) as unknown as EnvelopeData;
      data.cases[0]!.altitude = altitude;
      await saveStep({ caseId: demo!.id, step: "envelope", baseRevision: row!.revision, data: data as unknown as Record<string, unknown>, actor });
    };
    // Solved and stored (the demo's 228 cases are solved within the request).
    const solved = await currentResultsOrQueue(demo!.id, demo!.title, null);
    if (solved.pending) throw new Error("the demo case was handed to the worker");
    // Built (as a page or the export builds it), never solved, then the steps move on twice.
    await saveAltitude(1234);
    const unsolved = (await currentAnalysisInput(demo!.id, demo!.title)).inputHash;
    await saveAltitude(2345);
    const now = (await currentAnalysisInput(demo!.id, demo!.title)).inputHash;
    expect(new Set([solved.inputHash, unsolved, now]).size).toBe(3);
    // Before: every input ever built stayed recorded ([solved, unsolved, now]).
    expect(await recorded()).toEqual([solved.inputHash, now].sort());
  }, 120_000);
});
