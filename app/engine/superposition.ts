import { ISA } from "./atmosphere";
import type { CompressibilityRule } from "./compressibility";
import { criticalMach } from "./compressibility";
import { EngineError } from "./errors";
import { LIFTING_LINE_DEFAULT_TERMS, LIFTING_LINE_WARN_SWEEP_DEG, buildLiftingLine } from "./lifting-line";
import type { BeamLoads } from "./loads";
import { beamLoads, integrate, integrateProduct } from "./loads";
import type { ItemUnitLoads, MassItem } from "./mass";
import { itemUnitLoads, itemsMassKg, validateMassItems } from "./mass";
import type { WingGeometry, WingStation } from "./planform";
import { sectionAt, validateStations, wingGeometry } from "./planform";
import { PLAUSIBLE, wingPlausibility } from "./plausibility";
import type { CpMinPoint } from "./section-data";
import { cpMinAt } from "./section-data";
import type { SectionScaling, SpanwiseMethod, SpanwiseSystem } from "./spanwise";
import { DEG, compressibleSectionAt } from "./spanwise";
import { VORTEX_LATTICE_DEFAULT_STRIPS, buildVortexLattice } from "./vortex-lattice";

/** The wing as the engine sees it: planform + sections, torsion axis, semispan structural mass. */
export interface WingModel {
  stations: WingStation[];
  /** Straight reference axis as chord fractions at the root and tip stations (default 0.25/0.25). */
  axis?: { rootChordFraction: number; tipChordFraction: number };
  /** Structural mass of one semispan, kg, spread in proportion to chord and located on the reference axis. */
  massKg?: number;
  /** Point and spread masses of one semispan at full mass (scaled per case by its mass case). */
  massItems?: MassItem[];
}

/** How to solve the spanwise problem. */
export interface SolveOptions {
  spanwise: SpanwiseMethod;
  rule: CompressibilityRule;
  /** Output stations per semispan, cosine-spaced, the first at the root (y = 0). */
  stations: number;
  /** Solver resolution (Fourier terms or spanwise strips); solver default when absent. */
  resolution?: number;
  /** Integration nodes for the loads (default 400, full-cosine spaced, plus breakpoints and stations). */
  integrationPoints?: number;
}

/** Unit loads at the output stations: shear N, bending N·m, torsion N·m, per unit multiplier. */
export interface UnitLoads {
  shear: number[];
  bending: number[];
  torsion: number[];
}

/**
 * Everything about the wing at one Mach number that does not depend on the load case. The
 * distribution is linear in α, so per case: c·cl = cclBasic + CL·cclAdditional, loads =
 * q·(basic + CL·additional) − nz·mass.
 */
