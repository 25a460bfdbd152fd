import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseResults, cases, caseSteps, resultFlags, resultInputs, users } from "~/db/schema";
import type { EnvelopeData } from "~/domain/step-data";
import { stopBoss } from "~/jobs/boss.server";
import { buildCaseFile, buildSectionsFile, caseInputs, currentDistributionInput, currentResultsOrQueue, resultsFor } from "~/services/analysis.server";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { demoUser, seededDemoCase } from "./helpers";

// Stored results are kept while something can ask for them: those of the inputs the case's steps make
// now (either scope). Every save used to leave the previous inputs' results behind (megabytes each for
// a large case). An issued report keeps its own evidence in its snapshot (tests/integration/report-evidence.test.ts
// re-runs one whose input's result is no longer stored).

let caseId = "";
let title = "";
let actor = { id: "", email: "" };

beforeAll(async () => {
  ({ caseId } = await seededDemoCase());
  const [c] = await db.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  title = c!.title;
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  actor = { id: erin!.id, email: erin!.email };
  // One case dispositioned out: the loads page's input (final) and the distribution page's (every case) differ.
  const steps = await getCaseSteps(caseId);
  const last = (steps.envelope.data as unknown as EnvelopeData).cases.at(-1)!.id;
  await saveStep({ caseId, step: "distribution", baseRevision: steps.distribution.revision, data: { dispositions: { [last]: { action: "exclude", comment: "" } } }, actor });
}, 120_000);

afterAll(async () => {
  await stopBoss();
});

/** The distinct values, sorted. */
const distinct = (...values: string[]) => [...new Set(values)].sort();
const stored = async () => (await db.select({ inputHash: caseResults.inputHash }).from(caseResults).where(eq(caseResults.caseId, caseId))).map((r) => r.inputHash).sort();
const recorded = async () => [...new Set((await db.select({ inputHash: resultInputs.inputHash }).from(resultInputs).where(eq(resultInputs.caseId, caseId))).map((r) => r.inputHash))].sort();

/** A change of the first load case's altitude, saved as the envelope page saves it: a new input of both scopes. */
async function saveAltitude(altitude: number) {
  const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  const data = structuredClone(row!.data) as unknown as EnvelopeData;
  data.cases[0]!.altitude = altitude;
  await saveStep({ caseId, step: "envelope", baseRevision: row!.revision, data: data as unknown as Record<string, unknown>, actor });
}

/** Runs `work` while PostgreSQL refuses every insert into `table` (a trigger), as a crash or a lost connection mid-write would. */
async function refusingInserts(table: "result_cases" | "result_flags", work: () => Promise<void>) {
  await db.execute(sql.raw(`create function refuse_${table}() returns trigger language plpgsql as $$ begin raise exception 'refused by the test'; end $$;
    create trigger refuse_${table} before insert on ${table} for each statement execute function refuse_${table}();`));
  try {
    await work();
  } finally {
    await db.execute(sql.raw(`drop trigger refuse_${table} on ${table}; drop function refuse_${table}();`));
  }
}

/** What the loads page (final scope) and the distribution page (every case of the envelope) have solved and stored. */
async function solveBoth(): Promise<{ final: string; envelope: string }> {
  const final = await currentResultsOrQueue(caseId, title, null);
  if (final.pending) throw new Error("the demo case was handed to the worker");
  const input = await currentDistributionInput(caseId, title);
  const envelope = await resultsFor(caseId, input.file, null, input.sections);
  return { final: final.inputHash, envelope: envelope.inputHash };
}

describe("stored results of a case", () => {
  it("after two saves, only the results of the inputs the steps make now remain", async () => {
    expect((await stored()).length).toBeGreaterThan(0);
    await saveAltitude(1234);
    const once = await solveBoth();
    await saveAltitude(2345);
    const now = await solveBoth();
    expect(distinct(once.final, once.envelope, now.final, now.envelope)).toHaveLength(4);
    // Before: the seed's results and those of every save stayed (11.6 MB each for a large case).
    expect(await stored()).toEqual(distinct(now.final, now.envelope));
    // The records of the inputs whose results went, and that the steps no longer make, go with them.
    expect(await recorded()).toEqual(distinct(now.final, now.envelope));
  }, 120_000);

  it("keeps the current steps' results that no page recorded, as a report's snapshot stores them", async () => {
    await saveAltitude(3456);
    const inputs = caseInputs(await getCaseSteps(caseId));
    // As buildSnapshot: both scopes built from the steps and stored, neither recorded against the steps' digest.
    const final = await resultsFor(caseId, buildCaseFile(title, inputs), null, buildSectionsFile(inputs));
    const envelope = await resultsFor(caseId, buildCaseFile(title, inputs, "envelope"), null, buildSectionsFile(inputs));
    expect(final.inputHash).not.toBe(envelope.inputHash);
    // The pages' results of the previous steps went as these came.
    expect(await stored()).toEqual(distinct(final.inputHash, envelope.inputHash));
  }, 120_000);

  it("stores a result together with its rows by load case, or not at all", async () => {
    // Common practice, no source: a stored result whose per-case rows are missing would answer "no such
    // load case" for a case it holds. PostgreSQL is made to refuse the rows (a trigger), as a crash or a
    // lost connection between the two writes would leave them.
    await saveAltitude(4567);
    const inputs = caseInputs(await getCaseSteps(caseId));
    const before = await stored();
    await refusingInserts("result_cases", () => expect(resultsFor(caseId, buildCaseFile(title, inputs), null, buildSectionsFile(inputs))).rejects.toThrow());
    // Before: the result row stayed, marked as kept by load case, with none of its cases.
    expect(await stored()).toEqual(before);
  }, 120_000);

  it("stores a result together with its flagged cases' rows, or not at all", async () => {
    // Common practice, no source: a stored result without the rows of its flagged cases would show the
    // distribution page with none to disposition, and let the step be submitted.
    await saveAltitude(1500);
    const inputs = caseInputs(await getCaseSteps(caseId));
    const before = await stored();
    await refusingInserts("result_flags", () => expect(resultsFor(caseId, buildCaseFile(title, inputs, "envelope"), null, buildSectionsFile(inputs))).rejects.toThrow(/insert into "result_flags"/));
    expect(await stored()).toEqual(before);
    // The demo case's envelope has flagged cases: stored now, the result comes with their rows.
    const ok = await resultsFor(caseId, buildCaseFile(title, inputs, "envelope"), null, buildSectionsFile(inputs));
    const [row] = await db.select({ id: caseResults.id }).from(caseResults).where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, ok.inputHash)));
    expect((await db.select().from(resultFlags).where(eq(resultFlags.resultId, row!.id))).length).toBeGreaterThan(0);
  }, 120_000);
});
