import { and, asc, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseResults, cases, resultFlags } from "~/db/schema";
import { flagFacts, type FlagFacts } from "~/domain/results";
import type { CaseResult } from "~/exchange";
import { stopBoss } from "~/jobs/boss.server";
import { currentDistributionInput, currentInputKey, resultsFor } from "~/services/analysis.server";
import { flaggedCases, storedFlags } from "~/services/distribution.server";
import { seed } from "./helpers";

// The distribution page reads a stored result's flagged cases by row (result_flags) and their counts
// from the summary kept beside it, never the whole list: both are written as the result is stored. A
// result stored before has them made at the first read and kept, whether it has no summary or the
// older one with every flagged case inline. Checked against the whole result's flags.

let caseId = "";
let inputHash = "";
let result: CaseResult;
let expected: ReturnType<typeof flaggedCases> = [];

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  const input = await currentDistributionInput(caseId, c!.title);
  const stored = await resultsFor(caseId, input.file, null, input.sections);
  result = stored.result;
  expected = flaggedCases(stored.result);
  const key = await currentInputKey(caseId, c!.title, "envelope");
  inputHash = key.inputHash!;
}, 120_000);

afterAll(stopBoss);

const ofThisResult = () => and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash));
const resultId = async () => (await db.select({ id: caseResults.id }).from(caseResults).where(ofThisResult()))[0]!.id;
const storedSummary = async () => (await db.select({ summary: caseResults.summary }).from(caseResults).where(ofThisResult()))[0]!.summary;
const flagRows = async () => db.select({ rank: resultFlags.rank, id: resultFlags.loadCase, kinds: resultFlags.kinds, facts: resultFlags.facts }).from(resultFlags).where(eq(resultFlags.resultId, await resultId())).orderBy(asc(resultFlags.rank));
const countsOf = (flags: typeof expected) => ({
  all: flags.length,
  supercritical: flags.filter((f) => f.kinds.includes("supercritical")).length,
  stall: flags.filter((f) => f.kinds.includes("stall")).length,
  "critical-mach-basis": flags.filter((f) => f.kinds.includes("critical-mach-basis")).length,
});

/** The rows and summary as they are now, checked against the whole result's flags. */
async function expectKeptAsTheWholeResultFlags() {
  const rows = await flagRows();
  expect(rows.map((r) => r.rank)).toEqual(expected.map((_, i) => i));
  expect(rows.map((r) => ({ id: r.id, kinds: r.kinds }))).toEqual(expected.map((f) => ({ id: f.id, kinds: f.kinds })));
  expect(rows.map((r) => r.facts)).toEqual(result.cases.map(flagFacts).filter((f) => f !== null));
  expect(await storedSummary()).toEqual({ method: result.method, first: result.cases[0]!.id, flagCounts: countsOf(expected) });
}

/** Makes the stored result look as one stored before its flagged cases were kept by row. */
async function storedAsBefore(summary: unknown) {
  await db.delete(resultFlags).where(eq(resultFlags.resultId, await resultId()));
  await db.update(caseResults).set({ summary: summary === null ? sql`null` : (summary as Record<string, unknown>) }).where(ofThisResult());
}

describe("the flagged cases of a stored result", () => {
  it("are kept by row as the result is stored, in its order with their facts and reasons, and counted by reason in its summary", async () => {
    // The demo case has flagged cases for more than one reason: otherwise this test would check little.
    expect(expected.length).toBeGreaterThan(0);
    expect(new Set(expected.flatMap((f) => f.kinds)).size).toBeGreaterThan(1);
    await expectKeptAsTheWholeResultFlags();
    const read = await storedFlags(caseId, inputHash);
    expect(read).toMatchObject({ resultId: await resultId(), method: result.method, first: result.cases[0]!.id, counts: countsOf(expected) });
  });

  it("are made from the result at the first read when it was stored without a summary, and kept", async () => {
    await storedAsBefore(null);
    expect(await flagRows()).toEqual([]);
    const read = await storedFlags(caseId, inputHash);
    expect(read?.counts).toEqual(countsOf(expected));
    await expectKeptAsTheWholeResultFlags();
  });

  it("are made from the older summary's inline list when it has one, and the summary kept in the new form", async () => {
    const facts = result.cases.map(flagFacts).filter((f): f is FlagFacts => f !== null);
    await storedAsBefore({ method: result.method, first: result.cases[0]!.id, flagged: facts });
    const read = await storedFlags(caseId, inputHash);
    expect(read?.counts).toEqual(countsOf(expected));
    await expectKeptAsTheWholeResultFlags();
  });

  it("are made once when two requests read an older result at the same time: both answer, and no row is doubled", async () => {
    await storedAsBefore(null);
    const [a, b] = await Promise.all([storedFlags(caseId, inputHash), storedFlags(caseId, inputHash)]);
    expect(a?.counts).toEqual(countsOf(expected));
    expect(b?.counts).toEqual(countsOf(expected));
    await expectKeptAsTheWholeResultFlags();
  });

  it("go with their result", async () => {
    const id = await resultId();
    await db.delete(caseResults).where(eq(caseResults.id, id));
    expect(await db.select().from(resultFlags).where(eq(resultFlags.resultId, id))).toEqual([]);
    expect(await storedFlags(caseId, inputHash)).toBeNull();
  });
});
