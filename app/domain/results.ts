import type { ResultCase } from "~/exchange";
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