export interface MachSolution {
  mach: number;
  beta: number;
  rule: CompressibilityRule;
  spanwise: SpanwiseMethod;
  /** Wing lift slope, per rad, on the whole-wing area. */
  clAlphaPerRad: number;
  /** Root-chord angle of attack (deg) at which CL = 0. */
  alphaZeroLiftDeg: number;
  /** Lowest section critical Mach number over the span (by the rule), or null without cpMin. */
  machCritical: number | null;
  /** Every warning of this solution: the wing's own (below) and those of this Mach number (rule singular, critical Mach not checked). */
  warnings: string[];
  /** Warnings that do not depend on the Mach number (unusual input, sweep outside lifting-line validity). */
  wingWarnings: string[];
  /** Output stations, m. */
  y: number[];
  chord: number[];
  /** Basic loading c·cl (m) at CL = 0, from twist and αL0. */
  cclBasic: number[];
  /** Additional loading c·cl (m) per unit CL. */
  cclAdditional: number[];
  /** c·cl/(c̄·CL) of the additional loading, c̄ = S/b. */
  loadingRatio: number[];
  /** Section cm about the quarter chord at this Mach number (rule-scaled cmAc). */
  cm: number[];
  /** Rule factor applied to a0 at each station. */
  scale: number[];
  /** How each station's section data were made compressible (1/β, the ratio at the single cpMin, or point by point). */
  sectionScaling: SectionScaling[];
  clMax: (number | null)[];
  /** Critical Mach number per station from its single cpMin (null where it has none, or only a cpMin table). */
  stationMachCritical: (number | null)[];
  /**
   * Where each station's minimum Cp comes from: a table against lift (the critical Mach number then
   * follows each case's own lift), one value with the lift it belongs to (stated, or null: not stated),
   * or nothing.
   */
  cpMinSource: CpMinSource[];
  /** Root-chord α (deg) at which the first station reaches its section clMax (linear theory), and where; null without clMax. */
  stall: { alphaDeg: number; y: number } | null;
  /**
   * Simple sweep theory (Busemann): the section's critical Mach number divided by the cosine of the
   * local quarter-chord sweep, per station and its lowest over the span. Optimistic (it ignores the
   * tip and root and the flow along the span), so it is shown beside the conservative unswept value,
   * which alone decides the regime.
   */
  stationMachCriticalSwept: (number | null)[];
  machCriticalSwept: number | null;
  /** The straight reference axis the bending and torsion below are resolved about. */
  axis: ReferenceAxis;
  /**
   * Unit loads below are cut at streamwise stations and resolved about the reference axis:
   * torsion along the axis direction (nose up positive), bending about its in-plane normal.
   * Loads per unit dynamic pressure at CL = 0 (basic lift plus section moments), per Pa.
   */
  basicPerQ: UnitLoads;
  /** Loads per unit dynamic pressure and unit CL (additional lift), per Pa. */
  additionalPerQ: UnitLoads;
  /** Loads of the structural mass per unit load factor (its weight, upward positive). */
  massPerNz: UnitLoads;
  /** Loads of each mass item at full mass per unit load factor (its weight, upward positive). */
  itemsPerNz: ItemUnitLoads[];
  /** Whole-wing pitching-moment integrals for Cm about any point: see wingPitchingMoment. */
  moments: { cmTerm: number; basicX: number; additionalX: number };
  geometry: WingGeometry;
  /** Semispan mass at full fill: structure plus every item, kg. */
  massKg: number;
}

/** Where a station's incompressible minimum Cp comes from (see MachSolution.cpMinSource). */
export type CpMinSource = { kind: "table"; table: CpMinPoint[] } | { kind: "single"; cpMin: number; cl: number | null } | null;

/** The minimum-Cp data at y: a table where both panel ends (or the station itself) give one, else the single value. */
export function cpMinSourceAt(stations: readonly WingStation[], y: number): CpMinSource {
  const n = stations.length;
  let i = 0;
  if (y >= stations[n - 1].y) i = n - 2;
  else while (i < n - 2 && y > stations[i + 1].y) i++;
  const a = stations[i];
  const b = stations[i + 1];
  const t = Math.min(1, Math.max(0, (y - a.y) / (b.y - a.y)));
  if (t === 0 && a.cpMinTable) return { kind: "table", table: a.cpMinTable };
  if (t === 1 && b.cpMinTable) return { kind: "table", table: b.cpMinTable };
  if (a.cpMinTable && b.cpMinTable) {
    // Both ends' tables on the union of their lift points, blended linearly across the panel.
    const cls = [...new Set([...a.cpMinTable.map((p) => p.cl), ...b.cpMinTable.map((p) => p.cl)])].sort((u, v) => u - v);
    return { kind: "table", table: cls.map((cl) => ({ cl, cpMin: cpMinAt(a.cpMinTable!, cl).cpMin + t * (cpMinAt(b.cpMinTable!, cl).cpMin - cpMinAt(a.cpMinTable!, cl).cpMin) })) };
  }
  const s = sectionAt(stations, y);
  if (s.cpMin === undefined) return null;
  const cl = t === 0 ? a.cpMinCl : t === 1 ? b.cpMinCl : a.cpMinCl !== undefined && b.cpMinCl !== undefined ? a.cpMinCl + t * (b.cpMinCl - a.cpMinCl) : undefined;
  return { kind: "single", cpMin: s.cpMin, cl: cl ?? null };
}

/** Output station positions: y_i = s·cos(iπ/(2N)), i = N…1, so the root is the first and the last is just inboard of the tip. */
export function outputStations(semispan: number, count: number): number[] {
  const out: number[] = [];
  for (let i = count; i >= 1; i--) out.push(i === count ? 0 : semispan * Math.cos((i * Math.PI) / (2 * count)));
  return out;
}

