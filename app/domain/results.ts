import type { CaseResult, ResultCase, ResultMethod } from "~/exchange";
import { formatNumber } from "./units";

/**
 * The critical case of a result: the one whose root bending moment has the largest magnitude. The
 * loads page opens on it, and the report draws its distributions.
 */
export function criticalCase<C extends Pick<ResultCase, "root">>(cases: readonly C[]): C {
  return cases.reduce((a, b) => (Math.abs(b.root.bending) > Math.abs(a.root.bending) ? b : a));
}

/** How far a background sweep has got, as the results API answers it while the result is not stored yet. */
export interface SweepProgressView {
  phase: "queued" | "solving" | "cases" | "done" | "failed";
  solves: number;
  casesDone: number;
  casesTotal: number;
}

/** A count with its thousands spaced, as every number of the product: "100 000". */
const count = (n: number) => formatNumber(n, 15);

/** The progress of a background sweep in words (the API's message and the loads page's status line). */
export function sweepProgressText(p: SweepProgressView | null, cases: number): string {
  const all = `${count(cases)} load cases`;
  if (!p || p.phase === "queued") return `${all} wait for a background worker.`;
  if (p.phase === "solving") return `${all}: ${count(p.solves)} spanwise solve${p.solves === 1 ? "" : "s"} made so far.`;
  if (p.phase === "cases") return `${all}: spanwise solves done (${count(p.solves)}); ${count(p.casesDone)} of ${count(p.casesTotal)} cases evaluated.`;
  if (p.phase === "failed") return `${all}: the engine refused the case file.`;
  return `${all}: solved; storing the result.`;
}

/** The part of a background sweep done, 0 to 1, counting the cases (the solves come first and are counted as none). */
export function sweepFraction(p: SweepProgressView | null): number {
  if (!p || p.casesTotal <= 0) return 0;
  return p.phase === "done" ? 1 : p.phase === "cases" ? Math.min(1, p.casesDone / p.casesTotal) : 0;
}

/** Why a case is flagged on the distribution page: the engineer dispositions each flagged case. */
export const FLAG_REASONS = ["supercritical", "stall", "critical-mach-basis"] as const;
export type FlagReason = (typeof FLAG_REASONS)[number];

/** Each reason in a few words, for the summary by reason and its bulk disposition. */
export const FLAG_REASON_LABELS: Record<FlagReason, string> = {
  supercritical: "At or above the critical Mach number",
  stall: "cl over the section clmax",
  "critical-mach-basis": "Critical Mach number not reliable at the case's lift",
};

/** A station of a case whose section lift exceeds the section clmax (from the engine's warning). */
export interface StallHit {
  /** Spanwise station [m]. */
  y: number;
  cl: number;
  clMax: number;
}

/**
 * What a case's flag rests on, reduced from its result: above the critical Mach number, the stations
 * over clmax, a critical Mach number resting on one Cp,min taken at another lift. What a stored
 * result keeps of each flagged case (its warnings are kilobytes of words; these are numbers).
 */
export interface FlagFacts {
  id: string;
  mach: number;
  machCritical: number | null;
  supercritical: boolean;
  stall: StallHit[];
  doubt: boolean;
}

const CRITICAL_MACH_DOUBT = /^the critical Mach number rests on one cpMin per section/;
const STALL = /station y = ([\d.]+) m: cl ([\d.-]+) exceeds the section clMax ([\d.-]+)/;

/** The stations over clmax that a case's warnings name. */
export function stallHits(warnings: readonly string[]): StallHit[] {
  return warnings.map((w) => STALL.exec(w)).filter((m): m is RegExpExecArray => m !== null).map((m) => ({ y: Number(m[1]), cl: Number(m[2]), clMax: Number(m[3]) }));
}

