import fs from "node:fs";
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { auditLog, caseSteps, cases, programmes, stepRevisions, users } from "~/db/schema";
import type { DistributionData } from "~/domain/step-data";
import * as engine from "~/engine";
import * as exchange from "~/exchange";
import type { CaseFileInput, CaseResult } from "~/exchange";
import { boss, QUEUES, stopBoss } from "~/jobs/boss.server";
import { loader as viewLoader } from "~/routes/api/case-distribution";
import { loader as flagsLoader } from "~/routes/api/case-flagged-cases";
import { loader as searchLoader } from "~/routes/api/case-load-case-search";
import { loader as spanwiseLoader } from "~/routes/api/case-spanwise-methods";
import { action as restoreAction } from "~/routes/api/case-step-restore";
import { action as pageAction, loader as pageLoader } from "~/routes/cases/distribution";
import { computeQueuedResults, currentDistributionInput, resultsFor } from "~/services/analysis.server";
import { importCase } from "~/services/case-import.server";
import { createCase } from "~/services/programmes.server";
import { FIRST_FLAG_ROWS, flaggedCases, MAX_FLAG_ROWS, MAX_SUGGESTIONS, OPEN_IDS_SHOWN, type FlagRow, type FlagWindow } from "~/services/distribution.server";
import { cookieFor, demoUser, request, routeArgs, rowFieldsOf, run, seed } from "./helpers";

// Every spanwise solve goes through the engine's solveMach, and every check of a case file through
// the exchange's parseCase: counted here, so the test sees what the page's loader and its resource
// routes do (issue 10 item 8, issue 14: the distribution page of a large case).
vi.mock("~/engine", async (importOriginal) => {
  const actual = await importOriginal<typeof engine>();
  return { ...actual, solveMach: vi.fn(actual.solveMach) };
});
vi.mock("~/exchange", async (importOriginal) => {
  const actual = await importOriginal<typeof exchange>();
  return { ...actual, parseCase: vi.fn(actual.parseCase) };
});
const solves = () => vi.mocked(engine.solveMach).mock.calls.length;
/** How many load cases each check of a case file made since `from` was called had. */
const checked = (from: number) => vi.mocked(exchange.parseCase).mock.calls.slice(from).map(([doc]) => (doc as { cases?: unknown[] }).cases?.length ?? 0);
const checks = () => vi.mocked(exchange.parseCase).mock.calls.length;

/** The large case: enough cases that the flagged table spans several ranges (the limits are the constants imported above). */
const CASES = 3000;
let demoId = "";
let largeId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  demoId = demo!.id;
  const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
  // Load factors up to 3.4 and Mach numbers up to 0.7: many cases over clmax or above the critical Mach number.
  const sweep: CaseFileInput = { ...base, cases: Array.from({ length: CASES }, (_, i) => ({ id: `D${i + 1}`, mach: 0.3 + 0.05 * (i % 9), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })) };
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  largeId = (await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "DIST-3000", title: "Distribution at scale", document: sweep, actor: { id: erin!.id, email: erin!.email } })).id;
}, 300_000);

afterAll(async () => {
  await stopBoss();
});

type Page = { revision: number; page: { state: "problem"; cause: string; problem: string } | { state: "ready"; shown: string; cases: number; method: unknown; summary: { flagged: number; open: number; openIds: string[]; byReason: { reason: string; count: number; open: number }[] }; first: FlagRow[] } | { state: "pending"; cases: number; progress: unknown } };
const pageOf = async (caseId: string, query = "") => (await run(pageLoader, { request: request(`/cases/${caseId}/distribution${query}`, { cookie }), params: { caseId } })).body as Page;
const get = async (loader: (args: never) => unknown, path: string, caseId: string) => (await loader((await routeArgs(request(path, { cookie }), { caseId })) as never)) as Response;
const post = (caseId: string, body: unknown) => run(pageAction, { request: request(`/cases/${caseId}/distribution`, { method: "POST", cookie, headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) }), params: { caseId } });
const distributionRow = async (caseId: string) => (await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "distribution"))))[0];
const revisionCount = async (caseId: string) => (await db.select().from(stepRevisions).where(and(eq(stepRevisions.caseId, caseId), eq(stepRevisions.step, "distribution")))).length;
const audits = async (caseId: string) => (await db.select().from(auditLog).where(and(eq(auditLog.entityId, caseId), eq(auditLog.action, "step.distribution.save")))).length;
/** The stored result of the case's distribution input, read whole (what the page must not do). */
const storedResult = async (caseId: string, title: string) => {
  const input = await currentDistributionInput(caseId, title);
  return (await resultsFor(caseId, input.file, null, input.sections)).result as CaseResult;
};