/** Full-cosine points from root to tip with the given positions added exactly (duplicates merged). */
export function integrationGrid(semispan: number, extra: readonly number[], points: number): number[] {
  const raw: number[] = [];
  for (let k = 0; k <= points; k++) raw.push((semispan * (1 - Math.cos((k * Math.PI) / points))) / 2);
  raw.push(...extra);
  raw.sort((a, b) => a - b);
  const tol = 1e-9 * semispan;
  const out: number[] = [];
  for (const v of raw) {
    const c = Math.min(Math.max(v, 0), semispan);
    if (out.length === 0 || c - out[out.length - 1] > tol) out.push(c);
    else if (extra.includes(c)) out[out.length - 1] = c;
  }
  out[0] = 0;
  out[out.length - 1] = semispan;
  return out;
}

/** The straight reference axis: its points at the root and tip chords and its sweep. */
export interface ReferenceAxis {
  /** Streamwise position of the axis at the root (y = 0) and at the tip station, m. */
  rootX: number;
  tipX: number;
  /** Sweep of the axis, deg, aft positive: tan Λ = (tipX − rootX)/semispan. */
  sweepDeg: number;
  /** Components of the axis unit vector in the wing plane: (sin Λ, cos Λ) along (x aft, y outboard). */
  sin: number;
  cos: number;
}

/** The model's straight reference axis (chord fractions at root and tip, default 0.25/0.25). */
export function referenceAxis(model: WingModel): ReferenceAxis {
  const st = model.stations;
  const r = st[0];
  const t = st[st.length - 1];
  const rootX = r.xLe + (model.axis?.rootChordFraction ?? 0.25) * r.chord;
  const tipX = t.xLe + (model.axis?.tipChordFraction ?? 0.25) * t.chord;
  const len = Math.hypot(tipX - rootX, t.y);
  return { rootX, tipX, sweepDeg: (Math.atan2(tipX - rootX, t.y) * 180) / Math.PI, sin: (tipX - rootX) / len, cos: t.y / len };
}

/** x of the straight reference axis at y (m). */
export function referenceAxisX(model: WingModel, y: number): number {
  const a = referenceAxis(model);
  return a.rootX + ((a.tipX - a.rootX) * y) / model.stations[model.stations.length - 1].y;
}

/**
 * Resolve streamwise-cut loads about a swept reference axis (in place). On a streamwise cut at y
 * the outboard loads give, about the axis point P(y), a rolling moment Mx (the streamwise
 * `bending`, tip up positive, about the flight direction) and a pitching moment My (the streamwise
 * `torsion`, nose up positive, about the lateral line through P). With the axis unit vector
 * e = (sin Λ, cos Λ) in the wing plane (x aft, y outboard) and its in-plane normal n = (cos Λ, −sin Λ):
 * torsion = M·e = Mx sin Λ + My cos Λ, bending = M·n = Mx cos Λ − My sin Λ. Shear is normal to
 * the wing plane and unchanged. An unswept axis leaves the loads as they are.
 */
export function resolveAboutAxis(loads: { bending: number[] | Float64Array; torsion: number[] | Float64Array }, axis: Pick<ReferenceAxis, "sin" | "cos">): void {
  if (axis.sin === 0) return;
  for (let k = 0; k < loads.bending.length; k++) {
    const mx = loads.bending[k];
    const my = loads.torsion[k];
    loads.bending[k] = mx * axis.cos - my * axis.sin;
    loads.torsion[k] = mx * axis.sin + my * axis.cos;
  }
}

function buildSystem(stations: WingStation[], mach: number, opts: SolveOptions): SpanwiseSystem {
  const o = { mach, rule: opts.rule, resolution: opts.resolution };
  return opts.spanwise === "lifting-line" ? buildLiftingLine(stations, o) : buildVortexLattice(stations, o);
}

function pick(v: ArrayLike<number>, idx: number[]): number[] {
  return idx.map((i) => v[i]);
}

/** Loads at the output stations, resolved about the reference axis. */
function pickLoads(l: BeamLoads, idx: number[], axis: ReferenceAxis): UnitLoads {
  const out = { shear: pick(l.shear, idx), bending: pick(l.bending, idx), torsion: pick(l.torsion, idx) };
  resolveAboutAxis(out, axis);
  return out;
}

/**
 * Solve the wing once at a Mach number: basic and additional distributions, section data,
 * critical Mach numbers and unit loads at the output stations.
 * @throws EngineError for a bad planform, Mach ≥ 1 or bad options.
 */
