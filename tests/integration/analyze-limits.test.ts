import fs from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApiToken } from "~/auth/api-auth.server";
import { db } from "~/db/client.server";
import { analysisJobs, memberships, users } from "~/db/schema";
import { parseCase, runCase, type CaseFileInput } from "~/exchange";
import { stopBoss } from "~/jobs/boss.server";
import { startWorkers } from "~/jobs/workers.server";
import { action as analyzeAction } from "~/routes/api/v1/analyze";
import { loader as jobLoader } from "~/routes/api/v1/analyze-job";
import { analysesInFlight, withAnalysisPlace } from "~/services/analysis-jobs.server";
import { ANALYZE_LIMITS, MAX_LISTED_PROBLEMS, MAX_OPEN_ANALYSES } from "~/utils/limits";
import { demoUser, request, seed, routeArgs } from "./helpers";

/**
 * The analysis API's limits (issue 9, item 2): a request beyond a documented limit is refused at
 * once naming it, a bad document gets a short answer, and a sweep too big to answer within the
 * request goes to the job queue with a job to poll.
 */

const base = () => JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
const sweep = (n: number, extra: Partial<CaseFileInput> = {}): CaseFileInput => ({
  ...base(),
  ...extra,
  cases: Array.from({ length: n }, (_, i) => ({ id: `s${i}`, mach: 0.3 + 0.04 * (i % 6), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 36) / 10 })),
});

const tokens: Record<string, string> = {};

beforeAll(async () => {
  await seed();
  for (const label of ["engineer", "checker"] as const) {
    const [row] = await db.select({ user: users, organisationId: memberships.organisationId }).from(users).innerJoin(memberships, eq(memberships.userId, users.id)).where(eq(users.email, demoUser(label).email));
    tokens[label] = (await createApiToken({ userId: row!.user.id, organisationId: row!.organisationId, name: "limits", scope: "read", actor: { id: row!.user.id, email: row!.user.email } })).token;
  }
});

afterAll(async () => {
  await stopBoss();
});

async function analyse(body: string | unknown, who = "engineer") {
  const req = request("/api/v1/analyze", { method: "POST", body: typeof body === "string" ? body : JSON.stringify(body), headers: { "Content-Type": "application/json", Authorization: `Bearer ${tokens[who]}` } });
  const res = await analyzeAction((await routeArgs(req)) as never);
  const text = await res.text();
  return { status: res.status, text, body: JSON.parse(text) as Record<string, unknown>, headers: res.headers };
}

