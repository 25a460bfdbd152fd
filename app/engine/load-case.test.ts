import { describe, expect, it } from "vitest";
import { dynamicPressure } from "./atmosphere";
import { evaluateCase } from "./load-case";
import { trapezoidalWing } from "./planform";
import { solveMach } from "./superposition";

describe("evaluateCase", () => {
  const st = trapezoidalWing({ span: 16, rootChord: 2.2, taperRatio: 0.45, alphaL0: -2 });
  const sol = solveMach({ stations: st, massKg: 250 }, 0.4, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 12 });

  it("trims to L = nz·W: CL = nz·W/(q·S) and α = α0L + CL/CLα", () => {
    const c = evaluateCase(sol, { id: "t", mach: 0.4, altitude: 2000, weightN: 60000, nz: 2.5 });
    const q = dynamicPressure(0.4, 2000);
    expect(c.CL).toBeCloseTo((2.5 * 60000) / (q * sol.geometry.area), 12);
    expect(c.alphaDeg).toBeCloseTo(sol.alphaZeroLiftDeg + (c.CL / sol.clAlphaPerRad) * (180 / Math.PI), 12);
    expect(c.nz).toBe(2.5);
    expect(c.regime).toBe("unchecked");
  });

  it("refuses a case whose Mach number is not the solution's", () => {
    expect(() => evaluateCase(sol, { id: "x", mach: 0.5, altitude: 0, alphaDeg: 1 }, "cases[7]")).toThrow(/cases\[7\]\.mach/);
  });

  it("an untwisted wing with uniform αL0 has zero lift at α = αL0 (thin-airfoil superposition)", () => {
    expect(sol.alphaZeroLiftDeg).toBeCloseTo(-2, 10);
  });
});