export function solveMach(model: WingModel, mach: number, opts: SolveOptions): MachSolution {
  validateStations(model.stations);
  if (!Number.isInteger(opts.stations) || opts.stations < 2) {
    throw new EngineError("invalid-argument", "must be a whole number of at least 2", "method.stations");
  }
  const st = model.stations;
  const plausible = wingPlausibility(st);
  if (plausible.refusals.length) {
    const r = plausible.refusals[0];
    throw new EngineError(/\.(a0|alphaL0|cmAc|clMax|cpMin)$/.test(r.field) ? "invalid-section" : "invalid-planform", r.message, r.field);
  }
  const g = wingGeometry(st);
  const s = g.semispan;
  const sys = buildSystem(st, mach, opts);
  const warnings: string[] = [...plausible.warnings];
  if (opts.spanwise === "lifting-line") {
    const maxSweep = Math.max(...g.panels.map((p) => Math.abs(p.sweepQuarterChordDeg)));
    if (maxSweep > LIFTING_LINE_WARN_SWEEP_DEG) {
      warnings.push(
        `quarter-chord sweep reaches ${maxSweep.toFixed(1)}°: the lifting line does not model sweep and over-states the lift slope by about 1–2.5 % here; the vortex lattice is recommended`,
      );
    }
  }
  const wingWarnings = [...warnings];
  const [twist, unit] = sys.solveMany([(sec) => (sec.twist - sec.alphaL0) * DEG, () => 1]);
  const yOut = outputStations(s, opts.stations);
  const grid = integrationGrid(s, [...st.map((x) => x.y), ...yOut], opts.integrationPoints ?? 400);
  const idx = yOut.map((y) => grid.findIndex((v) => Math.abs(v - y) <= 1e-9 * s));
  const K = grid.length;
  const halfArea = g.area / 2;
  // Additional loading: the solver's shape scaled so its integral is exactly S/2 per unit CL
  // (equilibrium holds to round-off); basic loading: the α = 0 solution minus its CL share.
  const cu = grid.map((y) => unit.cclAt(y));
  const ct = grid.map((y) => twist.cclAt(y));
  const iu = integrate(grid, cu);
  const it = integrate(grid, ct);
  const ccla = cu.map((v) => (v * halfArea) / iu);
  const cclb = ct.map((v, k) => v - (it / halfArea) * ccla[k]);
  const clAlpha = unit.CL;
  const alphaZeroLiftDeg = -twist.CL / unit.CL / DEG;
  const secs = grid.map((y) => compressibleSectionAt(st, y, opts.rule, mach));
  const chord = secs.map((x) => x.chord);
  const xAc = secs.map((x) => x.xLe + 0.25 * x.chord);
  const cm = secs.map((x) => x.cm);
  const cmTerm = secs.map((x, k) => x.chord * x.chord * cm[k]);
  const axis = referenceAxis(model);
  const xRef = grid.map((y) => axis.rootX + ((axis.tipX - axis.rootX) * y) / s);
  const basic = beamLoads(grid, cclb, xAc, xRef, cmTerm);
  const add = beamLoads(grid, ccla, xAc, xRef);
  // Structural mass: weight per unit load factor, spread ∝ chord, on the reference axis.
  const massDist = model.massKg ? chord.map((c) => (model.massKg! * c * ISA.g0) / halfArea) : new Array(K).fill(0);
  const massLoads = beamLoads(grid, massDist, xRef, xRef);
  const items = model.massItems ?? [];
  validateMassItems(items, s);
  const xRefOut = yOut.map((y) => axis.rootX + ((axis.tipX - axis.rootX) * y) / s);
  const itemsPerNz = items.map((it) => {
    const loads = itemUnitLoads(it, yOut, xRefOut);
    resolveAboutAxis(loads, axis);
    return { id: it.id, kg: it.kg, loads };
  });
  const singular = secs.filter((x) => x.singular);
  if (singular.length > 0) {
    warnings.push(
      `the ${opts.rule} rule is singular at the working Cp of the sections from y = ${singular[0].y.toFixed(3)} m to ${singular[singular.length - 1].y.toFixed(3)} m at Mach ${mach}; Prandtl–Glauert scaling was used there`,
    );
  }
  const stationMachCritical = yOut.map((y) => {
    const c = sectionAt(st, y).cpMin;
    return c === undefined ? null : criticalMach(opts.rule, c);
  });
  const mcrs = [
    ...stationMachCritical.filter((v): v is number => v !== null),
    ...st.filter((x) => x.cpMin !== undefined).map((x) => criticalMach(opts.rule, x.cpMin!)),
  ];
  const cpMinSource = yOut.map((y) => cpMinSourceAt(st, y));
  const unchecked = uncheckedMachWarning(yOut, cpMinSource, mach);
  if (unchecked) warnings.push(unchecked);
  // Quarter-chord sweep of the panel holding each output station (inner panel at a break).
  const cosSweepAt = (y: number) => {
    const p = g.panels.find((q) => y <= q.yOuter) ?? g.panels[g.panels.length - 1];
    return Math.cos((p.sweepQuarterChordDeg * Math.PI) / 180);
  };
  const stationMachCriticalSwept = stationMachCritical.map((m, i) => (m === null ? null : m / cosSweepAt(yOut[i])));
  const sweptAtBreaks = g.panels.flatMap((p, i) =>
    [st[i], st[i + 1]].filter((x) => x.cpMin !== undefined).map((x) => criticalMach(opts.rule, x.cpMin!) / Math.cos((p.sweepQuarterChordDeg * Math.PI) / 180)),
  );
  const mcrSwept = [...stationMachCriticalSwept.filter((v): v is number => v !== null), ...sweptAtBreaks];
  const mbar = g.meanGeometricChord;
  return {
    mach,
    beta: sys.beta,
    rule: opts.rule,
    spanwise: opts.spanwise,
    clAlphaPerRad: clAlpha,
    alphaZeroLiftDeg,
    machCritical: mcrs.length ? Math.min(...mcrs) : null,
    warnings,
    wingWarnings,
    y: yOut,
    chord: pick(chord, idx),
    cclBasic: pick(cclb, idx),
    cclAdditional: pick(ccla, idx),
    loadingRatio: pick(ccla, idx).map((v) => v / mbar),
    cm: pick(cm, idx),
    scale: pick(secs.map((x) => x.scale), idx),
    sectionScaling: idx.map((i) => secs[i].scaling),
    clMax: idx.map((i) => secs[i].clMax ?? null),
    stationMachCritical,
    cpMinSource,
    stall: stallOf({ y: yOut, chord: pick(chord, idx), clMax: idx.map((i) => secs[i].clMax ?? null), cclBasic: pick(cclb, idx), cclAdditional: pick(ccla, idx), clAlphaPerRad: clAlpha, alphaZeroLiftDeg }),
    stationMachCriticalSwept,
    machCriticalSwept: mcrSwept.length ? Math.min(...mcrSwept) : null,
    basicPerQ: pickLoads(basic, idx, axis),
    additionalPerQ: pickLoads(add, idx, axis),
    massPerNz: pickLoads(massLoads, idx, axis),
    axis,
    itemsPerNz,
    moments: {
      cmTerm: integrate(grid, cmTerm),
      basicX: integrateProduct(grid, cclb, xAc),
      additionalX: integrateProduct(grid, ccla, xAc),
    },
    geometry: g,
    massKg: (model.massKg ?? 0) + itemsMassKg(items),
  };
}

