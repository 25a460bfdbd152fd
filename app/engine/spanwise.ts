import type { CompressibilityRule } from "./compressibility";
import { criticalMach, prandtlGlauertBeta, sectionScaleFactor } from "./compressibility";
import type { DenseSolver } from "./linear-solve";
import type { PointByPointScaling } from "./section-data";
import { pointByPointScaling, scaledCmAc } from "./section-data";
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

/** How a station's section data were made compressible. */
export type SectionScaling = "prandtl-glauert" | "at-cp-min" | "point-by-point";

/** Section values at a solver point, with the rule-scaled (compressible) slope, zero-lift angle and cm. */
export interface CompressibleSection extends SectionAt {
  /** k: factor the rule applies to a0 at this Mach number. */
  scale: number;
  /** Section slope at the Mach number, per rad (k·a0). */
  a: number;
  /** Compressible moment coefficient about the aerodynamic centre. */
  cm: number;
  /** True where KT/Laitone were singular at the section's working Cp (or at a pressure point), so PG was used there. */
  singular: boolean;
  /** Prandtl–Glauert's 1/β; the KT/Laitone ratio at the single cpMin; or the rule point by point over the pressures. */
  scaling: SectionScaling;
}

type Scaled = PointByPointScaling & { cm: number };
const scalingCache = new WeakMap<readonly WingStation[], Map<string, (Scaled | null)[]>>();

/** Point-by-point scaling of every station that gives pressures, at one rule and Mach number (memoised per station list). */
function stationScalings(stations: readonly WingStation[], rule: CompressibilityRule, mach: number): (Scaled | null)[] {
  let byKey = scalingCache.get(stations);
  if (!byKey) {
    byKey = new Map();
    scalingCache.set(stations, byKey);
  }
  const key = `${rule}@${mach}`;
  let list = byKey.get(key);
  if (!list) {
    // A sweep of many distinct Mach numbers would otherwise keep one entry for each.
    if (byKey.size >= 64) byKey.clear();
    list = stations.map((st) => {
      if (!st.pressures) return null;
      const s = pointByPointScaling(st.pressures, rule, mach);
      return { ...s, cm: scaledCmAc(st.cmAc, s) };
    });
    byKey.set(key, list);
  }
  return list;
}

/**
 * Section data at y, with the compressibility rule's scaling at the Mach number. Where both ends of
 * the panel (or the station itself) give chordwise pressures, the rule is applied point by point over
 * them (slope ratio, zero-lift angle shift and cm, linear between the ends); otherwise Prandtl–Glauert's
 * 1/β, or for Kármán–Tsien and Laitone their ratio at the section's single cpMin (docs/engine.md §2).
 */
export function compressibleSectionAt(
  stations: readonly WingStation[],
  y: number,
  rule: CompressibilityRule,
  mach: number,
): CompressibleSection {
  const s = sectionAt(stations, y);
  const r = sectionRuleScaling(stations, s, rule, mach);
  return { ...s, alphaL0: s.alphaL0 + r.alphaL0Shift, scale: r.scale, a: r.scale * s.a0, cm: r.cm, singular: r.singular, scaling: r.scaling };
}

/** What the rule changes in the section data `s` at its y (see compressibleSectionAt), without copying them. */
export interface SectionRuleScaling {
  scale: number;
  /** Added to αL0, deg (point by point only; 0 otherwise). */
  alphaL0Shift: number;
  cm: number;
  singular: boolean;
  scaling: SectionScaling;
}

/** The rule's scaling of the section data `s` (= sectionAt(stations, s.y)) at a Mach number: compressibleSectionAt's part that depends on Mach. */
export function sectionRuleScaling(stations: readonly WingStation[], s: SectionAt, rule: CompressibilityRule, mach: number): SectionRuleScaling {
  const y = s.y;
  if (stations.some((st) => st.pressures)) {
    const n = stations.length;
    let i = 0;
    if (y >= stations[n - 1].y) i = n - 2;
    else while (i < n - 2 && y > stations[i + 1].y) i++;
    const t = Math.min(1, Math.max(0, (y - stations[i].y) / (stations[i + 1].y - stations[i].y)));
    const sc = stationScalings(stations, rule, mach);
    const u = sc[i];
    const v = sc[i + 1];
    const mix = (f: (x: Scaled) => number) => (t === 0 && u ? f(u) : t === 1 && v ? f(v) : u && v ? f(u) + t * (f(v) - f(u)) : undefined);
    const k = mix((x) => x.slopeRatio);
    if (k !== undefined) {
      return {
        scale: k,
        alphaL0Shift: mix((x) => x.alphaL0Shift)!,
        cm: mix((x) => x.cm)!,
        singular: Boolean((t < 1 && u?.singular) || (t > 0 && v?.singular)),
        scaling: "point-by-point",
      };
    }
  }
  const { factor, singular } = sectionScaleFactor(rule, mach, s.cpMin);
  const scaling: SectionScaling = rule === "prandtl-glauert" || s.cpMin === undefined || singular ? "prandtl-glauert" : "at-cp-min";
  return { scale: factor, alphaL0Shift: 0, cm: factor * s.cmAc, singular, scaling };
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
