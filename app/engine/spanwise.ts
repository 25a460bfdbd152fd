import type { CompressibilityRule } from "./compressibility";
import { criticalMach, prandtlGlauertBeta, sectionScaleFactor } from "./compressibility";
import type { DenseSolver } from "./linear-solve";
import type { SectionAt, WingStation } from "./planform";
import { sectionAt } from "./planform";

/** Which spanwise lift solver to use. */
export type SpanwiseMethod = "lifting-line" | "vortex-lattice";

/** Options shared by the spanwise solvers. */
export interface SpanwiseOptions {
  mach: number;
  rule: CompressibilityRule;
  /** Lifting line: number of odd Fourier terms; vortex lattice: number of spanwise strips per semispan. */
  resolution?: number;
  /** Vortex lattice only: spanwise strip spacing (default cosine, fine at the tip). */
  spacing?: "cosine" | "uniform";
  /** The dense linear solver (default `factorDense`); tests and benchmarks pass another to compare. */
  denseSolver?: (a: Float64Array, n: number) => DenseSolver;
}

/** Section values at a solver point, with the rule-scaled (compressible) slope. */
export interface CompressibleSection extends SectionAt {
  /** k: factor the rule applies to a0 and cmAc at this Mach number. */
  scale: number;
  /** Section slope at the Mach number, per rad (k·a0). */
  a: number;
  /** True where KT/Laitone were singular at the section's working Cp, so PG was used. */
  singular: boolean;
}

/** Section data at y, with the compressibility rule's scaling at the Mach number. */
export function compressibleSectionAt(
  stations: readonly WingStation[],
  y: number,
  rule: CompressibilityRule,
  mach: number,
): CompressibleSection {
  const s = sectionAt(stations, y);
  const { factor, singular } = sectionScaleFactor(rule, mach, s.cpMin);
  return { ...s, scale: factor, a: factor * s.a0, singular };
}

/** Critical Mach number of the section at y under a rule, or null where it gives no cpMin. */
export function sectionCriticalMach(stations: readonly WingStation[], y: number, rule: CompressibilityRule): number | null {
  const s = sectionAt(stations, y);
  return s.cpMin === undefined ? null : criticalMach(rule, s.cpMin);
}

/** The solution of one linear spanwise problem (one right-hand side). */
export interface SpanwiseResult {
  /** Wing lift coefficient from the solver's own force sum. */
  CL: number;
  /** Spanwise load c·cl (m) at a spanwise position 0 ≤ y ≤ s. */
  cclAt: (y: number) => number;
}

/**
 * A factored spanwise system at one Mach number: solve for any incidence distribution.
 * `rhs` gives the local effective angle (rad) the section sees: α_root + twist − αL0.
 */
export interface SpanwiseSystem {
  method: SpanwiseMethod;
  mach: number;
  beta: number;
  /** Planform breakpoints, so callers can refine integration grids there. */
  breakpoints: number[];
  solve(rhs: (s: SectionAt) => number): SpanwiseResult;
  solveMany(rhs: ((s: SectionAt) => number)[]): SpanwiseResult[];
}

export function checkMach(mach: number): number {
  return prandtlGlauertBeta(mach);
}

export const DEG = Math.PI / 180;