describe("the distribution page's loader solves nothing", () => {
  it("answers the demo case's summary and first rows from the stored result; the shown case comes from the resource route, that case alone checked", async () => {
    const before = solves();
    const body = await pageOf(demoId);
    expect(solves()).toBe(before);
    expect(body.page.state).toBe("ready");
    if (body.page.state !== "ready") return;
    expect(body.page).not.toHaveProperty("view");
    expect(body.page.first.length).toBe(Math.min(FIRST_FLAG_ROWS, body.page.summary.flagged));

    // The resource route solves the one case under each of the three compressibility rules, and checks that case alone.
    const from = checks();
    const res = await get(viewLoader, `/api/cases/${demoId}/distribution?case=${encodeURIComponent(body.page.shown)}`, demoId);
    expect(res.status).toBe(200);
    expect(((await res.json()) as { caseId: string }).caseId).toBe(body.page.shown);
    expect(solves() - before).toBe(3);
    expect(checked(from)).toEqual([1]);
  });

  it("hands a large case file's sweep to the job worker and answers its progress, without a solve; then the summary", async () => {
    const before = solves();
    const waiting = await pageOf(largeId);
    // Queued at import for the worker, which builds the case file first: no progress of its own yet.
    expect(waiting.page).toEqual({ state: "pending", cases: CASES, progress: null });
    expect(await (await boss()).getQueueSize(QUEUES.computeResults)).toBe(2);
    expect(solves()).toBe(before);

    // The worker's sweep (the job's own function, as the worker runs it); the page then reads what it stored.
    await computeQueuedResults(largeId, db, "envelope");
    const swept = solves();
    const ready = await pageOf(largeId);
    expect(ready.page.state).toBe("ready");
    expect(solves()).toBe(swept);
  }, 300_000);
});