/** A case's flag facts, or null when there is nothing to flag. */
export function flagFacts(c: Pick<ResultCase, "id" | "regime" | "mach" | "machCritical" | "warnings">): FlagFacts | null {
  const supercritical = c.regime === "supercritical";
  const stall = stallHits(c.warnings);
  const doubt = c.warnings.some((w) => CRITICAL_MACH_DOUBT.test(w));
  return supercritical || stall.length || doubt ? { id: c.id, mach: c.mach, machCritical: c.machCritical ?? null, supercritical, stall, doubt } : null;
}

/** The reasons a case is flagged for, in FLAG_REASONS order: what the summary counts and a bulk disposition selects. */
export function flagKinds(f: FlagFacts): FlagReason[] {
  return FLAG_REASONS.filter((r) => (r === "supercritical" ? f.supercritical : r === "stall" ? f.stall.length > 0 : f.doubt));
}

/** Flagged cases in all and for each reason (a case may be flagged for several). */
export type FlagCounts = { all: number } & Record<FlagReason, number>;

/**
 * What the distribution page reads of a stored result besides its flagged cases' rows (kept one
 * by one beside it): its method, its first case and how many cases are flagged, for each reason.
 */
export interface ResultSummary {
  method: ResultMethod;
  first: string;
  flagCounts: FlagCounts;
}

/** A result's flagged cases in order, and its summary: both kept beside it as it is stored. */
export function resultFlagIndex(result: Pick<CaseResult, "method" | "cases">): { summary: ResultSummary; flagged: FlagFacts[] } {
  const flagged = result.cases.map(flagFacts).filter((f): f is FlagFacts => f !== null);
  return { summary: summaryOfFlags(result.method, result.cases[0]?.id ?? "", flagged), flagged };
}

/** The summary of a result with these flagged cases. */
export function summaryOfFlags(method: ResultMethod, first: string, flagged: readonly FlagFacts[]): ResultSummary {
  const flagCounts: FlagCounts = { all: flagged.length, supercritical: 0, stall: 0, "critical-mach-basis": 0 };
  for (const f of flagged) for (const k of flagKinds(f)) flagCounts[k]++;
  return { method, first, flagCounts };
}

/** Root-load rows the loads page gets at most: every case of a small file, the most critical of a large one. */
export const MAX_ROOT_ROWS = 500;

/** A case's root loads without its stations: a rolling case's other side keeps its root, not its stations. */
export type RootLoadsRow = Omit<ResultCase, "stations">;

/**
 * What the loads page lists of a result, kept beside it as it is stored (case_results.root_loads), so
 * that no page reads the whole result (tens of MB for 100 000 cases) to rank its root loads.
 */
export interface RankedRootLoads {
  engine: string;
  caseCount: number;
  envelope: CaseResult["envelope"];
  /** At most MAX_ROOT_ROWS cases, root loads only: see rankedRootLoads. */
  cases: RootLoadsRow[];
  /** The critical case (criticalCase), whole: with its stations where the result keeps them. */
  critical: ResultCase;
}

/**
 * The root loads of a result ranked for the loads page: every case when there are at most `limit`,
 * else every case giving an extreme of root shear, bending or torsion and then the rest by |root
 * bending|; listed by |root bending|, largest first (ties in the result's order).
 */
export function rankedRootLoads(result: Pick<CaseResult, "engine" | "envelope" | "cases">, limit = MAX_ROOT_ROWS): RankedRootLoads {
  const order: RootLoadsRow[] = result.cases
    .map(({ stations: _stations, ...root }) => (root.roll ? { ...root, roll: { ...root.roll, other: { root: root.roll.other.root } } } : root))
    .sort((a, b) => Math.abs(b.root.bending) - Math.abs(a.root.bending));
  return { engine: result.engine, caseCount: result.cases.length, envelope: result.envelope, cases: mostCritical(order, limit), critical: criticalCase(result.cases) };
}

function mostCritical(order: RootLoadsRow[], limit: number): RootLoadsRow[] {
  if (order.length <= limit) return order;
  const extremes = new Set<RootLoadsRow>();
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