/**
 * The root-chord α (deg) at which the first output station reaches its section clMax, by linear
 * theory (c·cl = basic + CL·additional at each station), and where; null where no station gives clMax.
 */
export function stallOf(sol: Pick<MachSolution, "y" | "chord" | "clMax" | "cclBasic" | "cclAdditional" | "clAlphaPerRad" | "alphaZeroLiftDeg">): { alphaDeg: number; y: number } | null {
  let stall: { alphaDeg: number; y: number } | null = null;
  sol.y.forEach((y, i) => {
    const cmax = sol.clMax[i];
    if (cmax === null || !(sol.cclAdditional[i] > 0)) return;
    const CLs = (cmax * sol.chord[i] - sol.cclBasic[i]) / sol.cclAdditional[i];
    const a = sol.alphaZeroLiftDeg + CLs / sol.clAlphaPerRad / DEG;
    if (!stall || a < stall.alphaDeg) stall = { alphaDeg: a, y };
  });
  return stall;
}

/** Where no cpMin is given the critical Mach number is not checked: the warning for Mach numbers where it matters, else null. */
export function uncheckedMachWarning(y: readonly number[], cpMinSource: readonly CpMinSource[], mach: number): string | null {
  const unchecked = y.filter((_, i) => cpMinSource[i] === null);
  if (!unchecked.length || !(mach > PLAUSIBLE.machUnchecked)) return null;
  return unchecked.length === y.length
    ? `no section gives cpMin: the critical Mach number is not checked, and at Mach ${mach} the subsonic rules may be outside their validity`
    : `no cpMin from y = ${unchecked[0].toFixed(3)} m to ${unchecked[unchecked.length - 1].toFixed(3)} m: the critical Mach number is not checked there, and at Mach ${mach} it matters`;
}