async function poll(jobId: string, who = "engineer") {
  const res = await jobLoader((await routeArgs(request(`/api/v1/analyze/jobs/${jobId}`, { headers: { Authorization: `Bearer ${tokens[who]}` } }), { jobId })) as never);
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

describe("POST /api/v1/analyze refuses what is beyond its limits at once, naming the limit", () => {
  it("refuses a million empty stations with 413 naming wing.stations", async () => {
    const doc = { ...base(), wing: { stations: Array.from({ length: 1_000_000 }, () => ({})) } };
    const res = await analyse(doc);
    expect(res.status).toBe(413);
    expect(res.body).toMatchObject({ error: "too-large", limit: { name: "wing.stations", max: ANALYZE_LIMITS.wingStations } });
    expect(res.text.length).toBeLessThan(1000);
  });

  it("refuses 100 000 valid load cases with 413 naming cases", async () => {
    const res = await analyse(sweep(100_000));
    expect(res.status).toBe(413);
    expect(res.body).toMatchObject({ error: "too-large", limit: { name: "cases", max: ANALYZE_LIMITS.queuedCases } });
  });

  it("refuses station tables beyond the output limit, and says how to ask for less", async () => {
    const res = await analyse(sweep(ANALYZE_LIMITS.syncCases + 1, { method: { stations: ANALYZE_LIMITS.outputStations, output: "full" } }));
    expect(res.status).toBe(413);
    expect(res.body).toMatchObject({ limit: { name: "method.output" } });
    expect(res.body.message).toContain('"summary"');
    const stations = await analyse({ ...base(), method: { stations: ANALYZE_LIMITS.outputStations + 1 } });
    expect(stations.status).toBe(422);
    expect(JSON.stringify(stations.body.problems)).toContain("method.stations");
  });

  it("answers a document with 20 000 bad cases briefly: the first problems and a count", async () => {
    const doc = { ...sweep(20_000), cases: Array.from({ length: 20_000 }, (_, i) => ({ id: `b${i}`, mach: 3, altitude: 0, alpha: 1 })) };
    const res = await analyse(doc);
    expect(res.status).toBe(422);
    expect(res.body.problemCount).toBe(20_000);
    expect(res.body.problems).toHaveLength(MAX_LISTED_PROBLEMS);
    expect(res.body.omitted).toBe(20_000 - MAX_LISTED_PROBLEMS);
    expect(res.body.message).toContain("and 19995 more problems");
    expect(res.text.length).toBeLessThan(20_000);
  });
});

describe("a sweep beyond the request's own limit goes to the job queue", () => {
  it("answers 202 with a job to poll, which answers the engine's own result once a worker has solved it", async () => {
    const doc = sweep(ANALYZE_LIMITS.syncCases + 100, { method: { output: "summary" } });
    const res = await analyse(doc);
    expect(res.status).toBe(202);
    const job = res.body.job as { id: string; status: string; cases: number; links: { self: string } };
    expect(job).toMatchObject({ status: "queued", cases: ANALYZE_LIMITS.syncCases + 100, links: { self: `/api/v1/analyze/jobs/${job.id}` } });
    expect(res.headers.get("Location")).toBe(job.links.self);

    expect((await poll(job.id)).status).toBe(202);
    // Only the person who asked sees it, as a missing one.
    expect((await poll(job.id, "checker")).status).toBe(404);

    await startWorkers();
    let answer = await poll(job.id);
    for (let i = 0; i < 120 && answer.status === 202; i++) {
      await new Promise((r) => setTimeout(r, 500));
      answer = await poll(job.id);
    }
    expect(answer.status).toBe(200);
    const parsed = parseCase(doc);
    if (!parsed.ok) throw new Error("the sweep does not parse");
    expect(answer.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
  }, 120_000);

  it(`keeps at most ${MAX_OPEN_ANALYSES} analyses of one person waiting`, async () => {
    await stopBoss();
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    await db.delete(analysisJobs).where(eq(analysisJobs.userId, erin!.id));
    const doc = sweep(ANALYZE_LIMITS.syncCases + 1, { method: { output: "summary" } });
    for (let i = 0; i < MAX_OPEN_ANALYSES; i++) expect((await analyse(doc)).status).toBe(202);
    const refused = await analyse(doc);
    expect(refused.status).toBe(429);
    expect(refused.body.message).toContain(`at most ${MAX_OPEN_ANALYSES}`);
  }, 60_000);
});

describe("a burst of analyses beyond what a web process holds is told to come back, not left to time out", () => {
  it(`answers 503 with Retry-After at once while ${ANALYZE_LIMITS.inFlightPerProcess} analyses are held, and solves again once they are done`, async () => {
    // The places are filled by work that waits on a gate the test opens: no timing involved.
    let open!: () => void;
    const gate = new Promise<void>((resolve) => (open = resolve));
    const held = Array.from({ length: ANALYZE_LIMITS.inFlightPerProcess }, () => withAnalysisPlace(() => gate));
    expect(analysesInFlight()).toBe(ANALYZE_LIMITS.inFlightPerProcess);
    const busy = await analyse(base());
    expect(busy.status).toBe(503);
    expect(busy.headers.get("Retry-After")).toBe("1");
    expect(busy.body).toMatchObject({ error: "busy" });
    expect(busy.body.message).toContain("Send the request again");
    open();
    await Promise.all(held);
    expect(analysesInFlight()).toBe(0);
    const solved = await analyse(base());
    expect(solved.status).toBe(200);
    expect(solved.body).toMatchObject({ schema: "spanwright.result/1" });
  });
});
