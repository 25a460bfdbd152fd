import { LRUCache } from "lru-cache";
import { criticalCase, type SweepProgressView } from "~/domain/results";
import type { CaseResult, ResultCase } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { currentResultsOrQueue, fromCurrentSteps, storedInputKey, storedInputWith, type CaseInputs } from "./analysis.server";
import { loadsPageInfo, type LoadsPageInfo } from "./case-loads.server";

/** Root-load rows the loads page gets at most: every case of a small file, the most critical of a large one. */
export const MAX_ROOT_ROWS = 500;

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
  cases: Omit<ResultCase, "stations">[];
  /** The case asked for (or the critical one), with its stations where the result keeps them. */
  current: ResultCase;
  /** Mass case, kind and balance of the cases above (and those the envelope names), not of every case. */
  info: LoadsPageInfo;
}

export type LoadsViewAnswer = { pending: true; cases: number; progress: SweepProgressView | null } | ({ pending: false } & LoadsView);

// Root loads sorted once per result (a result is fixed by its input hash and the engine version,
// so an entry is never stale); a few large results at most are kept.
const ranked = new LRUCache<string, { result: CaseResult; order: Omit<ResultCase, "stations">[] }>({ max: 4 });

// Mass case, kind and balance of the cases every view of one result lists (balancing solves the wing
// at their Mach numbers), kept per content of the steps: `inputs` is the object fromCurrentSteps hands
// out for exactly that content (the result, hence the listed cases, follow from it), so anything
// written to a step gives a new one and the entry goes with the old.
const listedInfo = new WeakMap<CaseInputs, LoadsPageInfo>();

/** The loads page's view of a case's current results, or how far their computation has got. */
export async function loadsView(caseId: string, title: string, actorId: string, requested: string | null): Promise<LoadsViewAnswer> {
  const rankedKey = (inputHash: string) => `${caseId}:${inputHash}:${ENGINE_VERSION}`;
  const known = await storedInputKey(caseId, title, "final");
  let inputHash = known?.inputHash ?? "";
  let entry = known ? ranked.get(rankedKey(known.inputHash)) : undefined;
  if (!entry) {
    const answer = await currentResultsOrQueue(caseId, title, actorId);
    if (answer.pending) return { pending: true, cases: answer.cases, progress: answer.progress };
    inputHash = answer.inputHash;
    // Root loads only: a rolling case's other side keeps its root, not its stations.
    const order = answer.result.cases.map(({ stations: _stations, ...root }) => (root.roll ? { ...root, roll: { ...root.roll, other: { root: root.roll.other.root } } } : root)).sort((a, b) => Math.abs(b.root.bending) - Math.abs(a.root.bending));
    entry = { result: answer.result, order };
    ranked.set(rankedKey(inputHash), entry);
  }
  const all = entry.result.cases;
  const current = (requested ? all.find((c) => c.id === requested) : undefined) ?? criticalCase(all);
  const cases = mostCritical(entry.order, MAX_ROOT_ROWS);
  const envelope = entry.result.envelope;
  const listed = new Set([...cases.map((c) => c.id), ...envelope.flatMap((row) => Object.entries(row).filter(([k, v]) => k.endsWith("Case") && typeof v === "string").map(([, v]) => v as string))]);
  // The steps as stored (not the case file built from them) and, of the stored input, the cases shown.
  const inputs = await fromCurrentSteps("case-inputs", caseId, title, (i) => i);
  let info = listedInfo.get(inputs);
  if (!info || !listed.has(current.id)) {
    const parsed = (await storedInputWith(caseId, inputHash, [...listed, current.id]))?.file;
    // Stored in the same row as the result just read.
    if (!parsed) throw new Error(`The stored result ${inputHash} of case ${caseId} has no input.`);
    if (!info) listedInfo.set(inputs, (info = loadsPageInfo(parsed, inputs, listed)));
    if (!listed.has(current.id)) {
      const own = loadsPageInfo(parsed, inputs, new Set([current.id]));
      info = { cases: { ...info.cases, ...own.cases }, balance: [...info.balance, ...own.balance] };
    }
  }
  return { pending: false, engine: entry.result.engine, inputHash, caseCount: all.length, envelope, cases, current, info };
}

/**
 * Up to `limit` cases: every case giving an extreme of root shear, bending or torsion first, then
 * the rest by |root bending|; in |root bending| order.
 */
function mostCritical(order: Omit<ResultCase, "stations">[], limit: number) {
  if (order.length <= limit) return order;
  const extremes = new Set<Omit<ResultCase, "stations">>();
  for (const q of ["shear", "bending", "torsion"] as const) {
    extremes.add(order.reduce((a, b) => (b.root[q] > a.root[q] ? b : a)));
    extremes.add(order.reduce((a, b) => (b.root[q] < a.root[q] ? b : a)));
  }
  const picked = new Set(extremes);
  for (const c of order) {
    if (picked.size >= limit) break;
    picked.add(c);
  }
  return order.filter((c) => picked.has(c));
}
