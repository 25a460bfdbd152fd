import { describe, expect, it } from "vitest";
import { criticalMach } from "./compressibility";
import { isEngineError } from "./errors";
import { buildLiftingLine, LIFTING_LINE_MAX_SWEEP_DEG } from "./lifting-line";
import { evaluateCase } from "./load-case";
import { trapezoidalWing, wingGeometry } from "./planform";
import { solveMach } from "./superposition";

/** DATCOM / Polhamus lift slope (REFERENCES 2.5 [M formula]), evaluated here for the comparison. */
function datcom(A: number, tanHalfChord: number): number {
  return (2 * Math.PI * A) / (2 + Math.sqrt(A * A * (1 + tanHalfChord * tanHalfChord) + 4));
}

describe("the lifting line and sweep", () => {
  it(`is refused beyond ${LIFTING_LINE_MAX_SWEEP_DEG}° of quarter-chord sweep, naming method.spanwise`, () => {
    const st = trapezoidalWing({ span: 17.5, rootChord: 2.6, taperRatio: 0.33, sweepQuarterChordDeg: 25 });
    let error: unknown;
    try {
      buildLiftingLine(st, { mach: 0.3, rule: "prandtl-glauert" });
    } catch (e) {
      error = e;
    }
    expect(isEngineError(error)).toBe(true);
    expect((error as { field: string }).field).toBe("method.spanwise");
    expect((error as Error).message).toMatch(/does not model sweep.*25\.0°.*vortex-lattice/);
    expect(() => solveMach({ stations: st }, 0.3, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 10 })).toThrow(/method\.spanwise/);
  });

  it("within the limit it stays within 3 % of DATCOM's swept-wing slope, where at 35° it would be 15 % above (DATCOM 4.1.3.2 / Polhamus NACA TN 1862 [M])", () => {
    for (const [sweep, A, lam] of [
      [15, 9, 0.4],
      [15, 6, 1],
      [10, 12, 0.4],
    ]) {
      const st = trapezoidalWing({ span: A, rootChord: 2 / (1 + lam), taperRatio: lam, sweepQuarterChordDeg: sweep });
      const tanHalf = Math.tan((wingGeometry(st).panels[0].sweepHalfChordDeg * Math.PI) / 180);
      const ll = buildLiftingLine(st, { mach: 0, rule: "prandtl-glauert" }).solve(() => 1).CL;
      expect(Math.abs(ll / datcom(A, tanHalf) - 1)).toBeLessThan(0.03);
    }
  });

  it("warns between 10° and the limit", () => {
    const st = trapezoidalWing({ span: 16, rootChord: 2, taperRatio: 0.5, sweepQuarterChordDeg: 12 });
    const sol = solveMach({ stations: st }, 0.3, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 10 });
    expect(sol.warnings.join(" ")).toMatch(/does not model sweep.*vortex lattice is recommended/);
  });
});

describe("critical Mach number by simple sweep theory, beside the conservative unswept value", () => {
  it("is the section value over cos Λc/4 (simple sweep theory, Busemann 1935 [M]; Anderson, swept wings [M]); the regime still follows the unswept value", () => {
    const sweep = 30;
    const st = trapezoidalWing({ span: 20, rootChord: 3, taperRatio: 0.4, sweepQuarterChordDeg: sweep }).map((s) => ({ ...s, cpMin: -0.6 }));
    const sol = solveMach({ stations: st }, 0.7, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 12 });
    // Section Mcr at Cp0,min = −0.60 under Prandtl–Glauert: 0.68857 (REFERENCES 1.4 [C]).
    expect(sol.machCritical).toBeCloseTo(0.68857, 5);
    expect(sol.machCriticalSwept).toBeCloseTo(0.68857 / Math.cos((sweep * Math.PI) / 180), 5);
    expect(sol.stationMachCriticalSwept[3]).toBeCloseTo(criticalMach("prandtl-glauert", -0.6) / Math.cos((30 * Math.PI) / 180), 10);
    const c = evaluateCase(sol, { id: "M0.70", mach: 0.7, altitude: 9000, alphaDeg: 2 });
    expect(c.regime).toBe("supercritical");
    expect(c.warnings.join(" ")).toMatch(/critical Mach number 0\.6886 .*conservative.*simple sweep theory.*0\.7951/);
  });

  it("an unswept wing has the same value both ways and no second figure in the warning", () => {
    const st = trapezoidalWing({ span: 20, rootChord: 2, taperRatio: 1 }).map((s) => ({ ...s, cpMin: -0.6 }));
    const sol = solveMach({ stations: st }, 0.7, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 8 });
    expect(sol.machCriticalSwept).toBeCloseTo(sol.machCritical!, 12);
    const c = evaluateCase(sol, { id: "x", mach: 0.7, altitude: 9000, alphaDeg: 2 });
    expect(c.warnings.join(" ")).not.toMatch(/simple sweep/);
  });
});
