import { describe, expect, it } from "vitest";
import { fitSectionTable } from "./sections";

describe("fitSectionTable", () => {
  // A polar built from thin-airfoil theory in its linear range (cl = 2π(α − αL0), Glauert 1926 / Anderson Sec. 4.8)
  // with a stall shape past 12° and a constant cm about the aerodynamic centre at the quarter chord.
  const alphaL0 = -2;
  const rows = [] as { alphaDeg: number; cl: number; cm: number }[];
  for (let a = -8; a <= 18; a += 1) {
    const lin = 2 * Math.PI * (((a - alphaL0) * Math.PI) / 180);
    const cl = a <= 12 ? lin : 2 * Math.PI * ((14 * Math.PI) / 180) - 0.06 * (a - 12) ** 2;
    rows.push({ alphaDeg: a, cl, cm: -0.05 });
  }

  it("recovers a0 = 2π, αL0 and cmAc on the linear range and reports that range", () => {
    const f = fitSectionTable(rows);
    expect(f.a0PerRad).toBeCloseTo(2 * Math.PI, 6);
    expect(f.alphaL0Deg).toBeCloseTo(alphaL0, 6);
    expect(f.cmAc).toBeCloseTo(-0.05, 9);
    expect(f.linearRange.alphaMinDeg).toBe(-8);
    expect(f.linearRange.alphaMaxDeg).toBe(12);
    expect(f.residual).toBeLessThan(1e-9);
    expect(f.clMaxObserved).toBeCloseTo(Math.max(...rows.map((r) => r.cl)), 12);
  });

  it("takes cmAc as the zero-lift moment when the table's cm is about a point other than the a.c.", () => {
    // Moment about the quarter chord with the a.c. at 0.26c: cm_c/4 = cmAc − 0.01·cl (statics, common practice).
    const shifted = rows.filter((r) => r.alphaDeg <= 12).map((r) => ({ ...r, cm: -0.04 - 0.01 * r.cl }));
    expect(fitSectionTable(shifted).cmAc).toBeCloseTo(-0.04, 9);
  });

  it("rejects tables that are too short or have repeated angles", () => {
    expect(() => fitSectionTable(rows.slice(0, 2))).toThrow(/at least 3/);
    expect(() => fitSectionTable([rows[0], rows[0], rows[1]])).toThrow(/twice/);
  });
});
