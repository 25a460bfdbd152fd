import { and, desc, eq, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { db } from "~/db/client.server";
import { caseResults, resultCases } from "~/db/schema";
import { rankedRootLoads, type RankedRootLoads, type RootLoadsRow, type SweepProgressView } from "~/domain/results";
import type { CaseResult, ResultCase } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { STEP_KEYS } from "~/domain/vocabulary";
import { currentResultsOrQueue, storedInputKey, storedInputWith, storedResult, storedResultOf } from "./analysis.server";
import { envelopeCasesWith, getCaseStepsDigest, getCaseStepsDigested, stepData } from "./case-steps.server";
import { effectiveMasses } from "./masses.server";
import { loadsPageInfo, type LoadsPageInfo } from "./case-loads.server";

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

// Mass case, kind and balance of the cases every view of one result lists (balancing solves the wing
// at their Mach numbers), by case, result (input hash: the cases listed and their stored input) and
// the digests of the steps they read besides (masses and loads; the envelope's rows of those cases),
// so anything written to those steps gives a new key.
const listedInfo = new LRUCache<string, LoadsPageInfo>({ max: 64 });
const NOT_MASSES = STEP_KEYS.filter((k) => k !== "masses" && k !== "loads");
const NOT_ENVELOPE = STEP_KEYS.filter((k) => k !== "envelope");

/** Tests only: forget the ranked root loads and the listed cases' facts, as a web process that has read none yet. */
export function forgetLoadsViewForTests(): void {
  ranked.clear();
  listedInfo.clear();
}

/**
 * Mass case, kind and balance of the listed cases and of the current one: the masses in effect, the
 * envelope's rows of only those cases and their stored input (both picked out by PostgreSQL), so a
 * large envelope is neither received nor checked.
 */
async function listedCasesInfo(caseId: string, inputHash: string, listed: ReadonlySet<string>, current: string): Promise<LoadsPageInfo> {
  const key = (masses: string, envelope: string) => `${caseId}\n${inputHash}\n${masses}\n${envelope}`;
  const [massesDigest, envelopeDigest] = await Promise.all([getCaseStepsDigest(caseId, NOT_MASSES), getCaseStepsDigest(caseId, NOT_ENVELOPE)]);
  let info = listedInfo.get(key(massesDigest, envelopeDigest));
  if (info && listed.has(current)) return info;
  const ids = info ? [current] : [...listed, current];
  const [{ steps, digest }, envelope, stored] = await Promise.all([getCaseStepsDigested(caseId, NOT_MASSES), envelopeCasesWith(caseId, ids), storedInputWith(caseId, inputHash, ids)]);
  // Stored in the same row as the ranked root loads just read.
  if (!stored) throw new Error(`The stored result ${inputHash} of case ${caseId} has no input.`);
  const masses = effectiveMasses({ masses: stepData(steps, "masses"), loads: stepData(steps, "loads") });
  if (!info) listedInfo.set(key(digest, envelope.digest), (info = loadsPageInfo(stored.file, envelope.cases, masses, listed)));
  if (listed.has(current)) return info;
  const own = loadsPageInfo(stored.file, envelope.cases, masses, new Set([current]));
  return { cases: { ...info.cases, ...own.cases }, balance: [...info.balance, ...own.balance] };
}

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
  // Kept by key as the result was stored (result_cases); a result stored before has PostgreSQL look through it.
  const [kept] = await db
    .select({ kept: sql<boolean>`${caseResults.inputHead} is not null`, c: resultCases.result })
    .from(caseResults)
    .leftJoin(resultCases, and(eq(resultCases.resultId, caseResults.id), eq(resultCases.loadCase, id)))
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  if (!kept) return null;
  if (kept.kept) return (kept.c as ResultCase | null) ?? null;
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
  const { cases, envelope, critical } = loads;
  const listed = new Set([...cases.map((c) => c.id), ...envelope.flatMap((row) => Object.entries(row).filter(([k, v]) => k.endsWith("Case") && typeof v === "string").map(([, v]) => v as string))]);
  // The critical case is kept whole with the ranked rows; another is picked out of the stored result
  // while its facts are read (an id the result does not have gets none, and the critical case instead).
  const wanted = requested || critical.id;
  const [found, info] = await Promise.all([wanted === critical.id ? critical : storedResultCase(caseId, inputHash, wanted), listedCasesInfo(caseId, inputHash, listed, wanted)]);
  const current = found ?? critical;
  return { pending: false, engine: loads.engine, inputHash, caseCount: loads.caseCount, envelope, cases, current, info };
}