describe("the distribution page of a large case file", () => {
  it("carries the count by reason, the first rows and the first few ids still without a disposition; the other rows come by range", async () => {
    const flags = flaggedCases(await storedResult(largeId, "Distribution at scale"));
    // The sweep is wide enough to make the table span several ranges.
    expect(flags.length).toBeGreaterThan(FIRST_FLAG_ROWS + 100);
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const { summary, first } = body.page;
    expect(summary.flagged).toBe(flags.length);
    expect(summary.open).toBe(flags.length);
    expect(summary.openIds).toEqual(flags.slice(0, OPEN_IDS_SHOWN).map((f) => f.id));
    for (const r of summary.byReason) expect(r.count).toBe(flags.filter((f) => f.kinds.includes(r.reason as never)).length);
    // Each row as the whole result flags it (its reasons in words and its kinds), with no disposition yet.
    const asFlag = ({ disposition, ...f }: FlagRow) => (expect(disposition).toBeNull(), f);
    expect(first.map(asFlag)).toEqual(flags.slice(0, FIRST_FLAG_ROWS));
    // The page's data hold no list of every case or every flag.
    expect(JSON.stringify(body).length).toBeLessThan(JSON.stringify(flags).length / 5);

    const next = await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=${FIRST_FLAG_ROWS}&limit=100`, largeId);
    expect(next.status).toBe(200);
    const window = (await next.json()) as FlagWindow;
    expect(window).toMatchObject({ total: flags.length, offset: FIRST_FLAG_ROWS, revision: body.revision });
    expect(window.rows.map(asFlag)).toEqual(flags.slice(FIRST_FLAG_ROWS, FIRST_FLAG_ROWS + 100));
    // A range past the last flagged case holds the rows there are, and one beyond them none.
    const tail = (await (await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=${flags.length - 3}&limit=10`, largeId)).json()) as FlagWindow;
    expect(tail.rows.map(asFlag)).toEqual(flags.slice(-3));
    const beyond = (await (await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=${flags.length}&limit=10`, largeId)).json()) as FlagWindow;
    expect(beyond).toMatchObject({ total: flags.length, offset: flags.length, rows: [] });

    const tooMany = await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=0&limit=${MAX_FLAG_ROWS + 1}`, largeId);
    expect(tooMany.status).toBe(400);
    expect(((await tooMany.json()) as { message: string }).message).toBe(`limit must be a whole number from 1 to ${MAX_FLAG_ROWS}`);
    const negative = await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=-1&limit=10`, largeId);
    expect(negative.status).toBe(400);
    expect(((await negative.json()) as { message: string }).message).toMatch(/^offset must be a whole number/);
  });

  it("shows one case of the file, and compares it by each spanwise method, checking that case alone", async () => {
    await pageOf(largeId);
    const from = checks();
    const view = await get(viewLoader, `/api/cases/${largeId}/distribution?case=D7`, largeId);
    expect(view.status).toBe(200);
    const methods = await get(spanwiseLoader, `/api/cases/${largeId}/spanwise-methods?case=D7`, largeId);
    expect(methods.status).toBe(200);
    expect(((await methods.json()) as { comparison: { caseId: string } }).comparison.caseId).toBe("D7");
    expect(checked(from)).toEqual([1, 1]);
    const missing = await get(viewLoader, `/api/cases/${largeId}/distribution?case=D0`, largeId);
    expect(missing.status).toBe(404);
    expect(((await missing.json()) as { message: string }).message).toBe('Case file DIST-3000 has no load case "D0".');
  });

  it("suggests the cases whose id holds the text typed, those beginning with it first, at most a few", async () => {
    const res = await get(searchLoader, `/api/cases/${largeId}/load-case-search?q=d12`, largeId);
    const found = (await res.json()) as { matches: { id: string; flagged: boolean }[]; more: boolean };
    expect(found.matches).toHaveLength(MAX_SUGGESTIONS);
    expect(found.more).toBe(true);
    expect(found.matches[0]!.id).toBe("D12");
    expect(found.matches.every((m) => m.id.toLowerCase().startsWith("d12"))).toBe(true);
    const exact = (await (await get(searchLoader, `/api/cases/${largeId}/load-case-search?q=D2999`, largeId)).json()) as typeof found;
    expect(exact).toEqual({ matches: [{ id: "D2999", flagged: expect.any(Boolean) }], more: false });
  });

  it("saves only the rows changed, merged into the stored step; a bad comment is named and a stale revision refused, with nothing written", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const [a, b, c] = body.page.first;
    const revision = body.revision;
    const saved = await post(largeId, { intent: "rows", revision, changed: [{ id: a!.id, action: "exclude", comment: "" }, { id: b!.id, action: "justify", comment: "Checked against the flight-test pressure survey." }] });
    expect(saved.status).toBe(200);
    expect(saved.body).toMatchObject({ ok: true, message: `Dispositions saved as revision ${revision + 1}.` });

    // A second save of one other row keeps the first two: merged, not replaced.
    const more = await post(largeId, { intent: "rows", revision: revision + 1, changed: [{ id: c!.id, action: "exclude", comment: "" }, { id: a!.id, action: "none", comment: "" }] });
    expect(more.status).toBe(200);
    const stored = (await distributionRow(largeId))!;
    expect(stored.revision).toBe(revision + 2);
    expect((stored.data as DistributionData).dispositions).toEqual({ [b!.id]: { action: "justify", comment: "Checked against the flight-test pressure survey." }, [c!.id]: { action: "exclude", comment: "" } });

    const revisions = await revisionCount(largeId);
    const short = await post(largeId, { intent: "rows", revision: revision + 2, changed: [{ id: a!.id, action: "justify", comment: "ok" }] });
    expect(short.status).toBe(400);
    expect((short.body as { fieldErrors: Record<string, string[]> }).fieldErrors[`dispositions.${a!.id}.comment`]).toEqual(["A justification needs a comment of at least 10 characters"]);
    const stale = await post(largeId, { intent: "rows", revision, changed: [{ id: a!.id, action: "exclude", comment: "" }] });
    expect(stale.status).toBe(409);
    expect((stale.body as { fieldErrors: Record<string, string[]> }).fieldErrors.revision?.[0]).toMatch(/^Not saved: .*revision \d+.*your changes were not written/);
    const badAction = await post(largeId, { intent: "rows", revision: revision + 2, changed: [{ id: a!.id, action: "ignore", comment: "" }] });
    expect(badAction.status).toBe(400);
    expect((badAction.body as { fieldErrors: Record<string, string[]> }).fieldErrors["changed.0.action"]).toEqual(["Disposition must be none, exclude or justify"]);
    expect((await distributionRow(largeId))!.revision).toBe(revision + 2);
    expect(await revisionCount(largeId)).toBe(revisions);
  });

  it("dispositions every case flagged for a reason in one save, recorded in the audit log like any save", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const reason = body.page.summary.byReason[0]!;
    const flags = flaggedCases(await storedResult(largeId, "Distribution at scale")).filter((f) => f.kinds.includes(reason.reason as never));
    const before = { revision: body.revision, audits: await audits(largeId), revisions: await revisionCount(largeId) };

    const short = await post(largeId, { intent: "bulk", revision: before.revision, reason: reason.reason, action: "justify", comment: "fine" });
    expect(short.status).toBe(400);
    expect((short.body as { fieldErrors: Record<string, string[]> }).fieldErrors.comment).toEqual(["A justification needs a comment of at least 10 characters"]);
    const unknown = await post(largeId, { intent: "bulk", revision: before.revision, reason: "weather", action: "exclude", comment: "" });
    expect(unknown.status).toBe(400);
    expect((unknown.body as { fieldErrors: Record<string, string[]> }).fieldErrors.reason).toEqual(["Reason must be one of the reasons cases are flagged for"]);
    expect(await revisionCount(largeId)).toBe(before.revisions);

    const done = await post(largeId, { intent: "bulk", revision: before.revision, reason: reason.reason, action: "justify", comment: "Within the tunnel data's range; kept in the envelope." });
    expect(done.status).toBe(200);
    const stored = (await distributionRow(largeId))!;
    expect(stored.revision).toBe(before.revision + 1);
    const dispositions = (stored.data as DistributionData).dispositions;
    expect(flags.every((f) => dispositions[f.id]?.action === "justify" && dispositions[f.id]?.comment === "Within the tunnel data's range; kept in the envelope.")).toBe(true);
    expect(await audits(largeId)).toBe(before.audits + 1);
    const after = await pageOf(largeId);
    if (after.page.state !== "ready") throw new Error("results not stored");
    expect(after.page.summary.byReason.find((r) => r.reason === reason.reason)!.open).toBe(0);
    // Every count, and the first ids still open, against the whole result's flags and the stored dispositions.
    const all = flaggedCases(await storedResult(largeId, "Distribution at scale"));
    const open = all.filter((f) => !dispositions[f.id]);
    expect(open.length).toBeGreaterThan(0);
    expect(after.page.summary).toMatchObject({ flagged: all.length, open: open.length, openIds: open.slice(0, OPEN_IDS_SHOWN).map((f) => f.id) });
    expect(after.page.summary.byReason.map(({ reason: r, count, open: o }) => ({ r, count, o }))).toEqual(
      (["supercritical", "stall", "critical-mach-basis"] as const).map((r) => ({ r, count: all.filter((f) => f.kinds.includes(r)).length, o: open.filter((f) => f.kinds.includes(r)).length })).filter((x) => x.count > 0),
    );
  });

  it("names the first cases still without a disposition however far down the table they are", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const all = flaggedCases(await storedResult(largeId, "Distribution at scale"));
    const before = (await distributionRow(largeId))!.data as DistributionData;
    // Every flagged case but the last few excluded: the open ones are the table's last rows.
    const left = 7;
    const changed = all.slice(0, -left).filter((f) => !before.dispositions[f.id]).map((f) => ({ id: f.id, action: "exclude", comment: "" }));
    expect((await post(largeId, { intent: "rows", revision: body.revision, changed })).status).toBe(200);
    const dispositions = ((await distributionRow(largeId))!.data as DistributionData).dispositions;
    const open = all.filter((f) => !dispositions[f.id]);
    // Some of the last few may have one already (the reason disposed of above): at least one is open.
    expect(open.length).toBeGreaterThan(0);
    expect(all.slice(-left).map((f) => f.id)).toEqual(expect.arrayContaining(open.map((f) => f.id)));
    // Far past the first rows: the table has more flagged cases than one range of its ids holds.
    expect(all.length).toBeGreaterThan(1000 + left);
    const after = await pageOf(largeId);
    if (after.page.state !== "ready") throw new Error("results not stored");
    expect(after.page.summary).toMatchObject({ flagged: all.length, open: open.length, openIds: open.slice(0, OPEN_IDS_SHOWN).map((f) => f.id) });
  });

  it("reads the dispositions of the rows it shows, not the step's whole document, on its first look after a save", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const all = flaggedCases(await storedResult(largeId, "Distribution at scale"));
    // One more disposition, saved by another process (written here past the step service): this process
    // has kept nothing of the new data, as the other web processes have not after a save.
    const before = ((await distributionRow(largeId))!.data as DistributionData).dispositions;
    const next = all.find((f) => !before[f.id])!;
    await db
      .update(caseSteps)
      .set({ data: sql`jsonb_set(${caseSteps.data}, array['dispositions', ${next.id}], '{"action": "exclude", "comment": ""}'::jsonb)` })
      .where(and(eq(caseSteps.caseId, largeId), eq(caseSteps.step, "distribution")));
    const stored = JSON.stringify((await distributionRow(largeId))!.data);
    const dispositions = ((await distributionRow(largeId))!.data as DistributionData).dispositions;
    expect(Object.keys(dispositions).length).toBeGreaterThan(1000);
    let page: Page | undefined;
    let window: FlagWindow | undefined;
    const fields = await rowFieldsOf(async () => {
      page = await pageOf(largeId);
      window = (await (await get(flagsLoader, `/api/cases/${largeId}/flagged-cases?offset=${FIRST_FLAG_ROWS}&limit=100`, largeId)).json()) as FlagWindow;
    });
    // Before: the step's data, every disposition of it, was fetched and parsed at the first read after each save.
    expect(fields.filter((f) => f.includes('"dispositions"'))).toEqual([]);
    // All that the two reads receive, the shown rows and their dispositions among it, is less than that document alone.
    expect(fields.reduce((n, f) => n + f.length, 0)).toBeLessThan(stored.length);
    if (page?.page.state !== "ready") throw new Error("results not stored");
    expect(page.page.first.map((r) => r.disposition)).toEqual(all.slice(0, FIRST_FLAG_ROWS).map((f) => dispositions[f.id] ?? null));
    expect(window!.rows.map((r) => r.disposition)).toEqual(all.slice(FIRST_FLAG_ROWS, FIRST_FLAG_ROWS + 100).map((f) => dispositions[f.id] ?? null));
    expect(page.page.summary).toMatchObject({ flagged: all.length, open: all.filter((f) => !dispositions[f.id]).length });
  });

  it("is as current as the stored step, whoever wrote it: the same revision with other dispositions shows them", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    expect(body.page.summary.open).toBeLessThan(body.page.summary.flagged);
    const all = flaggedCases(await storedResult(largeId, "Distribution at scale"));
    // Written past the step service, the revision left as it was: what a process keeps must not answer for it.
    const kept = { [all[1]!.id]: { action: "exclude", comment: "" } };
    await db.update(caseSteps).set({ data: { dispositions: kept } }).where(and(eq(caseSteps.caseId, largeId), eq(caseSteps.step, "distribution")));
    const after = await pageOf(largeId);
    if (after.page.state !== "ready") throw new Error("results not stored");
    expect(after.revision).toBe(body.revision);
    expect(after.page.summary).toMatchObject({ flagged: all.length, open: all.length - 1, openIds: all.filter((f) => !kept[f.id]).slice(0, OPEN_IDS_SHOWN).map((f) => f.id) });
    expect(after.page.first.map((r) => r.disposition)).toEqual(all.slice(0, FIRST_FLAG_ROWS).map((f) => kept[f.id] ?? null));
  });

  it("says a stored disposition the step's rules refuse (written outside the app) is damaged, rather than showing it or saving over the step as if it had none", async () => {
    const body = await pageOf(largeId);
    if (body.page.state !== "ready") throw new Error("results not stored");
    const first = body.page.first[0]!.id;
    const ofStep = and(eq(caseSteps.caseId, largeId), eq(caseSteps.step, "distribution"));
    const [kept] = await db.select({ data: caseSteps.data }).from(caseSteps).where(ofStep);
    await db.update(caseSteps).set({ data: sql`jsonb_set(${caseSteps.data}, array['dispositions', ${first}], '{"action": "maybe"}'::jsonb)` }).where(ofStep);
    const [damaged] = await db.select({ data: caseSteps.data }).from(caseSteps).where(ofStep);
    const revisions = await revisionCount(largeId);
    // Before: the whole step read as no dispositions at all, and a save merged into that, dropping the others.
    const said = /^The stored dispositions of this case .*do not match the step's rules: they were changed outside Spanwright\. Nothing is shown or saved over them/;
    const page = await pageOf(largeId);
    // Said as damaged, so the panel's heading is the administrator's matter, not "nothing to show yet".
    expect(page.page).toMatchObject({ state: "problem", cause: "damaged", problem: expect.stringMatching(said) });
    expect(page.page).toMatchObject({ problem: expect.stringContaining(`that of ${first}`) });
    const saved = await post(largeId, { intent: "rows", revision: body.revision, changed: [{ id: body.page.first[1]!.id, action: "exclude", comment: "" }] });
    expect(saved.status).toBe(409);
    expect(JSON.stringify(saved.body)).toMatch(/do not match the step's rules/);
    expect((await distributionRow(largeId))!.data).toEqual(damaged!.data);
    expect(await revisionCount(largeId)).toBe(revisions);
    await db.update(caseSteps).set({ data: kept!.data }).where(ofStep);
  });

  it("lets an administrator, and no one else, put back the step's revision as it was saved once its record matches its hash; what was found is kept in the audit log", async () => {
    const ofStep = and(eq(caseSteps.caseId, largeId), eq(caseSteps.step, "distribution"));
    const [before] = await db.select({ revision: caseSteps.revision, data: caseSteps.data }).from(caseSteps).where(ofStep);
    const ofRecord = and(eq(stepRevisions.caseId, largeId), eq(stepRevisions.step, "distribution"), eq(stepRevisions.revision, before!.revision));
    const [record] = await db.select({ data: stepRevisions.data, hash: stepRevisions.hash }).from(stepRevisions).where(ofRecord);
    const first = Object.keys((record!.data as DistributionData).dispositions ?? {})[0]!;
    await db.update(caseSteps).set({ data: sql`jsonb_set(${caseSteps.data}, array['dispositions', ${first}], '{"action": "maybe"}'::jsonb)` }).where(ofStep);
    const [damaged] = await db.select({ data: caseSteps.data }).from(caseSteps).where(ofStep);
    const revisions = await revisionCount(largeId);
    const restore = (who: string, revision: number) =>
      run(restoreAction, {
        request: request(`/api/cases/${largeId}/steps/distribution/restore`, { method: "POST", cookie: who, headers: { "Content-Type": "application/json" }, body: JSON.stringify({ revision }) }),
        params: { caseId: largeId, step: "distribution" },
      });
    const restores = async () => (await db.select().from(auditLog).where(and(eq(auditLog.entityId, largeId), eq(auditLog.action, "step.distribution.restore")))).length;
    const admin = await cookieFor("admin");

    // The engineer may not; an administrator who saw another revision is told so; nothing is written.
    expect((await restore(cookie, before!.revision)).status).toBe(403);
    const stale = await restore(admin, before!.revision - 1);
    expect(stale.status).toBe(409);
    expect(JSON.stringify(stale.body)).toMatch(/saved again/);
    expect((await distributionRow(largeId))!.data).toEqual(damaged!.data);
    expect(await restores()).toBe(0);

    // A revision record changed too is refused: its data no longer give the hash taken when it was written.
    await db.update(stepRevisions).set({ data: damaged!.data! }).where(ofRecord);
    const forged = await restore(admin, before!.revision);
    expect(forged.status).toBe(409);
    expect(JSON.stringify(forged.body)).toMatch(/does not match the hash/);
    expect((await distributionRow(largeId))!.data).toEqual(damaged!.data);
    await db.update(stepRevisions).set({ data: record!.data }).where(ofRecord);

    const done = await restore(admin, before!.revision);
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ ok: true, revision: before!.revision });
    const after = (await distributionRow(largeId))!;
    expect(after.data).toEqual(record!.data);
    expect(after.revision).toBe(before!.revision);
    expect(await revisionCount(largeId)).toBe(revisions);
    const [entry] = await db.select().from(auditLog).where(and(eq(auditLog.entityId, largeId), eq(auditLog.action, "step.distribution.restore")));
    expect(entry!.before).toMatchObject({ revision: before!.revision, data: damaged!.data });
    expect(entry!.after).toMatchObject({ revision: before!.revision, hash: record!.hash });
    expect((await pageOf(largeId)).page.state).toBe("ready");

    // Nothing left to put back.
    const again = await restore(admin, before!.revision);
    expect(again.status).toBe(409);
    expect(JSON.stringify(again.body)).toMatch(/nothing to put back/);
    expect(await restores()).toBe(1);
  });

  it("tells a case whose steps are not saved yet apart from a damaged one: the engineer's next step, not an administrator's matter", async () => {
    const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    const fresh = await createCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "DIST-EMPTY", title: "Nothing saved yet", description: "", actor: { id: erin!.id, email: erin!.email } });
    const page = await pageOf(fresh.id);
    expect(page.page).toMatchObject({ state: "problem", cause: "incomplete", problem: expect.stringMatching(/^Save the .* first\.$/) });
  });
});