/**
 * Whole-wing pitching-moment coefficient about a lateral axis at x = xRef (m), nose up positive,
 * on S and the MAC: Cm = (2/(S·c̄_MAC))·[∫c²cm dy + ∫c·cl·(xRef − x_ac) dy].
 */
export function wingPitchingMoment(sol: MachSolution, CL: number, xRef: number): number {
  const g = sol.geometry;
  const m = sol.moments;
  const lift = (CL * g.area) / 2;
  const M = m.cmTerm + xRef * lift - (m.basicX + CL * m.additionalX);
  return (2 * M) / (g.area * g.mac);
}

/** Streamwise position (m) of the wing's aerodynamic centre (where Cm does not change with CL). */
export function wingAerodynamicCentre(sol: MachSolution): number {
  return sol.moments.additionalX / (sol.geometry.area / 2);
}

/**
 * Re-solve the spanwise problem directly at a root-chord α (deg), without superposition: the
 * c·cl (m) at the output stations and CL. Slow path, for checks and single studies.
 */
export function solveAtAlpha(
  model: WingModel,
  mach: number,
  alphaDeg: number,
  opts: SolveOptions,
): { CL: number; y: number[]; ccl: number[] } {
  const sys = buildSystem(model.stations, mach, opts);
  const r = sys.solve((sec) => (alphaDeg + sec.twist - sec.alphaL0) * DEG);
  const y = outputStations(model.stations[model.stations.length - 1].y, opts.stations);
  return { CL: r.CL, y, ccl: y.map((v) => r.cclAt(v)) };
}

/** How much a Mach solution moves when the solver's resolution is halved: an estimate of its discretisation error. */
export interface ResolutionCheck {
  /** Resolution used (strips or Fourier terms) and the halved one compared with it. */
  resolution: number;
  halfResolution: number;
  /** Relative change of the wing lift slope CLα. */
  clAlpha: number;
  /** Relative change of the root bending moment per unit CL (additional loading). */
  rootBending: number;
  /** Largest change of the additional loading c·cl per unit CL over the output stations, relative to its peak. */
  loading: number;
}

/**
 * Re-solve at half the resolution and compare (a convergence estimate). The vortex lattice converges
 * at first order in the strip count (observed: each doubling halves the change), so the change on
 * halving is an estimate of the error of the full-resolution result itself; the lifting line
 * converges faster (second order on tapered wings), so for it the change over-states the error.
 * `full` is the solution at the full resolution when already at hand.
 */
export function resolutionCheck(model: WingModel, mach: number, opts: SolveOptions, full?: MachSolution): ResolutionCheck {
  const resolution = opts.resolution ?? (opts.spanwise === "lifting-line" ? LIFTING_LINE_DEFAULT_TERMS : VORTEX_LATTICE_DEFAULT_STRIPS);
  const halfResolution = Math.max(2, Math.floor(resolution / 2));
  const a = full ?? solveMach(model, mach, { ...opts, resolution });
  const b = solveMach({ ...model, massKg: undefined, massItems: undefined }, mach, { ...opts, resolution: halfResolution });
  const peak = Math.max(...a.cclAdditional.map(Math.abs));
  let loading = 0;
  for (let i = 0; i < a.cclAdditional.length; i++) loading = Math.max(loading, Math.abs(a.cclAdditional[i] - b.cclAdditional[i]) / peak);
  const rel = (u: number, v: number) => (u === 0 ? Math.abs(v) : Math.abs(u - v) / Math.abs(u));
  return {
    resolution,
    halfResolution,
    clAlpha: rel(a.clAlphaPerRad, b.clAlphaPerRad),
    rootBending: rel(a.additionalPerQ.bending[0], b.additionalPerQ.bending[0]),
    loading,
  };
}
