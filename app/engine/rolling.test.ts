import { describe, expect, it } from "vitest";
import { aileronCmIncrement, aileronDeflections, aileronMoments, rollingLoadFactor, sideLoads, unsymmetricalFraction } from "./rolling";
import { trapezoidalWing } from "./planform";

// Paragraph values are those of 14 CFR 23.349, 23.455 and 25.349 as remembered [M] (confirm against the
// text); the moments are worked by hand from statics (common practice, no source).
describe("rolling and unsymmetrical conditions", () => {
  it("the other side's airload: 75 % (23.349(a), condition A), 60 % acrobatic (A and F), 80 % for Part 25 gusts (25.349(b))", () => {
    expect(unsymmetricalFraction("23", "normal")).toMatchObject({ value: 0.75, rule: "14 CFR 23.349(a)(2)", conditions: ["A"] });
    expect(unsymmetricalFraction("23", "acrobatic")).toMatchObject({ value: 0.6, conditions: ["A", "F"] });
    expect(unsymmetricalFraction("25").value).toBe(0.8);
  });

  it("rolling load factor two thirds of n1; aileron deflections δ_C = δ_A·V_A/V_C, δ_D = δ_A·V_A/(3V_D)", () => {
    expect(rollingLoadFactor("25", 2.5)).toEqual({ value: 2.5 * (2 / 3), rule: "14 CFR 25.349(a)" });
    const d = aileronDeflections({ vaEas: 80, vcEas: 120, vdEas: 160, deltaAtVa: 20 }, "23");
    expect(d.va.value).toBe(20);
    expect(d.vc.value).toBeCloseTo(13.3333333, 6);
    expect(d.vd.value).toBeCloseTo(3.3333333, 6);
    expect(aileronCmIncrement(20)).toEqual({ value: -0.2, rule: "14 CFR 23.349(b)" });
  });

  it("aileron moment increment over 3–5 m of a 2 m chord, q = 10 kPa, Δcm = −0.1: root torsion q·Δcm·c²·2 m = −8000 N·m", () => {
    const wing = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 1 });
    const m = aileronMoments(wing, [0, 4, 5], 10000, -0.1, { yFrom: 3, yTo: 5 }, { sin: 0, cos: 1 });
    expect(m.torsion[0]).toBeCloseTo(-8000, 9);
    expect(m.torsion[1]).toBeCloseTo(-4000, 9);
    expect(m.torsion[2]).toBe(0);
    expect(m.bending[0]).toBe(0);
    // Tapered: c from 2 to 1 over 5 m; ∫_3^5 c² dy = ∫ (2 − y/5)² dy = 5·(1.4³ − 1)/3 = 2.906667 (by hand).
    const tap = aileronMoments(trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5 }), [0], 10000, -0.1, { yFrom: 3, yTo: 5 }, { sin: 0, cos: 1 });
    expect(tap.torsion[0]).toBeCloseTo(-1000 * 2.906667, 2);
    // A swept axis resolves the couple: torsion My·cos Λ, bending −My·sin Λ.
    const sw = aileronMoments(wing, [0], 10000, -0.1, { yFrom: 3, yTo: 5 }, { sin: 0.6, cos: 0.8 });
    expect(sw.torsion[0]).toBeCloseTo(-6400, 9);
    expect(sw.bending[0]).toBeCloseTo(4800, 9);
  });

  it("side loads: the fraction of the airload less the same inertia relief, plus the aileron's moments", () => {
    const c = { shear: [80, 40], bending: [200, 50], torsion: [-30, -10], relief: { shear: [20, 10], bending: [60, 15], torsion: [5, 2] } };
    const low = sideLoads(c, 0.75);
    expect(low.shear).toEqual([55, 27.5]); // 0.75·100 − 20, 0.75·50 − 10
    expect(low.bending).toEqual([135, 33.75]); // 0.75·260 − 60, 0.75·65 − 15
    expect(low.torsion).toEqual([-23.75, -8]); // 0.75·(−25) − 5, 0.75·(−8) − 2
    const high = sideLoads(c, 1, { shear: [0, 0], bending: [0, 0], torsion: [-100, -50] });
    expect(high.torsion).toEqual([-130, -60]);
  });
});
