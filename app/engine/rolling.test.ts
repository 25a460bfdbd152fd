import { describe, expect, it } from "vitest";
import { aileronCmIncrement, aileronDeflections, aileronLift, aileronMoments, rollingLoadFactor, rollingSides, rollingVnPoints, sideLoads, unsymmetricalFraction } from "./rolling";
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

// The aileron's lift increment by strip theory and the two sides, worked by hand from statics (common
// practice, no source): a running load q·c·Δcl at the quarter chord over the aileron span.
describe("aileron lift increment and the two sides of a rolling case", () => {
  const rect = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 1 }); // c = 2 m, xLe = 0, semispan 5 m
  const xRefAt = (frac: number, y: number[]) => y.map(() => frac * 2);

  it("rectangular wing, aileron 3–5 m, q = 10 kPa, Δcl = 0.5: root shear q·Δcl·c·2 m = 20 kN, bending 20 kN × 4 m", () => {
    const y = [0, 4, 5];
    const l = aileronLift(rect, y, xRefAt(0.25, y), 10000, 0.5, { yFrom: 3, yTo: 5 }, { sin: 0, cos: 1 });
    expect(l.shear[0]).toBeCloseTo(20000, 8);
    expect(l.bending[0]).toBeCloseTo(80000, 7);
    expect(l.shear[1]).toBeCloseTo(10000, 8); // 1 m of the aileron outboard of y = 4
    expect(l.bending[1]).toBeCloseTo(5000, 8); // 10 kN at 0.5 m
    expect(l.shear[2]).toBe(0);
    expect(l.torsion[0]).toBeCloseTo(0, 9); // lift on the quarter-chord axis: no torsion
    // Axis at 40 % chord (0.8 m): the lift acts at 0.5 m, 0.3 m ahead of it, nose up: 20 kN × 0.3 m.
    const aft = aileronLift(rect, [0], xRefAt(0.4, [0]), 10000, 0.5, { yFrom: 3, yTo: 5 }, { sin: 0, cos: 1 });
    expect(aft.torsion[0]).toBeCloseTo(6000, 8);
    // A swept axis resolves the rolling moment: bending Mx·cos Λ, torsion Mx·sin Λ.
    const sw = aileronLift(rect, [0], xRefAt(0.25, [0]), 10000, 0.5, { yFrom: 3, yTo: 5 }, { sin: 0.6, cos: 0.8 });
    expect(sw.bending[0]).toBeCloseTo(64000, 7);
    expect(sw.torsion[0]).toBeCloseTo(48000, 7);
  });

  it("tapered wing c = 2 − 0.2η: ∫₃⁵ c dη = 2.4 m², ∫₃⁵ c·η dη = 9.46667 m³ (by hand)", () => {
    const tap = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5 });
    const y = [0];
    const l = aileronLift(tap, y, [0], 10000, 0.5, { yFrom: 3, yTo: 5 }, { sin: 0, cos: 1 });
    expect(l.shear[0]).toBeCloseTo(5000 * 2.4, 6);
    expect(l.bending[0]).toBeCloseTo(5000 * 9.466667, 2);
  });

  it("sides: loaded = full airload + down-going aileron, other = fraction of it + up-going aileron, each less the same relief", () => {
    // δ = 10°, Δcl/δ = 0.05 → Δcl = 0.5 (20 kN, 80 kN·m at the root as above); Δcm/δ = −0.01 → Δcm = −0.1, q·Δcm·c²·2 m = −8 kN·m.
    const c = {
      y: [0],
      dynamicPressure: 10000,
      shear: [100000],
      bending: [300000],
      torsion: [-20000],
      relief: { shear: [10000], bending: [30000], torsion: [1000] },
    };
    const s = rollingSides(c, { stations: rect, xRef: [0.5], axis: { sin: 0, cos: 1 } }, { fraction: 0.75, aileronDeg: 10 }, { yFrom: 3, yTo: 5, dClPerDeg: 0.05, dCmPerDeg: -0.01 });
    expect(s.loaded.shear[0]).toBeCloseTo(120000, 6);
    expect(s.loaded.bending[0]).toBeCloseTo(380000, 5);
    expect(s.loaded.torsion[0]).toBeCloseTo(-28000, 6);
    // 0.75·(100 + 10) − 10 − 20 = 52.5 kN; 0.75·(300 + 30) − 30 − 80 = 137.5 kN·m; 0.75·(−20 + 1) − 1 + 8 = −7.25 kN·m.
    expect(s.other.shear[0]).toBeCloseTo(52500, 6);
    expect(s.other.bending[0]).toBeCloseTo(137500, 5);
    expect(s.other.torsion[0]).toBeCloseTo(-7250, 6);
    // Without a deflection only the airload differs; a deflection without an aileron is refused, naming the field.
    expect(rollingSides(c, { stations: rect, xRef: [0.5], axis: { sin: 0, cos: 1 } }, { fraction: 0.6, aileronDeg: 0 }, undefined).other.shear[0]).toBeCloseTo(56000, 9);
    expect(() => rollingSides(c, { stations: rect, xRef: [0.5], axis: { sin: 0, cos: 1 } }, { fraction: 1, aileronDeg: 5 }, undefined, "cases[2].roll")).toThrow(/needs the aileron/);
  });
});

