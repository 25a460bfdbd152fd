import { dynamicPressure } from "./atmosphere";
import { EngineError } from "./errors";
import type { MachSolution } from "./superposition";
import { wingAerodynamicCentre, wingPitchingMoment } from "./superposition";

// The balanced aircraft in steady symmetric flight: vertical force and pitching-moment equilibrium
// about the centre of gravity with the wing–body and the horizontal tail. Rigid aircraft, no pitch
// acceleration, tail lift from the balance alone (its own gust or manoeuvre increment not modelled),
// thrust and drag moments left out. The authority's accepted method governs; this supports it.

/** Inputs of the balance (SI; x streamwise, aft positive, one origin for every x). */
export interface BalanceInput {
  /** Whole-aircraft weight, N. */
  weightN: number;
  nz: number;
  /** Dynamic pressure, Pa. */
  dynamicPressure: number;
  /** Whole-wing reference area, m². */
  area: number;
  /** Mean aerodynamic chord, m. */
  mac: number;
  /** Wing aerodynamic centre (where its Cm does not change with CL), m. */
  xAc: number;
  /** Wing pitching-moment coefficient about its aerodynamic centre (on S and MAC), nose up positive. */
  cmAc: number;
  /** Wing–body increment: the fuselage's and nacelles' pitching-moment coefficient at zero lift (a couple, on S and MAC). */
  cmBody: number;
  /** Centre of gravity, m. */
  xCg: number;
  /** Aerodynamic centre of the horizontal tail, m. */
  xTail: number;
}

/** The balanced state: loads in N (whole aircraft, up positive), moments in N·m (nose up positive). */
export interface Balance {
  /** Balancing tail load P, N, positive up. */
  tailLoad: number;
  /** Lift of the wing–body, N: nz·W − P. */
  wingLift: number;
  /** Pitching moment of the wing–body about its aerodynamic centre, N·m: q·S·c̄·(cmAc + cmBody). */
  wingMoment: number;
  xAc: number;
  xCg: number;
  xTail: number;
}

/**
 * Tail load from equilibrium about the centre of gravity:
 * (nz·W − P)·(x_cg − x_ac) + q·S·c̄·(Cm_ac + ΔCm_body) − P·(x_t − x_cg) = 0, so
 * P = [nz·W·(x_cg − x_ac) + q·S·c̄·(Cm_ac + ΔCm_body)] / (x_t − x_ac).
 * @throws EngineError when the tail is not aft of both the aerodynamic centre and the centre of gravity.
 */
export function balanceTailLoad(b: BalanceInput): Balance {
  for (const [k, v] of Object.entries(b)) {
    if (!Number.isFinite(v)) throw new EngineError("invalid-argument", "must be a finite number", k);
  }
  if (!(b.xTail > b.xAc && b.xTail > b.xCg)) {
    throw new EngineError("invalid-argument", "the tail must lie aft of the wing's aerodynamic centre and of the centre of gravity", "tailArm");
  }
  const wingMoment = b.dynamicPressure * b.area * b.mac * (b.cmAc + b.cmBody);
  const tailLoad = (b.nz * b.weightN * (b.xCg - b.xAc) + wingMoment) / (b.xTail - b.xAc);
  return { tailLoad, wingLift: b.nz * b.weightN - tailLoad, wingMoment, xAc: b.xAc, xCg: b.xCg, xTail: b.xTail };
}

/** What a case needs for its balance beyond the wing solution. */
export interface CaseBalanceInput {
  weightN: number;
  nz: number;
  /** Geopotential altitude, m (with the solution's Mach number it gives q). */
  altitude: number;
  /** Centre of gravity as a fraction of the MAC aft of its leading edge (0.25 = 25 % MAC). */
  cgMac: number;
  /** Tail arm: distance from the MAC quarter chord aft to the tail's aerodynamic centre, m. */
  tailArm: number;
  /** Wing–body pitching-moment increment at zero lift (fuselage, nacelles), on S and MAC. */
  cmBody: number;
}

/**
 * The balance of one case with the wing's own lift and moment from its Mach solution: the wing's
 * aerodynamic centre and Cm about it (compressible, with twist and section moments), the centre of
 * gravity placed on the MAC, the tail at `tailArm` aft of the MAC quarter chord.
 */
export function balanceCase(sol: MachSolution, c: CaseBalanceInput): Balance & { cmAc: number; dynamicPressure: number } {
  const g = sol.geometry;
  const xAc = wingAerodynamicCentre(sol);
  const cmAc = wingPitchingMoment(sol, 0, xAc);
  const q = dynamicPressure(sol.mach, c.altitude);
  if (!(c.tailArm > 0)) throw new EngineError("invalid-argument", "must be greater than 0 (m aft of the MAC quarter chord)", "tailArm");
  const b = balanceTailLoad({
    weightN: c.weightN,
    nz: c.nz,
    dynamicPressure: q,
    area: g.area,
    mac: g.mac,
    xAc,
    cmAc,
    cmBody: c.cmBody,
    xCg: g.xLeMac + c.cgMac * g.mac,
    xTail: g.xLeMac + 0.25 * g.mac + c.tailArm,
  });
  return { ...b, cmAc, dynamicPressure: q };
}
