import { ISA, isa } from "./atmosphere";
import { EngineError } from "./errors";
import type { MassCase, StationLoads } from "./mass";
import { inertiaRelief } from "./mass";
import { criticalMachTabulated } from "./compressibility";
import { PLAUSIBLE } from "./plausibility";
import { cpMinAt } from "./section-data";
import type { MachSolution } from "./superposition";
import { DEG } from "./spanwise";

/**
 * One flight condition: by root-chord angle of attack, or trimmed so that the wing carries
 * nz·W − tail load (N, whole aircraft, tail load positive up). `massCase` scales the mass items
 * (all at full mass where absent).
 */
export type LoadCase =
  | { id: string; mach: number; altitude: number; alphaDeg: number; massCase?: MassCase }
  | { id: string; mach: number; altitude: number; weightN: number; nz: number; tailLoadN?: number; massCase?: MassCase };

/** Loads of one case at the output stations (per semispan, net of inertia relief where applied). */
export interface CaseLoads {
  id: string;
  mach: number;
  altitude: number;
  beta: number;
  /** Dynamic pressure, Pa. */
  dynamicPressure: number;
  /** Root-chord angle of attack, deg. */
  alphaDeg: number;
  /** Wing lift coefficient on the whole-wing area. */
  CL: number;
  clAlphaPerRad: number;
  /** Load factor used for inertia relief, or null for a case given by α. */
  nz: number | null;
  inertiaApplied: boolean;
  /** Mass case id, or null where every item counts fully. */
  massCase: string | null;
  /** Balancing tail load, N, whole aircraft, positive up (0 where not given or for a case by α). */
  tailLoad: number;
  /** Lift of the whole wing (both sides), N: nz·W − tail load when trimmed, q·S·CL otherwise. */
  wingLift: number;
  /** Inertia relief at the stations (N, N·m), the amount taken off the aerodynamic loads; zero when not applied. */
  relief: StationLoads;
  /** Critical Mach number of each output station at this case's local lift (where a table gives Cp,min against lift), else its single value. */
  stationMachCritical: (number | null)[];
  /** Indices of output stations whose cl exceeds the section clMax. */
  clMaxExceeded: number[];
  machCritical: number | null;
  regime: "subcritical" | "supercritical" | "unchecked";
  warnings: string[];
  y: number[];
  chord: number[];
  cl: number[];
  cm: number[];
  /** Aerodynamic running load, N/m. */
  lift: number[];
  shear: number[];
  bending: number[];
  torsion: number[];
  root: { shear: number; bending: number; torsion: number };
}

/**
 * Combine the Mach solution for one case (superposition: no new solve).
 * A case given by weight and nz is trimmed to CL = nz·W/(q·S) and carries inertia relief of the
 * structural mass at nz; a case given by α has no weight, so its load factor is unknown and
 * inertia relief is not applied (a warning says so when the wing has mass).
 * `field` prefixes error fields, e.g. "cases[3]".
 * @throws EngineError when the case's Mach number differs from the solution's or q = 0 for a trimmed case.
 */
