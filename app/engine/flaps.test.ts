import { describe, expect, it } from "vitest";
import { UNITS } from "./certification";
import { dynamicPressure } from "./atmosphere";
import { EngineError } from "./errors";
import { evaluateCase } from "./load-case";
import { flappedStations, flapsLimits, flapsVnPoints, minimumFlapSpeed } from "./flaps";
import { trapezoidalWing } from "./planform";
import { solveMach } from "./superposition";

const wing = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 1, alphaL0: -2, cmAc: -0.05 });

describe("the wing with flaps extended", () => {
  it("applies the increments inside the flapped span only, with a short blend at an interior end", () => {
    const st = flappedStations(wing, { yFrom: 1, yTo: 3, dAlphaL0: -8, dCmAc: -0.12, clMax: 2.3 });
    const at = (y: number) => st.find((s) => Math.abs(s.y - y) < 1e-12)!;
    expect(st.map((s) => s.y)).toEqual([0, 1, 1.02, 2.98, 3, 5]);
    expect(at(1).alphaL0).toBe(-2);
    expect(at(1.02).alphaL0).toBe(-10);
    expect(at(2.98).cmAc).toBeCloseTo(-0.17, 12);
    expect(at(2.98).clMax).toBe(2.3);
    expect(at(3).cmAc).toBe(-0.05);
    expect(st.every((s) => s.chord === 2)).toBe(true);
  });

  it("a full-span flap moves the wing's zero-lift angle by exactly Δα_L0 (superposition of the linear theory: the same section shift everywhere) and its root torsion by q·∫c²·Δcm (REFERENCES §4)", () => {
    const opts = { spanwise: "lifting-line" as const, rule: "prandtl-glauert" as const, stations: 16 };
    const clean = solveMach({ stations: wing }, 0.2, opts);
    const full = solveMach({ stations: flappedStations(wing, { yFrom: 0, yTo: 5, dAlphaL0: -8, dCmAc: -0.1 }) }, 0.2, opts);
    expect(full.alphaZeroLiftDeg - clean.alphaZeroLiftDeg).toBeCloseTo(-8, 8);
    const lc = { id: "a", mach: 0.2, altitude: 0, alphaDeg: 2 };
    // Same CL at the same angle measured from zero lift, so the only change of root torsion is the moment term:
    // q·c²·Δcm/β·s with c = 2 m, s = 5 m, β = √(1 − 0.04) (Prandtl–Glauert scales cm by 1/β).
    const a = evaluateCase(clean, lc);
    const b = evaluateCase(full, { ...lc, alphaDeg: 2 - 8 });
    const q = dynamicPressure(0.2, 0);
    expect(b.CL).toBeCloseTo(a.CL, 10);
    expect(b.root.torsion - a.root.torsion).toBeCloseTo((q * 4 * -0.1 * 5) / Math.sqrt(0.96), 4);
  });

  it("a part-span flap moves the zero-lift angle part of the way", () => {
    const opts = { spanwise: "vortex-lattice" as const, rule: "prandtl-glauert" as const, stations: 16 };
    const clean = solveMach({ stations: wing }, 0.2, opts).alphaZeroLiftDeg;
    const part = solveMach({ stations: flappedStations(wing, { yFrom: 0.5, yTo: 3, dAlphaL0: -8, dCmAc: 0 }) }, 0.2, opts).alphaZeroLiftDeg;
    expect(part - clean).toBeLessThan(-2);
    expect(part - clean).toBeGreaterThan(-8);
  });

  it("refuses a flap outside the wing, naming the field", () => {
    expect(() => flappedStations(wing, { yFrom: 4, yTo: 6, dAlphaL0: -8, dCmAc: 0 })).toThrow(/flaps\.yTo/);
    expect(() => flappedStations(wing, { yFrom: 3, yTo: 2, dAlphaL0: -8, dCmAc: 0 })).toThrow(EngineError);
  });
});

describe("flaps-extended limits and V–n points (14 CFR 23.345 / 25.345 [M])", () => {
  it("n = 2.0 and ±25 ft/s = 7.62 m/s at V_F, each traced to its paragraph; Part 25's gust is 12.5 chords", () => {
    const l25 = flapsLimits("25");
    expect(l25.nPositive).toEqual({ value: 2, rule: "14 CFR 25.345(a)(1)" });
    expect(l25.gust.value).toBeCloseTo(7.62, 12);
    expect(l25.gust.rule).toBe("14 CFR 25.345(a)(2)");
    expect(l25.gradientChords).toBe(12.5);
    expect(flapsLimits("23").nPositive.rule).toBe("14 CFR 23.345(a)(1)");
  });

  it("minimum V_F: Part 23 the greater of 1.4·V_S and 1.8·V_SF; Part 25 1.8·V_S0", () => {
    expect(minimumFlapSpeed("23", 40, 30).value).toBeCloseTo(56, 12);
    expect(minimumFlapSpeed("23", 40, 35).value).toBeCloseTo(63, 12);
    expect(minimumFlapSpeed("25", 60, 50)).toEqual({ value: 90, rule: "14 CFR 25.335(e)(3)" });
  });

  // Worked aircraft of REFERENCES 6.5 (SI at sea level, a = 5 /rad): Pratt's Δn at 200 kt with 50 ft/s is
  // 2.29841; the formula is linear in V and U, so at V_F = 120 kt with 25 ft/s it is 2.29841·0.6·0.5 = 0.689523.
  const base = { weightN: 6000 * UNITS.lbfToN, areaM2: 180 * UNITS.ftToM ** 2, clMaxFlaps: 2.2, vfEas: 120 * UNITS.ktToMs, density: 1.225, meanChord: 5 * UNITS.ftToM, liftSlope: 5 };

  it("Part 23: the gust points by Pratt's formula, n = 1 ± 0.689523; flaps-A on the flapped stall line at n = 2", () => {
    const r = flapsVnPoints({ ...base, part: "23" });
    const by = Object.fromEntries(r.points.map((p) => [p.name, p]));
    expect(by["flaps-gust+VF"].nz).toBeCloseTo(1.689523, 4);
    expect(by["flaps-gust-VF"].nz).toBeCloseTo(1 - 0.689523, 4);
    expect(by["flaps-VF"]).toMatchObject({ nz: 2, rule: "14 CFR 23.345(a)(1)" });
    // V_SF = √(2W/(ρ0 S CLmax,F)) (REFERENCES 6.6), A at V_SF·√2.
    const vsf = Math.sqrt((2 * base.weightN) / (1.225 * base.areaM2 * 2.2));
    expect(by["flaps-A"].veas).toBeCloseTo(vsf * Math.SQRT2, 10);
  });

  it("Part 25: the 12.5-chord gust on the rigid plunging aircraft, within 0.5 % of Pratt's K_g there (NACA Report 1206)", () => {
    const r = flapsVnPoints({ ...base, part: "25" });
    expect(r.prattKg).toBeCloseTo(0.76389, 4);
    expect(Math.abs(r.gustFactor / r.prattKg - 1)).toBeLessThan(0.005);
    const by = Object.fromEntries(r.points.map((p) => [p.name, p]));
    expect(by["flaps-gust+VF"].nz - 1).toBeCloseTo((0.689523 * r.gustFactor) / r.prattKg, 4);
    expect(by["flaps-gust+VF"].rule).toMatch(/25\.345\(a\)\(2\)/);
  });
});
