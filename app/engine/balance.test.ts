import { describe, expect, it } from "vitest";
import { dynamicPressure } from "./atmosphere";
import { balanceCase, balanceTailLoad } from "./balance";
import { EngineError } from "./errors";
import { trapezoidalWing } from "./planform";
import { solveMach, wingPitchingMoment } from "./superposition";

// The balance is rigid-body statics: ΣF = nz·W and ΣM about the centre of gravity = 0 with the wing–body
// lift at its aerodynamic centre, its moment about that point and the tail load at the tail's
// aerodynamic centre (common practice of the trade, no source; the same equilibrium is the trim
// equation of any flight-mechanics text, e.g. Etkin & Reid, Dynamics of Flight, ch. 2 [M]).

describe("balancing tail load, worked by hand", () => {
  // W = 50 kN at nz = 1; q = 5 kPa, S = 20 m², c̄ = 2 m; CG 0.1 m aft of the wing's aerodynamic
  // centre; wing Cm_ac = −0.04, body ΔCm = −0.01 (so q·S·c̄·Cm = −10 000 N·m); tail 6 m aft of the ac.
  const base = { weightN: 50000, nz: 1, dynamicPressure: 5000, area: 20, mac: 2, xAc: 1.0, cmAc: -0.04, cmBody: -0.01, xCg: 1.1, xTail: 7.0 };

  it("P = [nz·W·(x_cg − x_ac) + q·S·c̄·Cm] / (x_t − x_ac) = (5000 − 10 000)/6 = −833.33 N (a download)", () => {
    const b = balanceTailLoad(base);
    expect(b.tailLoad).toBeCloseTo(-833.3333, 4);
    expect(b.wingLift).toBeCloseTo(50833.3333, 4);
    expect(b.wingMoment).toBeCloseTo(-10000, 9);
  });

  it("forces and moments about the centre of gravity balance, at any load factor", () => {
    for (const nz of [-1, 1, 2.5, 3.8]) {
      const b = balanceTailLoad({ ...base, nz });
      expect(b.wingLift + b.tailLoad).toBeCloseTo(nz * base.weightN, 8);
      // Nose-up positive: wing lift ahead of the CG pitches up, tail lift aft of it pitches down.
      const m = b.wingLift * (base.xCg - base.xAc) + b.wingMoment - b.tailLoad * (base.xTail - base.xCg);
      expect(m).toBeCloseTo(0, 6);
    }
  });

  it("a CG on the aerodynamic centre leaves only the moment to balance: P = q·S·c̄·Cm/(x_t − x_ac)", () => {
    expect(balanceTailLoad({ ...base, xCg: 1.0 }).tailLoad).toBeCloseTo(-10000 / 6, 8);
  });

  it("refuses a tail ahead of the centre of gravity", () => {
    expect(() => balanceTailLoad({ ...base, xTail: 1.05 })).toThrow(EngineError);
  });
});

describe("balance of a case from the wing solution", () => {
  const st = trapezoidalWing({ span: 16, rootChord: 2.4, taperRatio: 0.5, alphaL0: -2, cmAc: -0.05 }).map((s, i) => ({ ...s, twist: i === 0 ? 0 : -2 }));
  const sol = solveMach({ stations: st }, 0.5, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 20 });

  it("uses the wing's aerodynamic centre and its Cm there; equilibrium holds about the CG placed on the MAC", () => {
    const g = sol.geometry;
    const b = balanceCase(sol, { weightN: 120000, nz: 2.5, altitude: 3000, cgMac: 0.3, tailArm: 7, cmBody: -0.02 });
    expect(b.dynamicPressure).toBeCloseTo(dynamicPressure(0.5, 3000), 9);
    expect(b.xCg).toBeCloseTo(g.xLeMac + 0.3 * g.mac, 12);
    expect(b.xTail).toBeCloseTo(g.xLeMac + 0.25 * g.mac + 7, 12);
    // The wing's Cm about its aerodynamic centre does not change with CL (the definition of that point).
    expect(wingPitchingMoment(sol, 1.2, b.xAc)).toBeCloseTo(b.cmAc, 10);
    const m = b.wingLift * (b.xCg - b.xAc) + b.wingMoment - b.tailLoad * (b.xTail - b.xCg);
    expect(m).toBeCloseTo(0, 5);
    expect(b.wingLift + b.tailLoad).toBeCloseTo(2.5 * 120000, 6);
  });
});
