import type { CompressibilityRule } from "./compressibility";
import { ruleDenominator } from "./compressibility";
import type { SectionAt } from "./planform";
import { sectionAt } from "./planform";
import { DEG, sectionRuleScaling } from "./spanwise";
import type { MachSolution, SolveOptions, WingModel } from "./superposition";
import { solveMach, stallOf, uncheckedMachWarning } from "./superposition";

/** How the Mach grid is built (defaults in MACH_GRID_DEFAULTS). */
export interface MachGridOptions {
  /** Largest interpolation error accepted, as a fraction of the loads at CL = 1 (see solutionDifference). */
  tolerance?: number;
  /** Intervals in β of the first grid, before refinement. */
  initialIntervals?: number;
  /** Narrowest interval in β: where the tolerance is not met there, the Mach numbers inside are solved directly. */
  minWidth?: number;
}

export const MACH_GRID_DEFAULTS = { tolerance: 1e-4, initialIntervals: 6, minWidth: 2e-3 } as const;

/** Solutions of one wing at any Mach number of a range, from a grid of solves and interpolation. */
export interface MachGrid {
  /** Mach numbers solved as grid nodes, ascending. */
  nodes: number[];
  /** Largest difference between the interpolated and a direct solve, checked in the middle of every interval. */
  maxError: number;
  /** Mach ranges where interpolation did not meet the tolerance: Mach numbers inside are solved directly. */
  directRanges: [number, number][];
  /** Spanwise solves made so far (grid nodes, interval checks and direct solves). */
  solves(): number;
  /** The solution at a Mach number of the range. */
  solutionAt(mach: number): MachSolution;
}

const betaOf = (m: number) => Math.sqrt(1 - m * m);
const machOf = (b: number) => Math.sqrt(Math.max(0, 1 - b * b));

function maxAbs(a: readonly number[]): number {
  let m = 0;
  for (const v of a) m = Math.max(m, Math.abs(v));
  return m;
}

function maxAbsDiff(a: readonly number[], b: readonly number[]): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/**
 * How far two solutions of the same wing at the same Mach number differ, as a fraction of the loads at
 * CL = 1: the relative change of CLα; the zero-lift angle as the CL it shifts; the basic and additional
 * loadings relative to the peak additional loading; and the basic and additional shear, bending and
 * torsion relative to the larger of their peaks.
 */
export function solutionDifference(exact: MachSolution, other: MachSolution): number {
  const d: number[] = [
    Math.abs(other.clAlphaPerRad / exact.clAlphaPerRad - 1),
    Math.abs((other.alphaZeroLiftDeg - exact.alphaZeroLiftDeg) * DEG * exact.clAlphaPerRad),
  ];
  const peak = maxAbs(exact.cclAdditional);
  d.push(maxAbsDiff(exact.cclAdditional, other.cclAdditional) / peak, maxAbsDiff(exact.cclBasic, other.cclBasic) / peak);
  for (const k of ["shear", "bending", "torsion"] as const) {
    const scale = Math.max(maxAbs(exact.additionalPerQ[k]), maxAbs(exact.basicPerQ[k]));
    if (scale === 0) continue;
    d.push(maxAbsDiff(exact.additionalPerQ[k], other.additionalPerQ[k]) / scale, maxAbsDiff(exact.basicPerQ[k], other.basicPerQ[k]) / scale);
  }
  return Math.max(...d);
}

/** Lagrange weights at x for the nodes xs. */
function lagrangeWeights(xs: readonly number[], x: number): number[] {
  return xs.map((xi, i) => {
    let w = 1;
    xs.forEach((xj, j) => {
      if (j !== i) w *= (x - xj) / (xi - xj);
    });
    return w;
  });
}

/** Weighted sum of the same-shaped values; values that are equal at every node are copied as they are. */
function combine(values: unknown[], w: number[]): unknown {
  const first = values[0];
  if (typeof first === "number") {
    if (values.every((v) => v === first)) return first;
    let s = 0;
    for (let i = 0; i < values.length; i++) s += w[i] * (values[i] as number);
    return s;
  }
  if (Array.isArray(first)) {
    // Arrays of numbers (every distribution) in one loop, without an array per element: a sweep of
    // 100 000 distinct Mach numbers interpolates them once per case.
    const arrays = values as unknown[][];
    const out = new Array(first.length);
    for (let k = 0; k < first.length; k++) {
      const v0 = first[k];
      let same = true;
      for (let i = 1; i < arrays.length; i++) if (arrays[i][k] !== v0) same = false;
      if (same) out[k] = v0;
      else if (typeof v0 === "number") {
        let s = 0;
        for (let i = 0; i < arrays.length; i++) s += w[i] * (arrays[i][k] as number);
        out[k] = s;
      } else out[k] = combine(arrays.map((a) => a[k]), w);
    }
    return out;
  }
  if (first !== null && typeof first === "object") {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(first)) out[key] = combine(values.map((v) => (v as Record<string, unknown>)[key]), w);
    return out;
  }
  return first;
}

