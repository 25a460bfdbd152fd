import { and, eq, sql } from "drizzle-orm";
import pg from "pg";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { cases, caseSteps, users } from "~/db/schema";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { analysisInputHash, exportCaseDocuments, parseOrThrow, parseSectionsOrThrow } from "~/services/analysis.server";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { cookieFor, demoUser, request, routeArgs, seed } from "./helpers";

// The results API derives a case's exchange input once per content of its steps (and title), not
// on every request. What it answers must still follow every change to what the results are
// computed from: checked against the input built afresh from the stored steps.

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  const [c] = await db.select({ id: cases.id }).from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  cookie = await cookieFor("engineer");
});

async function results(): Promise<{ hash: string; body: string }> {
  const res = (await resultsLoader((await routeArgs(request(`/api/v1/cases/${caseId}/results`, { cookie }), { caseId })) as never)) as Response;
  expect(res.status).toBe(200);
  return { hash: res.headers.get("X-Spanwright-Input-Sha256")!, body: await res.text() };
}

/** The input hash as built from the stored steps now, without anything kept between requests. */
async function freshHash(): Promise<string> {
  const [c] = await db.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  const { file, sections } = await exportCaseDocuments(caseId, c!.title);
  const parsed = parseOrThrow(file);
  return analysisInputHash(parsed, parseSectionsOrThrow(sections, parsed));
}

describe("the results API's input", () => {
  it("answers the results of the input as stored now, after a step is saved, the title changes or a step's data are written by anyone", async () => {
    const first = await results();
    expect(first.hash).toBe(await freshHash());

    const steps = await getCaseSteps(caseId);
    const [actor] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.email, demoUser("engineer").email));
    const planform = structuredClone(steps.planform.data!) as { stations: { twist: number }[] };
    planform.stations[0]!.twist += 0.25;
    await saveStep({ caseId, step: "planform", baseRevision: steps.planform.revision, data: planform, actor: actor! });
    const saved = await results();
    expect(saved.hash).not.toBe(first.hash);
    expect(saved.hash).toBe(await freshHash());

    await db.update(cases).set({ title: "Wing loads, retitled" }).where(eq(cases.id, caseId));
    const retitled = await results();
    expect(retitled.hash).not.toBe(saved.hash);
    expect(retitled.hash).toBe(await freshHash());

    // Written without a new revision (by hand, a migration): the digest of the data still changes.
    await db.execute(sql`update case_steps set data = jsonb_set(data, '{stations,0,twist}', to_jsonb((data #>> '{stations,0,twist}')::float8 + 0.25)) where case_id = ${caseId} and step = 'planform'`);
    const [row] = await db.select({ revision: caseSteps.revision }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "planform")));
    expect(row!.revision).toBe(steps.planform.revision + 1);
    const written = await results();
    expect(written.hash).not.toBe(retitled.hash);
    expect(written.hash).toBe(await freshHash());
  });

  it("a repeated request reads the digest of the steps' data, not the data", async () => {
    await results();
    const sent: string[] = [];
    const query = pg.Client.prototype.query;
    const spy = vi.spyOn(pg.Client.prototype, "query").mockImplementation(function (this: pg.Client, ...args: unknown[]) {
      const q = args[0] as string | { text?: string };
      sent.push(typeof q === "string" ? q : (q.text ?? ""));
      return (query as (...a: unknown[]) => unknown).apply(this, args);
    } as typeof query);
    try {
      await results();
    } finally {
      spy.mockRestore();
    }
    const stepReads = sent.filter((text) => text.includes('"case_steps"'));
    expect(stepReads.length).toBeGreaterThan(0);
    // The digest is md5("data"::text); the data column itself is never selected.
    expect(stepReads.filter((text) => /"data"(?!::text)/.test(text))).toEqual([]);
  });
});
