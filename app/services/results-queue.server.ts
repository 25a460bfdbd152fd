import { and, eq } from "drizzle-orm";
import { db, type Db, type Tx } from "~/db/client.server";
import { caseSteps } from "~/db/schema";
import { boss, QUEUES } from "~/jobs/boss.server";

/** Sweeps larger than this are solved, and their case file built, by a worker rather than inside a web request. */
export const SWEEP_THRESHOLD = 500;

/** What a results job computes: what the distribution step examines ("envelope") or what the loads step uses ("final"). */
export type InputScope = "envelope" | "final";

/** Load cases the case's stored envelope holds (PostgreSQL keeps the count as the step is written: the cases are not read). */
export async function envelopeCaseCount(caseId: string, database: Db | Tx = db): Promise<number> {
  const [row] = await database.select({ count: caseSteps.caseCount }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  return row?.count ?? 0;
}

/**
 * Hands the results of a large case's current steps to the job worker, for each scope: called once a
 * save has committed, so that the worker builds the case file and solves it while the person moves
 * on, and no page has to build it. At most one job per case and scope waits (the queue's policy);
 * it computes the steps as they are when it runs. A case small enough to solve in a request is left alone.
 */
export async function queueCaseResults(caseId: string, scopes: readonly InputScope[] = ["envelope", "final"], database: Db | Tx = db): Promise<boolean> {
  if ((await envelopeCaseCount(caseId, database)) <= SWEEP_THRESHOLD) return false;
  const queue = await boss();
  for (const scope of scopes) await queue.send(QUEUES.computeResults, { caseId, scope }, { singletonKey: `${caseId}:${scope}`, retryLimit: 2 });
  return true;
}
