import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { cases, ruleSensitivities } from "~/db/schema";
import type { RuleSensitivity } from "~/domain/comparisons";
import * as engine from "~/engine";
import { attributionOf } from "~/exchange";
import { boss, QUEUES, stopBoss } from "~/jobs/boss.server";
import { startWorkers } from "~/jobs/workers.server";
import { loader as sensitivityLoader } from "~/routes/api/case-rule-sensitivity";
import { buildCaseFile, buildSectionsFile, caseInputs, resultsFor } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { cookieFor, request, routeArgs, seed } from "./helpers";

// Every spanwise solve the comparisons make goes through the engine's solveMach: counted here, so
// the test sees who solves (the job) and who only reads (the route the page asks).
vi.mock("~/engine", async (importOriginal) => {
  const actual = await importOriginal<typeof engine>();
  return { ...actual, solveMach: vi.fn(actual.solveMach) };
});
const solves = () => vi.mocked(engine.solveMach).mock.calls.length;

let caseId = "";
let title = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  title = c!.title;
});

afterAll(async () => {
  await stopBoss();
});

const ask = async () => (await sensitivityLoader((await routeArgs(request(`/api/cases/${caseId}/rule-sensitivity`, { cookie }), { caseId })) as never)) as Response;

describe("the rule sensitivity is solved by the job worker and stored; the page only reads it", () => {
  it("answers the progress without solving, queues the job, and then answers what the job stored", async () => {
    const before = solves();
    const first = await ask();
    expect(first.status).toBe(202);
    expect(await first.json()).toMatchObject({ state: "pending", progress: { phase: "queued", done: 0, total: 0, sweep: null } });
    // Asked again while it waits: still no solve, and one job for the input, not one per ask.
    expect((await ask()).status).toBe(202);
    expect(solves()).toBe(before);
    expect(await (await boss()).getQueueSize(QUEUES.ruleSensitivity)).toBe(1);
    const [queued] = await db.select().from(ruleSensitivities).where(eq(ruleSensitivities.caseId, caseId));
    expect(queued).toMatchObject({ phase: "queued", sensitivity: null });

    await startWorkers();
    let answer = first;
    for (let i = 0; i < 240 && answer.status === 202; i++) {
      await new Promise((r) => setTimeout(r, 250));
      answer = await ask();
    }
    expect(answer.status).toBe(200);
    // The worker solved (the other two rules at the critical cases' Mach numbers).
    expect(solves()).toBeGreaterThan(before);
    const body = (await answer.json()) as { units: string; sensitivity: RuleSensitivity };
    const [stored] = await db.select().from(ruleSensitivities).where(eq(ruleSensitivities.caseId, caseId));
    expect(stored!.phase).toBe("done");
    expect(body.sensitivity).toEqual(stored!.sensitivity);
    // Progress ran to the end: every critical case under each of the three rules.
    expect(stored!.total).toBe(3 * body.sensitivity.cases.length);
    expect(stored!.done).toBe(stored!.total);

    // What is stored is of the distribution step's input: its own rule's row is the case's own
    // result, and a trimmed case carries nz·W under every rule, so its root shear
    // does not move (statics, common practice, no source).
    const inputs = caseInputs(await getCaseSteps(caseId));
    const file = buildCaseFile(title, inputs, "envelope");
    const { result } = await resultsFor(caseId, file, null, buildSectionsFile(inputs));
    expect(body.sensitivity.cases.length).toBeGreaterThan(0);
    for (const c of body.sensitivity.cases) {
      // A rolling case's extreme is one of its sides; its aileron increments are taken as entered under every rule.
      const { id, side } = attributionOf(c.id);
      const hit = result.cases.find((k) => k.id === id)!;
      const own = { root: side === "other" ? hit.roll!.other.root : hit.root };
      const mine = c.rules.find((r) => r.rule === body.sensitivity.chosen)!.root;
      // Equal to round-off where the results are direct solves; from a Mach grid, within the grid's
      // own bound (1e-4 of the loads, which the result states as method.machGrid).
      const tolerance = result.method?.machGrid ? 1e-4 : 1e-12;
      for (const q of ["shear", "bending", "torsion"] as const) expect(Math.abs(mine[q] - own.root[q])).toBeLessThanOrEqual(tolerance * Math.abs(own.root[q]));
      if (file.cases.find((k) => k.id === id)!.nz !== undefined) expect(c.spread.shear / Math.abs(own.root.shear)).toBeLessThan(1e-9);
    }

    // Read again: from the store, no solve.
    const after = solves();
    expect((await ask()).status).toBe(200);
    expect(solves()).toBe(after);
  }, 120_000);
});
