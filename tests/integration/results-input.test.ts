import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, caseSteps, users } from "~/db/schema";
import { loader as loadsPageLoader } from "~/routes/cases/loads";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { analysisInputHash, exportCaseDocuments, parseOrThrow, parseSectionsOrThrow } from "~/services/analysis.server";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { cookieFor, demoUser, queriesOf, readsStepData, request, routeArgs, seed } from "./helpers";

// The results API and the loads page derive what they show from a case's steps once per content
// of the steps (and title), not on every request. What they answer must still follow every change
// to what it is derived from: checked against the input built afresh from the stored steps.

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

async function loadsPage() {
  const out = (await loadsPageLoader((await routeArgs(request(`/cases/${caseId}/loads`, { cookie }), { caseId })) as never)) as { values: { notes: string }; units: string; caseCount: number; revision: number };
  return out;
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
    const sent = await queriesOf(results);
    expect(sent.filter((text) => text.includes('"case_steps"')).length).toBeGreaterThan(0);
    expect(readsStepData(sent)).toEqual([]);
  });
});

describe("the loads page", () => {
  it("shows saved notes and the envelope's cases at once, and a repeated request reads no step data", async () => {
    const before = await loadsPage();
    const steps = await getCaseSteps(caseId);
    expect(before.values.notes).toBe((steps.loads.data as { notes?: string } | null)?.notes ?? "");
    expect(before.caseCount).toBeGreaterThan(0);
    const [actor] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.email, demoUser("engineer").email));
    await saveStep({ caseId, step: "loads", baseRevision: steps.loads.revision, data: { ...(steps.loads.data ?? {}), notes: "Root bending checked against the hand calculation." }, actor: actor! });
    const after = await loadsPage();
    expect(after.values.notes).toBe("Root bending checked against the hand calculation.");
    expect(after.revision).toBe(steps.loads.revision + 1);
    const sent = await queriesOf(loadsPage);
    expect(readsStepData(sent)).toEqual([]);
  });
});
