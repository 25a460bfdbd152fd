import fs from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { programmes, resultProgress, users } from "~/db/schema";
import { parseCase, runCase, type CaseFileInput } from "~/exchange";
import { boss, QUEUES, stopBoss } from "~/jobs/boss.server";
import { startWorkers } from "~/jobs/workers.server";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { analysisInputHash, currentAnalysisInput, exportCase, sweepProgress } from "~/services/analysis.server";
import { importCase } from "~/services/case-import.server";
import { cookieFor, demoUser, request, seed, routeArgs } from "./helpers";

afterAll(async () => {
  await stopBoss();
});

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
  // A sweep of 600 trimmed cases over 6 Mach numbers: more than a web request should solve itself (all within
  // ±30° of trimmed angle, which the engine refuses beyond).
  const sweep: CaseFileInput = {
    ...base,
    cases: Array.from({ length: 600 }, (_, i) => ({ id: `s${i}`, mach: 0.3 + 0.05 * (i % 6), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })),
  };
  const parsed = parseCase(sweep);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  const created = await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "SWEEP-600", title: "Sweep", document: sweep, actor: { id: erin!.id, email: erin!.email } });
  caseId = created.id;
});

const ask = async () => (await resultsLoader((await routeArgs(request(`/api/v1/cases/${caseId}/results`, { cookie }), { caseId })) as never)) as Response;

describe("large sweeps go through the job queue", () => {
  it("answers 202 while a worker solves the sweep, then the stored result, equal to the engine's", async () => {
    const first = await ask();
    expect(first.status).toBe(202);
    const waiting = (await first.json()) as { status: string; message: string; progress: { phase: string; casesTotal: number } };
    expect(waiting.status).toBe("computing");
    // Queued at import (one job for each of the two inputs), before a worker has built the case file: the answer says so and how many cases there are.
    expect(waiting.progress).toBeNull();
    expect(waiting.message).toBe("600 load cases wait for a background worker. Ask again in a moment.");
    // Asked again and again while it waits (the page polls): no job more.
    for (let i = 0; i < 3; i++) expect((await ask()).status).toBe(202);
    expect(await (await boss()).getQueueSize(QUEUES.computeResults)).toBe(2);
    // Once a process has built the input (as the worker does first), the answer names its sweep's progress.
    await currentAnalysisInput(caseId, "Sweep");
    expect(((await (await ask()).json()) as { progress: unknown }).progress).toEqual({ phase: "queued", solves: 0, casesDone: 0, casesTotal: 600 });
    // As a worker records its progress, every web process answers with it (set here as a worker would).
    await db.update(resultProgress).set({ phase: "cases", solves: 6, casesDone: 300 }).where(eq(resultProgress.caseId, caseId));
    const halfway = (await (await ask()).json()) as { message: string; progress: unknown };
    expect(halfway.progress).toEqual({ phase: "cases", solves: 6, casesDone: 300, casesTotal: 600 });
    expect(halfway.message).toBe("600 load cases: spanwise solves done (6); 300 of 600 cases evaluated. Ask again in a moment.");
    await db.update(resultProgress).set({ phase: "queued", solves: 0, casesDone: 0 }).where(eq(resultProgress.caseId, caseId));
    await startWorkers();
    let answer = first;
    for (let i = 0; i < 60 && answer.status === 202; i++) {
      await new Promise((r) => setTimeout(r, 500));
      answer = await ask();
    }
    expect(answer.status).toBe(200);
    const stored = await answer.json();
    const parsed = parseCase(JSON.parse(JSON.stringify(await exportCase(caseId, "Sweep"))));
    if (!parsed.ok) throw new Error("export does not parse");
    expect(stored).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
    // The worker recorded its progress as it went: one solve per distinct Mach number, every case evaluated.
    const progress = await sweepProgress(caseId, analysisInputHash(parsed.value));
    expect(progress).toMatchObject({ phase: "done", solves: 6, casesDone: 600, casesTotal: 600 });
  }, 60_000);

  it("a results queue made before its policy changed holds one waiting job per input too, once the app starts again", async () => {
    // As an installation from before the change has it: the queue made with pg-boss's standard policy.
    await (await boss()).updateQueue(QUEUES.computeResults, { name: QUEUES.computeResults, policy: "standard" });
    await stopBoss();
    expect((await (await boss()).getQueue(QUEUES.computeResults))?.policy).toBe("short");
  });
});