// The generated points: 14 CFR 23.349(a), 23.455, 25.349(a) as remembered [M]; arithmetic by hand.
describe("rolling points of a V–n diagram", () => {
  const a = { name: "A", veas: 60, nz: 3.8, rule: "" };
  const f = { name: "F", veas: 90, nz: -1.5, rule: "" };
  it("Part 25: roll-VA, roll-VC, roll-VD at 2/3·n1 with δ_A, δ_A·V_A/V_C, δ_A·V_A/(3V_D), full airload on both sides (25.349(a))", () => {
    const pts = rollingVnPoints({ part: "25", a: { ...a, nz: 2.5 }, vcEas: 120, vdEas: 150, deltaAtVa: 18 });
    expect(pts.map((p) => p.name)).toEqual(["roll-VA", "roll-VC", "roll-VD"]);
    for (const p of pts) expect(p.nz).toBeCloseTo(2.5 * (2 / 3), 12);
    expect(pts.map((p) => p.veas)).toEqual([60, 120, 150]);
    expect(pts[0].roll).toEqual({ fraction: 1, aileron: 18 });
    expect(pts[1].roll!.aileron).toBeCloseTo(9, 12); // 18·60/120
    expect(pts[2].roll!.aileron).toBeCloseTo(2.4, 12); // 18·60/(3·150)
    expect(pts[0].rule).toMatch(/^14 CFR 25\.349\(a\)/);
  });
  it("Part 23 normal: unsym-A with 75 % on the other side at n1 (23.349(a)), then the aileron points of 23.455 at 2/3·n1", () => {
    const pts = rollingVnPoints({ part: "23", category: "normal", a, f, vcEas: 80, vdEas: 110, deltaAtVa: 20 });
    expect(pts.map((p) => p.name)).toEqual(["unsym-A", "roll-VA", "roll-VC", "roll-VD"]);
    expect(pts[0]).toMatchObject({ veas: 60, nz: 3.8, roll: { fraction: 0.75, aileron: 0 } });
    expect(pts[0].rule).toMatch(/23\.349\(a\).*75 %/);
    expect(pts[1].nz).toBeCloseTo(3.8 * (2 / 3), 12);
    expect(pts[2].roll!.aileron).toBeCloseTo(15, 12); // 20·60/80
    expect(pts[3].rule).toMatch(/23\.455.*23\.349\(b\)/);
  });
  it("Part 23 acrobatic: 60 % in conditions A and F; without an aileron only the unsymmetrical points", () => {
    const pts = rollingVnPoints({ part: "23", category: "acrobatic", a, f, vcEas: 80, vdEas: 110 });
    expect(pts.map((p) => [p.name, p.nz, p.roll!.fraction])).toEqual([["unsym-A", 3.8, 0.6], ["unsym-F", -1.5, 0.6]]);
  });
});
