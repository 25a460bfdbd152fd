import type { CompressibilityRule, EnvelopeRow, SpanwiseMethod } from "~/engine";
import { sweepProgressText, type SweepProgressView } from "./results";
import { formatDecimal } from "./units";

/*
 * What the distribution page and the report compare beside the case's own results: the critical
 * cases under each compressibility rule, and one case by each spanwise method. Plain JSON, so a
 * report can freeze them in its snapshot and a re-run can compare them number by number.
 */

/** Shear (N), bending and torsion (N·m) at the root of one semispan. */
export interface RootLoads {
  shear: number;
  bending: number;
  torsion: number;
}

export const ROOT_LOADS = ["shear", "bending", "torsion"] as const;

/** A case that gives one or more of the six root extremes of the envelope, and which. */
export interface CriticalCase {
  id: string;
  /** "max bending", "min torsion", … */
  gives: string[];
}

/**
 * The critical cases at the root: those giving the largest and smallest root shear, bending and
 * torsion of the envelope, each once with every extreme it gives, in the order max/min shear,
 * bending, torsion.
 */
export function rootCriticalCases(root: EnvelopeRow | undefined): CriticalCase[] {
  if (!root) return [];
  const out: CriticalCase[] = [];
  for (const q of ROOT_LOADS) {
    for (const side of ["Max", "Min"] as const) {
      const id = root[`${q}${side}Case`];
      if (!id) continue;
      const label = `${side.toLowerCase()} ${q}`;
      const hit = out.find((c) => c.id === id);
      if (hit) hit.gives.push(label);
      else out.push({ id, gives: [label] });
    }
  }
  return out;
}

/** The three root loads of one critical case under each compressibility rule, and their spread. */
export interface RuleSensitivityCase extends CriticalCase {
  mach: number;
  altitude: number;
  rules: { rule: CompressibilityRule; root: RootLoads; machCritical: number | null; regime: string }[];
  /** Largest minus smallest value over the three rules. */
  spread: RootLoads;
  /** The spread as a fraction of the largest magnitude over the three rules (0 where all are 0). */
  relative: RootLoads;
}

export interface RuleSensitivity {
  /** The rule the case's own results use. */
  chosen: CompressibilityRule;
  cases: RuleSensitivityCase[];
  /** How the numbers were computed, in words (shown under the table). */
  basis: string;
}

/** Spread of one quantity over several values: largest minus smallest, and relative to the largest magnitude. */
export function spreadOf(values: number[]): { spread: number; relative: number } {
  const spread = Math.max(...values) - Math.min(...values);
  const scale = Math.max(...values.map(Math.abs));
  return { spread, relative: scale > 0 ? spread / scale : 0 };
}

/** The ways the spanwise loading of one case is obtained in the comparison. */
export type SpanwiseWay = SpanwiseMethod | "schrenk";

export const SPANWISE_WAY_LABELS: Record<SpanwiseWay, string> = {
  "vortex-lattice": "Vortex lattice",
  "lifting-line": "Lifting line",
  schrenk: "Schrenk approximation",
};

/** One way's loading of the case, or why it is not shown. */
export type SpanwiseWayResult =
  | { way: SpanwiseWay; valid: true; CL: number; y: number[]; lift: number[]; root: RootLoads }
  | { way: SpanwiseWay; valid: false; reason: string };

/** One case by the vortex lattice, the lifting line and Schrenk's approximation, where each is valid. */
export interface SpanwiseComparison {
  caseId: string;
  mach: number;
  altitude: number;
  /** The spanwise method the case's own results use; differences are taken from it. */
  chosen: SpanwiseMethod;
  ways: SpanwiseWayResult[];
}

/**
 * A difference printed to the same last digit as the value it is a difference of (`reference`,
 * printed with `sig` significant figures), with its sign: "+0.224", "−1.3", "0". Differences below
 * that digit print as 0, so round-off never shows as "-0" or "1.4e-15".
 */
export function formatChange(change: number, reference: number, sig = 5): string {
  const magnitude = Math.abs(reference) > 0 ? Math.floor(Math.log10(Math.abs(reference))) : 0;
  const decimals = Math.min(6, Math.max(0, sig - 1 - magnitude));
  const rounded = Number(change.toFixed(decimals));
  if (rounded === 0) return "0";
  const text = formatDecimal(Math.abs(rounded), decimals, decimals);
  return `${rounded > 0 ? "+" : "−"}${text}`;
}

/** A fraction as a percentage with two decimals, "0 %" when it rounds to nothing: "0.07 %", "−1.25 %". */
export function formatPercent(fraction: number): string {
  const p = Number((fraction * 100).toFixed(2));
  if (p === 0) return "0 %";
  return `${p < 0 ? "−" : ""}${Math.abs(p).toFixed(2)} %`;
}

/** How far the job worker has got with a rule sensitivity: its phase, the critical cases solved under each rule (of all), and the case's own sweep while that runs. */
export interface SensitivityProgress {
  phase: "queued" | "results" | "solving";
  done: number;
  total: number;
  sweep: SweepProgressView | null;
}

/** The progress of a rule sensitivity in words, as the distribution page shows it while the worker runs. */
export function sensitivityProgressText(p: SensitivityProgress): string {
  const head = "Solving the critical cases under each rule";
  if (p.phase === "queued") return `${head}: waiting for a background worker.`;
  if (p.phase === "results") return `${head}: the case's own results come first.${p.sweep ? ` ${sweepProgressText(p.sweep, p.sweep.casesTotal)}` : ""}`;
  return `${head}: ${p.done} of ${p.total} done.`;
}
