import { describe, expect, it } from "vitest";
import { isa, ISA } from "./atmosphere";
import { evaluateCase } from "./load-case";
import { trapezoidalWing } from "./planform";
import { schrenkCaseLoads } from "./schrenk-loads";
import { solveMach } from "./superposition";

const solve = (stations: ReturnType<typeof trapezoidalWing>, mach: number) => solveMach({ stations }, mach, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 20 });

describe("a case's loads with its lift spread by Schrenk's approximation", () => {
  it("carries the case's lift: the worked example's root shear 50 000 N and root bending 108 607.2 N·m per side (REFERENCES §3 [C], Schrenk NACA TM 948)", () => {
    // b = 10 m, c_r = 2 m, λ = 0.5, untwisted; a trimmed case whose wing carries L = 100 kN in all.
    const wing = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5 });
    const sol = solve(wing, 0.2);
    const lc = evaluateCase(sol, { id: "L100k", mach: 0.2, altitude: 0, weightN: 100000, nz: 1 });
    const r = schrenkCaseLoads({ stations: wing }, sol, lc);
    expect(r.root.shear).toBeCloseTo(50000, 3);
    expect(Math.abs(r.root.bending - 108607.2)).toBeLessThan(2);
    // Unswept quarter-chord line as the axis, cm = 0: no torsion.
    expect(Math.abs(r.root.torsion)).toBeLessThan(1e-6);
    // Running lift at the root: l = (L/S)·c_S = 13 032.86 N/m (REFERENCES §3 table, 2y/b = 0).
    expect(r.lift[0]).toBeCloseTo(13032.86, 0);
  });

  it("adds the section moments of the rule: root torsion q·c²·(cmAc/β)·s on a rectangular wing about its quarter chord (beam statics, REFERENCES §4 [C]; Prandtl–Glauert cm/β, Glauert 1928)", () => {
    const wing = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 1, cmAc: -0.1 });
    const mach = 0.4;
    const sol = solve(wing, mach);
    const lc = evaluateCase(sol, { id: "a4", mach, altitude: 0, alphaDeg: 4 });
    const q = 0.5 * ISA.gamma * isa(0).pressure * mach * mach;
    const beta = Math.sqrt(1 - mach * mach);
    const r = schrenkCaseLoads({ stations: wing }, sol, lc);
    expect(r.root.torsion).toBeCloseTo(q * 4 * (-0.1 / beta) * 5, 3);
    // The same wing lift as the solver's case (the root shear of a rectangular wing's lift, L/2 = q·CL·S/2).
    expect(r.root.shear).toBeCloseTo((q * lc.CL * 20) / 2, 3);
  });
});
