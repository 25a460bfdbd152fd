import { desc, eq, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { db } from "~/db/client.server";
import { caseResults } from "~/db/schema";
import { rankedRootLoads, type RankedRootLoads, type RootLoadsRow, type SweepProgressView } from "~/domain/results";
import type { CaseResult, ResultCase } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { currentResultsOrQueue, fromCurrentSteps, storedInputKey, storedInputWith, storedResult, storedResultOf, type CaseInputs } from "./analysis.server";
import { loadsPageInfo, type LoadsPageInfo } from "./case-loads.server";

export { MAX_ROOT_ROWS } from "~/domain/results";

/**
 * What the loads page shows of a case's results, whatever the number of cases: the envelope by
 * station, the root loads of the cases (all of them up to MAX_ROOT_ROWS, else the most critical by
 * root bending, shear and torsion), and one case with its station table. The full result document
 * stays on the server (and in the results API).
 */
export interface LoadsView {
  engine: string;
  inputHash: string;
  caseCount: number;
  envelope: CaseResult["envelope"];
  /** Root loads only (no stations), the most critical by |root bending| first. */
  cases: RootLoadsRow[];
  /** The case asked for (or the critical one), with its stations where the result keeps them. */
  current: ResultCase;
  /** Mass case, kind and balance of the cases above (and those the envelope names), not of every case. */
  info: LoadsPageInfo;
}

export type LoadsViewAnswer = { pending: true; cases: number; progress: SweepProgressView | null } | ({ pending: false } & LoadsView);

// The ranked root loads kept with each stored result, by case, input hash and engine version (a result
// is fixed by them, so an entry is never stale); a few hundred kB each at most.
const ranked = new LRUCache<string, RankedRootLoads>({ max: 16 });

/** Tests only: forget the ranked root loads read, as a web process that has read none yet. */
export function forgetRankedForTests(): void {
  ranked.clear();
}

// Mass case, kind and balance of the cases every view of one result lists (balancing solves the wing
// at their Mach numbers), kept per content of the steps: `inputs` is the object fromCurrentSteps hands
// out for exactly that content (the result, hence the listed cases, follow from it), so anything
// written to a step gives a new one and the entry goes with the old.
const listedInfo = new WeakMap<CaseInputs, LoadsPageInfo>();

/**
 * The ranked root loads kept with the stored result for this input hash (rankedRootLoads), not the
 * result; null while none is stored. A result stored before they were kept has them made here once,
 * from the whole result, and kept for every later read.
 */
async function storedRootLoads(caseId: string, inputHash: string): Promise<RankedRootLoads | null> {
  const key = `${caseId}\n${inputHash}\n${ENGINE_VERSION}`;
  const hit = ranked.get(key);
  if (hit) return hit;
  const [row] = await db.select({ id: caseResults.id, rootLoads: caseResults.rootLoads }).from(caseResults).where(storedResultOf(caseId, inputHash)).orderBy(desc(caseResults.computedAt)).limit(1);
  if (!row) return null;
  let loads = row.rootLoads as unknown as RankedRootLoads | null;
  if (!loads) {
    const stored = await storedResult(caseId, inputHash);
    if (!stored) return null;
    loads = rankedRootLoads(stored.result);
    await db.update(caseResults).set({ rootLoads: loads as unknown as Record<string, unknown> }).where(eq(caseResults.id, row.id));
  }
  ranked.set(key, loads);
  return loads;
}

/** One case of the stored result for this input hash, whole (PostgreSQL picks it out), or null when it has none of that id. */
async function storedResultCase(caseId: string, inputHash: string, id: string): Promise<ResultCase | null> {
  const [row] = await db
    .select({ c: sql<ResultCase | null>`jsonb_path_query_first(${caseResults.result}, '$.cases[*] ? (@.id == $id)', jsonb_build_object('id', ${id}::text))` })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  return row?.c ?? null;
}

/** The loads page's view of a case's current results, or how far their computation has got. */
export async function loadsView(caseId: string, title: string, actorId: string, requested: string | null): Promise<LoadsViewAnswer> {
  const known = await storedInputKey(caseId, title, "final");
  let inputHash = known?.inputHash ?? "";
  let loads = known ? await storedRootLoads(caseId, known.inputHash) : null;
  if (!loads) {
    const answer = await currentResultsOrQueue(caseId, title, actorId);
    if (answer.pending) return { pending: true, cases: answer.cases, progress: answer.progress };
    inputHash = answer.inputHash;
    loads = (await storedRootLoads(caseId, inputHash)) ?? rankedRootLoads(answer.result);
  }
  // The critical case is kept whole with the ranked rows; another is picked out of the stored result.
  const current = (requested && requested !== loads.critical.id ? await storedResultCase(caseId, inputHash, requested) : null) ?? loads.critical;
  const { cases, envelope } = loads;
  const listed = new Set([...cases.map((c) => c.id), ...envelope.flatMap((row) => Object.entries(row).filter(([k, v]) => k.endsWith("Case") && typeof v === "string").map(([, v]) => v as string))]);
  // The steps as stored (not the case file built from them) and, of the stored input, the cases shown.
  const inputs = await fromCurrentSteps("case-inputs", caseId, title, (i) => i);
  let info = listedInfo.get(inputs);
  if (!info || !listed.has(current.id)) {
    const parsed = (await storedInputWith(caseId, inputHash, [...listed, current.id]))?.file;
    // Stored in the same row as the ranked root loads just read.
    if (!parsed) throw new Error(`The stored result ${inputHash} of case ${caseId} has no input.`);
    if (!info) listedInfo.set(inputs, (info = loadsPageInfo(parsed, inputs, listed)));
    if (!listed.has(current.id)) {
      const own = loadsPageInfo(parsed, inputs, new Set([current.id]));
      info = { cases: { ...info.cases, ...own.cases }, balance: [...info.balance, ...own.balance] };
    }
  }
  return { pending: false, engine: loads.engine, inputHash, caseCount: loads.caseCount, envelope, cases, current, info };
}
