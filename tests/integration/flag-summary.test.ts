import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { caseResults, cases } from "~/db/schema";
import type { ResultSummary } from "~/domain/results";
import { stopBoss } from "~/jobs/boss.server";
import { currentDistributionInput, currentInputKey, resultsFor } from "~/services/analysis.server";
import { flaggedCases, storedFlags } from "~/services/distribution.server";
import { seed } from "./helpers";

// The distribution page reads the flagged cases out of the summary kept beside a stored result, once
// per process. A result stored before summaries were kept has its summary made at that first read.
// Both reads give what the whole result flags. This file's module instance starts with an empty cache;
// a fresh instance (vi.resetModules) reads again.

let caseId = "";
let inputHash = "";
let expected: ReturnType<typeof flaggedCases> = [];

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  const input = await currentDistributionInput(caseId, c!.title);
  const stored = await resultsFor(caseId, input.file, null, input.sections);
  expected = flaggedCases(stored.result);
  const key = await currentInputKey(caseId, c!.title, "envelope");
  inputHash = key.inputHash!;
}, 120_000);

afterAll(stopBoss);

const storedRow = async () => (await db.select({ summary: caseResults.summary }).from(caseResults).where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash))))[0];

describe("the flagged cases of a stored result", () => {
  it("are made once from the result when it has no summary yet, and the summary is kept", async () => {
    // The demo case has flagged cases: otherwise this test would check nothing.
    expect(expected.length).toBeGreaterThan(0);
    await db.update(caseResults).set({ summary: sql`null` }).where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash)));
    const made = await storedFlags(caseId, inputHash, "SI");
    expect(made?.flags).toEqual(expected);
    const kept = (await storedRow())!.summary as unknown as ResultSummary;
    expect(kept.flagged.map((f) => f.id)).toEqual(expected.map((f) => f.id));
  });

  it("are read from the kept summary by a process that has not read them yet: the same cases, reasons and kinds, in order", async () => {
    vi.resetModules();
    const fresh = await import("~/services/distribution.server");
    const read = await fresh.storedFlags(caseId, inputHash, "SI");
    // That instance opened its own connections.
    await (await import("~/db/client.server")).closeDb();
    expect(read?.flags).toEqual(expected);
    expect(read?.first).toBeTruthy();
    expect(read?.method).toMatchObject({ compressibility: expect.any(String) });
  });
});