export function evaluateCase(sol: MachSolution, lc: LoadCase, field = "case"): CaseLoads {
  if (lc.mach !== sol.mach) throw new EngineError("invalid-argument", `Mach ${lc.mach} was given a solution for Mach ${sol.mach}`, `${field}.mach`);
  const atm = isa(lc.altitude, `${field}.altitude`);
  const q = 0.5 * ISA.gamma * atm.pressure * lc.mach * lc.mach;
  const S = sol.geometry.area;
  const warnings = [...sol.warnings];
  let CL: number;
  let alphaDeg: number;
  let nz: number | null = null;
  let tailLoad = 0;
  const P = PLAUSIBLE;
  if ("alphaDeg" in lc) {
    if (!(Math.abs(lc.alphaDeg) <= P.alphaDeg.max)) {
      throw new EngineError("invalid-argument", `${lc.alphaDeg}° is beyond ±${P.alphaDeg.max}°, where the linear, attached-flow methods mean nothing`, `${field}.alpha`);
    }
    alphaDeg = lc.alphaDeg;
    CL = sol.clAlphaPerRad * (alphaDeg - sol.alphaZeroLiftDeg) * DEG;
    if (sol.massKg > 0) {
      warnings.push("case given by alpha: the load factor is unknown, so inertia relief is not applied (aerodynamic loads only)");
    }
    if (lc.massCase) warnings.push(`case given by alpha: its mass case "${lc.massCase.id}" has no effect (no inertia relief without a load factor)`);
  } else {
    if (!(q > 0)) throw new EngineError("invalid-argument", "must be above 0 for a case given by weight and nz (no dynamic pressure to trim)", `${field}.mach`);
    if (!(lc.weightN > 0 && lc.weightN <= P.weight.max)) {
      throw new EngineError("invalid-argument", `${lc.weightN} N is outside 0 to ${P.weight.max.toExponential(0)} N (about 2000 t, three times the heaviest aeroplane built)`, `${field}.weight`);
    }
    if (!(Math.abs(lc.nz) <= P.nz.max)) throw new EngineError("invalid-argument", `${lc.nz} is beyond ±${P.nz.max}, more than any aircraft structure is designed for`, `${field}.nz`);
    // The wing's own mass in this case's mass state (items scaled by their fill).
    const wingKg = sol.massKg - sol.itemsPerNz.reduce((a, it) => a + it.kg * (1 - (lc.massCase?.fill[it.id] ?? 1)), 0);
    if (2 * wingKg * ISA.g0 > lc.weightN) {
      throw new EngineError(
        "invalid-argument",
        `${lc.weightN} N is less than the weight of the wing's own masses (2 × ${wingKg.toPrecision(6)} kg × g = ${(2 * wingKg * ISA.g0).toFixed(0)} N): the aircraft cannot weigh less than its wing`,
        `${field}.weight`,
      );
    }
    nz = lc.nz;
    tailLoad = lc.tailLoadN ?? 0;
    if (!Number.isFinite(tailLoad)) throw new EngineError("invalid-argument", "must be a finite number (N)", `${field}.tailLoad`);
    CL = (lc.nz * lc.weightN - tailLoad) / (q * S);
    alphaDeg = sol.alphaZeroLiftDeg + CL / sol.clAlphaPerRad / DEG;
    if (!(Math.abs(alphaDeg) <= P.alphaDeg.max)) {
      throw new EngineError(
        "invalid-argument",
        `the wing would need CL = ${CL.toPrecision(4)} (root-chord α = ${alphaDeg.toPrecision(4)}°) to carry nz·W − P = ${(lc.nz * lc.weightN - tailLoad).toPrecision(4)} N at Mach ${lc.mach}, ${lc.altitude} m; beyond ±${P.alphaDeg.max}° the linear, attached-flow methods mean nothing: check weight, nz, tail load, Mach and altitude`,
        `${field}.nz`,
      );
    }
    if (lc.nz > P.nz.warnMax || lc.nz < P.nz.warnMin) warnings.push(`load factor ${lc.nz} is unusual (outside ${P.nz.warnMin} to ${P.nz.warnMax})`);
    const wS = lc.weightN / S;
    if (wS < P.wingLoading.warnMin || wS > P.wingLoading.warnMax) {
      warnings.push(`wing loading W/S = ${wS.toPrecision(4)} N/m² is unusual (outside ${P.wingLoading.warnMin} to ${P.wingLoading.warnMax} N/m²): check the weight (N, whole aircraft) against the wing area`);
    }
  }
  const kind = "alphaDeg" in lc ? "angle of attack" : "trimmed angle of attack";
  if (sol.stall !== null) {
    if (alphaDeg > sol.stall.alphaDeg) {
      warnings.push(
        `the ${kind} ${alphaDeg.toFixed(2)}° is beyond the sections' stall: the first station reaches its clMax at ${sol.stall.alphaDeg.toFixed(2)}° (y = ${sol.stall.y.toFixed(3)} m), so the wing cannot carry this case in attached flow`,
      );
    }
  } else if (Math.abs(alphaDeg) > P.alphaDeg.warnNoClMax) {
    warnings.push(`the ${kind} ${alphaDeg.toFixed(2)}° is beyond the stall of usual sections (about ${P.alphaDeg.warnNoClMax}°) and no clMax is given to check it`);
  }
  const n = sol.y.length;
  const applied = nz !== null && sol.massKg > 0;
  const r = applied
    ? inertiaRelief(sol.massPerNz, sol.itemsPerNz, nz!, lc.massCase)
    : { shear: new Array<number>(n).fill(0), bending: new Array<number>(n).fill(0), torsion: new Array<number>(n).fill(0) };
  const lift = new Array<number>(n);
  const cl = new Array<number>(n);
  const shear = new Array<number>(n);
  const bending = new Array<number>(n);
  const torsion = new Array<number>(n);
  const b = sol.basicPerQ;
  const a = sol.additionalPerQ;
  for (let i = 0; i < n; i++) {
    const ccl = sol.cclBasic[i] + CL * sol.cclAdditional[i];
    lift[i] = q * ccl;
    cl[i] = ccl / sol.chord[i];
    shear[i] = q * (b.shear[i] + CL * a.shear[i]) - r.shear[i];
    bending[i] = q * (b.bending[i] + CL * a.bending[i]) - r.bending[i];
    torsion[i] = q * (b.torsion[i] + CL * a.torsion[i]) - r.torsion[i];
  }
  const clMaxExceeded: number[] = [];
  for (let i = 0; i < n; i++) {
    const cmax = sol.clMax[i];
    if (cmax !== null && cl[i] > cmax) {
      clMaxExceeded.push(i);
      warnings.push(`station y = ${sol.y[i].toFixed(3)} m: cl ${cl[i].toFixed(3)} exceeds the section clMax ${cmax.toFixed(3)}`);
    }
  }
  const critical = caseCriticalMach(sol, cl);
  warnings.push(...critical.warnings);
  const machCritical = critical.machCritical;
  let regime: CaseLoads["regime"] = "unchecked";
  if (machCritical !== null) {
    regime = lc.mach < machCritical ? "subcritical" : "supercritical";
    if (regime === "supercritical") {
      // Simple sweep theory scales the unswept value by the same 1/cos Λ at this case's lift.
      const sweptNow = sol.machCriticalSwept !== null && sol.machCritical !== null ? (sol.machCriticalSwept / sol.machCritical) * machCritical : null;
      const swept = sweptNow !== null && sweptNow > machCritical + 1e-9
        ? ` (by simple sweep theory, cos Λ, which is optimistic, it would be ${sweptNow >= 1 ? "above 1" : sweptNow.toFixed(4)})`
        : "";
      warnings.push(
        `Mach ${lc.mach} is at or above the critical Mach number ${machCritical.toFixed(4)} (${sol.rule}, unswept sections, conservative${critical.atLift ? ", at this case's lift" : ""})${swept}: the subsonic compressibility rules are outside their validity; results are computed anyway`,
      );
    }
  }
  const out: CaseLoads = {
    id: lc.id,
    mach: lc.mach,
    altitude: lc.altitude,
    beta: sol.beta,
    dynamicPressure: q,
    alphaDeg,
    CL,
    clAlphaPerRad: sol.clAlphaPerRad,
    nz,
    inertiaApplied: applied,
    massCase: lc.massCase?.id ?? null,
    tailLoad,
    wingLift: q * S * CL,
    relief: r,
    clMaxExceeded,
    machCritical,
    stationMachCritical: critical.stations,
    regime,
    warnings,
    y: sol.y,
    chord: sol.chord,
    cl,
    cm: sol.cm,
    lift,
    shear,
    bending,
    torsion,
    root: { shear: shear[0], bending: bending[0], torsion: torsion[0] },
  };
  assertFinite(out, field);
  return out;
}

