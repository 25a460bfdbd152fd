import { and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cases, ruleSensitivities } from "~/db/schema";
import type { RuleSensitivity, SensitivityProgress } from "~/domain/comparisons";
import { DomainError } from "~/domain/errors";
import type { UnitSystem } from "~/domain/units";
import { ENGINE_VERSION } from "~/engine";
import { boss, QUEUES } from "~/jobs/boss.server";
import { currentDistributionInput, currentInputKey, resultsFor, sweepProgress } from "./analysis.server";
import { getCaseUnits } from "./case-steps.server";
import { ruleSensitivitySteps } from "./comparisons.server";

/*
 * The distribution page's rule sensitivity is solved by the job worker (a few spanwise solves per
 * critical case, after the case's own sweep) and stored per input of the distribution step, so the
 * page only ever reads it: stored, or how far the worker has got.
 */

export type CaseSensitivityAnswer = { units: UnitSystem } & ({ state: "done"; sensitivity: RuleSensitivity } | { state: "pending"; progress: SensitivityProgress });

const keyOf = (caseId: string, inputHash: string) => and(eq(ruleSensitivities.caseId, caseId), eq(ruleSensitivities.inputHash, inputHash), eq(ruleSensitivities.engineVersion, ENGINE_VERSION));

/**
 * The rule sensitivity of the case's current distribution input as the worker stored it, or its
 * progress; the job is (re)sent while it is not stored, once per input (singleton key), so a lost
 * job is sent again by the next ask. Never solves anything itself.
 * @throws DomainError when a step is missing, or as the worker recorded it when the engine refused the case
 */
export async function caseRuleSensitivity(input: { caseId: string; title: string }): Promise<CaseSensitivityAnswer> {
  const [units, { inputHash }] = await Promise.all([getCaseUnits(input.caseId), currentInputKey(input.caseId, input.title, "envelope")]);
  // A large case's input is still being built by the worker: its results come first, as below.
  if (inputHash === null) return { units, state: "pending", progress: { phase: "results", done: 0, total: 0, sweep: null } };
  await db.insert(ruleSensitivities).values({ caseId: input.caseId, inputHash, engineVersion: ENGINE_VERSION }).onConflictDoNothing();
  const [row] = await db.select().from(ruleSensitivities).where(keyOf(input.caseId, inputHash));
  if (!row) throw new DomainError("Case not found.", { field: "caseId", kind: "not-found" });
  if (row.phase === "done") return { units, state: "done", sensitivity: row.sensitivity as unknown as RuleSensitivity };
  if (row.phase === "failed") throw new DomainError(row.problem ?? "The engine refused this case.", { field: "case", kind: "unprocessable" });
  await (await boss()).send(QUEUES.ruleSensitivity, { caseId: input.caseId, inputHash }, { singletonKey: `${input.caseId}:${inputHash}`, retryLimit: 2 });
  const sweep = row.phase === "results" ? await sweepProgress(input.caseId, inputHash) : null;
  return {
    units,
    state: "pending",
    progress: { phase: row.phase, done: row.done, total: row.total, sweep: sweep && { phase: sweep.phase, solves: sweep.solves, casesDone: sweep.casesDone, casesTotal: sweep.casesTotal } },
  };
}

/**
 * The job: the case's own results for the distribution input (solved and stored first when they are
 * not yet), then each critical case under each rule, recording progress after each, and the table
 * stored. Idempotent: a stored or refused input, or one the case no longer has, is left alone.
 */
export async function computeRuleSensitivity(caseId: string, inputHash: string): Promise<void> {
  const [c] = await db.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  if (!c) return;
  const [row] = await db.select({ phase: ruleSensitivities.phase }).from(ruleSensitivities).where(keyOf(caseId, inputHash));
  if (!row || row.phase === "done" || row.phase === "failed") return;
  const record = (values: Partial<typeof ruleSensitivities.$inferInsert>) => db.update(ruleSensitivities).set({ ...values, updatedAt: new Date() }).where(keyOf(caseId, inputHash));
  try {
    const current = await currentDistributionInput(caseId, c.title);
    // Edited since it was asked for: the page asks for the new input itself.
    if (current.inputHash !== inputHash) return;
    await record({ phase: "results" });
    const { result } = await resultsFor(caseId, current.file, null, current.sections, { recordProgress: true });
    const steps = ruleSensitivitySteps(current.file, result, current.sections);
    for (;;) {
      const next = steps.next();
      if (next.done) {
        await record({ phase: "done", sensitivity: next.value as unknown as Record<string, unknown> });
        return;
      }
      await record({ phase: "solving", done: next.value.done, total: next.value.total });
    }
  } catch (error) {
    // The engine's refusal is the case's, not the worker's: said on the page, not retried.
    if (error instanceof DomainError) {
      await record({ phase: "failed", problem: error.message });
      return;
    }
    throw error;
  }
}
