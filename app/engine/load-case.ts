import { ISA, isa } from "./atmosphere";
import { EngineError } from "./errors";
import type { MassCase, StationLoads } from "./mass";
import { inertiaRelief } from "./mass";
import { PLAUSIBLE } from "./plausibility";
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
  let regime: CaseLoads["regime"] = "unchecked";
  if (sol.machCritical !== null) {
    regime = lc.mach < sol.machCritical ? "subcritical" : "supercritical";
    if (regime === "supercritical") {
      const swept = sol.machCriticalSwept !== null && sol.machCriticalSwept > sol.machCritical + 1e-9
        ? ` (by simple sweep theory, cos Λ, which is optimistic, it would be ${sol.machCriticalSwept >= 1 ? "above 1" : sol.machCriticalSwept.toFixed(4)})`
        : "";
      warnings.push(
        `Mach ${lc.mach} is at or above the critical Mach number ${sol.machCritical.toFixed(4)} (${sol.rule}, unswept sections, conservative)${swept}: the subsonic compressibility rules are outside their validity; results are computed anyway`,
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
    machCritical: sol.machCritical,
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

/**
 * The contract promises no NaN or Infinity where a number is documented: an input that would give one
 * (an overflow the ranges did not catch) is refused naming the case, never answered.
 */
function assertFinite(c: CaseLoads, field: string): void {
  const scalars = [c.dynamicPressure, c.alphaDeg, c.CL, c.clAlphaPerRad, c.beta];
  const arrays = [c.cl, c.cm, c.lift, c.shear, c.bending, c.torsion];
  if (scalars.every(Number.isFinite) && arrays.every((a) => a.every(Number.isFinite))) return;
  throw new EngineError("no-solution", "the case gives numbers too large to represent (an overflow): check its weight, nz, Mach and altitude", field);
}