/** Far from the lift a single cpMin belongs to: more than this in section cl (common practice, no source). */
export const CPMIN_LIFT_SPAN = 0.3;
/** The lift a single cpMin is taken to belong to when the data do not state it: a cruise-like section cl (no source). */
export const CPMIN_DEFAULT_CL = 0.4;

/**
 * The critical Mach number of a case, per station and its lowest over the span. Where a station's data
 * give the minimum Cp against lift, it is read at the station's incompressible lift for this case
 * (cl/k, k the rule's slope factor) and the critical Mach number follows from it; where only one cpMin
 * is given, its own critical Mach number holds, and a case whose local lift is far from the lift that
 * value belongs to (stated with it, or else taken as a cruise-like 0.4) is warned of: more than 0.3
 * above it, or below it with negative lift.
 */
export function caseCriticalMach(sol: MachSolution, cl: readonly number[]): { machCritical: number | null; stations: (number | null)[]; atLift: boolean; warnings: string[] } {
  const warnings: string[] = [];
  const hasTable = sol.cpMinSource.some((s) => s?.kind === "table");
  let far: { y: number; cl: number; ref: number; stated: boolean } | null = null;
  let beyond: { y: number; cl: number; lo: number; hi: number } | null = null;
  const stations = sol.cpMinSource.map((src, i) => {
    if (src === null) return null;
    const cl0 = cl[i] / sol.scale[i];
    if (src.kind === "single") {
      // Far where it matters: more lift than the value belongs to (a stronger suction peak), or negative lift
      // (the peak moves to the lower surface); less positive lift only relieves the peak.
      const ref = src.cl ?? CPMIN_DEFAULT_CL;
      const isFar = cl0 > ref + CPMIN_LIFT_SPAN || (cl0 < ref - CPMIN_LIFT_SPAN && cl0 < 0);
      if (isFar && (!far || Math.abs(cl0 - ref) > Math.abs(far.cl - far.ref))) far = { y: sol.y[i], cl: cl0, ref, stated: src.cl !== null };
      return sol.stationMachCritical[i];
    }
    const at = cpMinAt(src.table, cl0);
    if (at.beyond && !beyond) beyond = { y: sol.y[i], cl: cl0, lo: src.table[0].cl, hi: src.table[src.table.length - 1].cl };
    return criticalMachTabulated(sol.rule, at.cpMin);
  });
  if (far) {
    const f = far as { y: number; cl: number; ref: number; stated: boolean };
    warnings.push(
      `the critical Mach number rests on one cpMin per section, which belongs to a section cl of ${f.ref}${f.stated ? "" : " (not stated: taken as a cruise-like lift)"}; this case's incompressible section cl reaches ${f.cl.toFixed(2)} at y = ${f.y.toFixed(3)} m, far from it, where the minimum Cp may differ much: give Cp,min against angle of attack for a check at this lift`,
    );
  }
  if (beyond) {
    const b = beyond as { y: number; cl: number; lo: number; hi: number };
    warnings.push(`the section cl ${b.cl.toFixed(2)} at y = ${b.y.toFixed(3)} m lies outside the lift range of its Cp,min table (${b.lo} to ${b.hi}): the end value was used`);
  }
  const known = stations.filter((v): v is number => v !== null);
  if (!hasTable) return { machCritical: sol.machCritical, stations, atLift: false, warnings };
  return { machCritical: known.length ? Math.min(...known) : null, stations, atLift: true, warnings };
}

/**
 * The contract promises no NaN or Infinity where a number is documented: an input that would give one
 * (an overflow the ranges did not catch) is refused naming the case, never answered.
 */
function assertFinite(c: CaseLoads, field: string): void {
  // x·0 is 0 for every finite x and NaN for NaN and ±Infinity: one sum tells (no allocation per case).
  let probe = (c.dynamicPressure + c.alphaDeg + c.CL + c.clAlphaPerRad + c.beta) * 0;
  for (const a of [c.cl, c.cm, c.lift, c.shear, c.bending, c.torsion]) for (let i = 0; i < a.length; i++) probe += a[i] * 0;
  if (probe === 0) return;
  throw new EngineError("no-solution", "the case gives numbers too large to represent (an overflow): check its weight, nz, Mach and altitude", field);
}