/** Deep equality of plain data (numbers, strings, null, arrays, objects). */
function sameData(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a)) return Array.isArray(b) && a.length === b.length && a.every((v, i) => sameData(v, b[i]));
  if (a !== null && b !== null && typeof a === "object" && typeof b === "object") {
    const ka = Object.keys(a);
    return ka.length === Object.keys(b).length && ka.every((k) => sameData((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
  }
  return false;
}

/**
 * The lowest Mach number at which the rule becomes singular at some section's working Cp (so its
 * scaling falls back to Prandtl–Glauert there, a jump no interpolation may cross); 1 where never.
 */
function singularMach(model: WingModel, rule: CompressibilityRule): number {
  if (rule === "prandtl-glauert") return 1;
  let lowest = 1;
  // The single cpMin scales the section; where chordwise pressures are given, each of their points does.
  const peaks = model.stations.flatMap((st) => [
    ...(st.cpMin !== undefined ? [st.cpMin] : []),
    ...(st.pressures ? [Math.min(...st.pressures.flatMap((p) => [...p.cpUpper, ...p.cpLower]))] : []),
  ]);
  for (const cp of peaks) {
    let lo = 0;
    let hi = 1 - 1e-12;
    if (!(cp < 0) || ruleDenominator(rule, cp, hi) > 0) continue;
    for (let k = 0; k < 80; k++) {
      const mid = 0.5 * (lo + hi);
      if (ruleDenominator(rule, cp, mid) > 0) lo = mid;
      else hi = mid;
    }
    lowest = Math.min(lowest, lo);
  }
  return lowest;
}

/**
 * Solve a wing over a range of Mach numbers on a grid and interpolate between (for sweeps of many
 * distinct Mach numbers). The basic and additional distributions and their unit loads depend smoothly
 * on Mach below the critical Mach number; nodes are spaced evenly in β = √(1 − M²), which follows their
 * growth towards M = 1, and each Mach number is interpolated by the cubic through the four nearest
 * nodes. Every interval is then checked in its middle against a direct solve; where the difference
 * exceeds the tolerance the interval is halved, down to `minWidth`, below which the Mach numbers inside
 * are solved directly. The largest difference found is the stated interpolation error. Quantities
 * exact at any Mach (β, the rule's section scaling and cm, the stall angle from the interpolated
 * distributions, the Mach-dependent warnings) are computed, not interpolated. At and above the Mach
 * number where the rule becomes singular at a section, every Mach number is solved directly.
 */
export function buildMachGrid(model: WingModel, opts: SolveOptions, machMin: number, machMax: number, gridOptions: MachGridOptions = {}): MachGrid {
  const steps = machGridSteps(model, opts, machMin, machMax, gridOptions);
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
  }
}

/**
 * buildMachGrid one spanwise solve at a time: yields the count of solves made after each, and returns the
 * grid. A caller that must stay responsive (a job reporting its progress) can pause between solves.
 */
export function* machGridSteps(model: WingModel, opts: SolveOptions, machMin: number, machMax: number, gridOptions: MachGridOptions = {}): Generator<number, MachGrid> {
  const tol = gridOptions.tolerance ?? MACH_GRID_DEFAULTS.tolerance;
  const minWidth = gridOptions.minWidth ?? MACH_GRID_DEFAULTS.minWidth;
  const n0 = gridOptions.initialIntervals ?? MACH_GRID_DEFAULTS.initialIntervals;
  let count = 0;
  const solve = (m: number) => {
    const s = solveMach(model, m, opts);
    count++;
    return s;
  };
  const singular = singularMach(model, opts.rule);
  const top = Math.min(machMax, singular);
  const directRanges: [number, number][] = singular <= machMax ? [[Math.max(machMin, singular), machMax]] : [];
  // Nodes by β, descending β = ascending Mach. A degenerate range is a single node.
  const bHi = betaOf(machMin);
  const bLo = betaOf(Math.max(machMin, top));
  const nodes = new Map<number, MachSolution>();
  // The end nodes are solved at the range's own Mach numbers, so cases there match them exactly.
  nodes.set(bHi, solve(machMin));
  yield count;
  if (bHi > bLo) {
    for (let i = 1; i < n0; i++) {
      const b = bHi - ((bHi - bLo) * i) / n0;
      nodes.set(b, solve(machOf(b)));
      yield count;
    }
    nodes.set(bLo, solve(Math.max(machMin, top)));
    yield count;
  }
  const sortedBetas = () => [...nodes.keys()].sort((a, b) => b - a);
  // The section data at the output stations do not depend on Mach: found once, scaled per Mach number.
  const first = nodes.get(bHi)!;
  const sections = first.y.map((y) => sectionAt(model.stations, y));
  // Fields equal at every node (geometry, mass loads, section data) are shared, not interpolated.
  let varying: (keyof MachSolution)[] = [];
  let varyingOf = -1;
  const interpolate = (betas: number[], b: number, mach: number): MachSolution => {
    if (varyingOf !== nodes.size) {
      const all = [...nodes.values()];
      varying = (Object.keys(first) as (keyof MachSolution)[]).filter((k) => !EXACT_AT_ANY_MACH.has(k) && all.some((s) => !sameData(s[k], first[k])));
      varyingOf = nodes.size;
    }
    // The four nearest nodes around b (fewer where the grid is smaller).
    let i = 0;
    while (i < betas.length - 2 && betas[i + 1] > b) i++;
    const lo = Math.max(0, Math.min(i - 1, betas.length - 4));
    const stencil = betas.slice(lo, lo + 4);
    const w = lagrangeWeights(stencil, b);
    const sols = stencil.map((x) => nodes.get(x)!);
    const out: Record<string, unknown> = { ...first };
    for (const k of varying) out[k] = combine(sols.map((s) => s[k]), w);
    return exactAt(model, opts.rule, out as unknown as MachSolution, mach, sections);
  };
  // Refine until every interval's midpoint agrees with a direct solve, or the interval is too narrow.
  const mids = new Map<number, MachSolution>();
  const narrow: [number, number][] = [];
  let maxError = 0;
  for (let pass = 0; pass < 40; pass++) {
    const betas = sortedBetas();
    let refined = false;
    maxError = 0;
    narrow.length = 0;
    for (let i = 0; i + 1 < betas.length; i++) {
      const bm = 0.5 * (betas[i] + betas[i + 1]);
      let exact = mids.get(bm);
      if (!exact) {
        exact = solve(machOf(bm));
        mids.set(bm, exact);
        yield count;
      }
      const err = solutionDifference(exact, interpolate(betas, bm, exact.mach));
      // Accept at half the tolerance in the middle, where a cubic's error is largest for smooth data,
      // so that the error elsewhere in the interval stays inside the tolerance too.
      if (err <= tol / 2) {
        maxError = Math.max(maxError, err);
      } else if (betas[i] - betas[i + 1] > 2 * minWidth) {
        nodes.set(bm, exact);
        refined = true;
      } else {
        narrow.push([machOf(betas[i]), machOf(betas[i + 1])]);
      }
    }
    if (!refined) break;
  }
  directRanges.push(...narrow);
  const betas = sortedBetas();
  const direct = new Map<number, MachSolution>();
  return {
    nodes: betas.map((b) => nodes.get(b)!.mach),
    maxError,
    directRanges,
    solves: () => count,
    solutionAt(mach: number): MachSolution {
      const b = betaOf(mach);
      const node = nodes.get(b);
      if (node) return node.mach === mach ? node : { ...node, mach };
      if (mach < machMin || mach > machMax || directRanges.some(([a, z]) => mach >= a && mach <= z) || betas.length < 2) {
        let s = direct.get(mach);
        if (!s) {
          s = solve(mach);
          direct.set(mach, s);
        }
        return s;
      }
      return interpolate(betas, b, mach);
    },
  };
}

/** The fields exactAt computes at the case's own Mach number (never interpolated). */
const EXACT_AT_ANY_MACH = new Set<keyof MachSolution>(["mach", "beta", "scale", "sectionScaling", "cm", "stall", "warnings"]);

/** Put back what is exact at any Mach number into an interpolated solution (`sections`: the section data at its stations). */
function exactAt(model: WingModel, rule: CompressibilityRule, sol: MachSolution, mach: number, sections: readonly SectionAt[]): MachSolution {
  const secs = sections.map((s) => sectionRuleScaling(model.stations, s, rule, mach));
  const out: MachSolution = {
    ...sol,
    mach,
    beta: betaOf(mach),
    scale: secs.map((s) => s.scale),
    sectionScaling: secs.map((s) => s.scaling),
    cm: secs.map((s) => s.cm),
  };
  out.stall = stallOf(out);
  const unchecked = uncheckedMachWarning(out.y, out.cpMinSource, mach);
  out.warnings = unchecked ? [...sol.wingWarnings, unchecked] : [...sol.wingWarnings];
  return out;
}
