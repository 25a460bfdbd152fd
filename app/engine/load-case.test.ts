import { describe, expect, it } from "vitest";
import { evaluateCase } from "./load-case";
import { trapezoidalWing } from "./planform";
import { solveMach } from "./superposition";

// Expected values from outside the code under test: the standard atmosphere of REFERENCES 5.2, q = 0.7·p·M²
// (REFERENCES 7), and the converged lifting-line slope of REFERENCES 2.6(b) [C] for a rectangular wing.
// Pa at 2000 m geopotential: the troposphere formula of REFERENCES 5.1 (U.S. Standard Atmosphere 1976 / ICAO Doc 7488).
const P_2000 = 101325 * (1 - (0.0065 * 2000) / 288.15) ** (9.80665 / (287.05287 * 0.0065));
const CLA_AR8_M06 = 5.7538; // per rad: rectangular AR 8, a0 = 2π, M = 0.6 (REFERENCES 2.6(b) [C], Göthert NACA TM 1105)

describe("evaluateCase", () => {
  // Rectangular AR 8, a0 = 2π, uniform αL0 = −2°, no twist: the wing of REFERENCES 2.6(b).
  const st = trapezoidalWing({ span: 16, rootChord: 2, taperRatio: 1, alphaL0: -2 });
  const sol = solveMach({ stations: st, massKg: 250 }, 0.6, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 12 });

  it("trims to L = nz·W: CL = nz·W/(q·S) with q = 0.7·p·M² from the standard atmosphere, and α = αL0 + CL/CLα with the published slope", () => {
    const c = evaluateCase(sol, { id: "t", mach: 0.6, altitude: 2000, weightN: 60000, nz: 2.5 });
    const q = 0.7 * P_2000 * 0.36;
    expect(Math.abs(c.dynamicPressure / q - 1)).toBeLessThan(1e-9);
    const CL = (2.5 * 60000) / (q * 32);
    expect(Math.abs(c.CL / CL - 1)).toBeLessThan(1e-9);
    // Root-chord α: zero-lift angle of an untwisted wing is its sections' αL0 (thin-airfoil superposition),
    // and the slope that of the converged lifting line (80 terms: within 1e-5 of the table).
    expect(c.alphaDeg).toBeCloseTo(-2 + (CL / CLA_AR8_M06) * (180 / Math.PI), 3);
    expect(c.nz).toBe(2.5);
    expect(c.regime).toBe("unchecked");
  });

  it("by α: CL = CLα·(α − αL0) with the published slope, and no inertia relief (its load factor is unknown)", () => {
    const c = evaluateCase(sol, { id: "a", mach: 0.6, altitude: 2000, alphaDeg: 3 });
    expect(c.CL).toBeCloseTo(CLA_AR8_M06 * (5 * Math.PI) / 180, 4);
    expect(c.inertiaApplied).toBe(false);
    // Root shear of the aerodynamic load alone: half the wing's lift, q·S·CL/2 (statics).
    expect(c.root.shear).toBeCloseTo((c.dynamicPressure * 32 * c.CL) / 2, 6);
  });

  it("refuses a case whose Mach number is not the solution's", () => {
    expect(() => evaluateCase(sol, { id: "x", mach: 0.5, altitude: 0, alphaDeg: 1 }, "cases[7]")).toThrow(/cases\[7\]\.mach/);
  });

  it("an untwisted wing with uniform αL0 has zero lift at α = αL0 (thin-airfoil superposition)", () => {
    expect(sol.alphaZeroLiftDeg).toBeCloseTo(-2, 10);
    // ... and no basic loading anywhere: the whole load is additional.
    for (const v of sol.cclBasic) expect(Math.abs(v)).toBeLessThan(1e-9);
  });
});
