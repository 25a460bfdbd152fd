import { describe, expect, it } from "vitest";
import { dynamicPressure } from "./atmosphere";
import { EngineError } from "./errors";
import { evaluateCase } from "./load-case";
import type { MassCase, MassItem } from "./mass";
import { fillOf, inertiaRelief, itemUnitLoads, itemsCentreX, itemsMassKg, validateMassCases, validateMassItems } from "./mass";
import { trapezoidalWing } from "./planform";
import { solveMach } from "./superposition";

// Expected values below are worked by hand from beam statics (equilibrium of the free body outboard
// of the cut: shear = Σ forces, bending = Σ force × arm, torsion = Σ force × (x_axis − x_cg));
// common practice of the trade, no source. g0 = 9.80665 m/s² (ICAO Doc 7488 / USSA 1976).
const g0 = 9.80665;
const engine: MassItem = { id: "engine", kg: 600, x: 1.2, y: 3 };
const fuel: MassItem = { id: "fuel", kg: 800, x: 0.9, yFrom: 1, yTo: 6 };
const y = [0, 2, 4, 7];
const axis = [1, 1, 1, 1];

describe("inertia relief of mass items, by hand-worked equilibrium", () => {
  it("a point mass of 600 kg at y = 3 m, 0.2 m aft of the axis: V = 5883.99 N, M = V·(3 − y), T = −0.2·V inboard of it, nothing outboard", () => {
    const l = itemUnitLoads(engine, y, axis);
    const W = 600 * g0; // 5883.99 N
    expect(W).toBeCloseTo(5883.99, 2);
    expect(l.shear).toEqual([W, W, 0, 0]);
    expect(l.bending[0]).toBeCloseTo(17651.97, 2); // 5883.99 × 3
    expect(l.bending[1]).toBeCloseTo(5883.99, 2); // × 1
    expect(l.torsion[0]).toBeCloseTo(-1176.798, 3); // 5883.99 × (1.0 − 1.2)
    expect(l.torsion[2]).toBe(0);
  });

  it("800 kg spread evenly over 1–6 m: at y = 0 all of it at 3.5 m; at y = 2 the 4 m outboard (6276.26 N) at 2 m; at y = 4, 3138.13 N at 1 m", () => {
    const l = itemUnitLoads(fuel, y, axis);
    const W = 800 * g0; // 7845.32 N, 1569.064 N per metre
    expect(l.shear[0]).toBeCloseTo(W, 9);
    expect(l.bending[0]).toBeCloseTo(27458.62, 2); // 7845.32 × 3.5
    expect(l.torsion[0]).toBeCloseTo(784.532, 3); // 7845.32 × (1.0 − 0.9)
    expect(l.shear[1]).toBeCloseTo(6276.256, 3); // 4 m × 1569.064
    expect(l.bending[1]).toBeCloseTo(12552.51, 2); // × 2 m
    expect(l.shear[2]).toBeCloseTo(3138.128, 3); // 2 m × 1569.064
    expect(l.bending[2]).toBeCloseTo(3138.128, 3); // × 1 m
    expect(l.shear[3]).toBe(0);
  });

  it("a mass case scales each item by its fill factor: reserve fuel (0.25) relieves a quarter of the fuel's load; items not named count fully", () => {
    const items = [engine, fuel].map((it) => ({ id: it.id, kg: it.kg, loads: itemUnitLoads(it, y, axis) }));
    const none = { shear: [0, 0, 0, 0], bending: [0, 0, 0, 0], torsion: [0, 0, 0, 0] };
    const reserve: MassCase = { id: "reserve", fill: { fuel: 0.25 } };
    const r = inertiaRelief(none, items, 2.5, reserve);
    // Root: 2.5 × (5883.99 + 0.25 × 7845.32) = 19613.30 N; bending 2.5 × (17651.97 + 0.25 × 27458.62) = 61291.56 N·m.
    expect(r.shear[0]).toBeCloseTo(19613.3, 1);
    expect(r.bending[0]).toBeCloseTo(61291.56, 1);
    // Torsion 2.5 × (−1176.798 + 0.25 × 784.532) = −2451.66 N·m.
    expect(r.torsion[0]).toBeCloseTo(-2451.663, 2);
    expect(fillOf(reserve, "engine")).toBe(1);
    expect(itemsMassKg([engine, fuel], reserve)).toBeCloseTo(800, 12);
    // Centre of gravity of the items: (600 × 1.2 + 200 × 0.9)/800 = 1.125 m.
    expect(itemsCentreX([engine, fuel], reserve)).toBeCloseTo(1.125, 12);
  });

  it("refuses items and mass cases that break the contract's rules, naming the field", () => {
    expect(() => validateMassItems([engine, { ...engine }], 8)).toThrow(/wing\.mass\.items\[1\]\.id: must be unique/);
    expect(() => validateMassItems([{ ...fuel, yTo: 9 }], 8)).toThrow(/items\[0\]\.yTo: must lie inside the semispan/);
    expect(() => validateMassItems([{ ...fuel, yFrom: 6, yTo: 5 }], 8)).toThrow(/yTo: must be greater than yFrom/);
    expect(() => validateMassItems([{ ...engine, kg: -1 }], 8)).toThrow(EngineError);
    expect(() => validateMassCases([{ id: "x", fill: { tank: 0.5 } }], [fuel])).toThrow(/massCases\[0\]\.fill\.tank: names no item/);
    expect(() => validateMassCases([{ id: "x", fill: { fuel: 1.2 } }], [fuel])).toThrow(/between 0 and 1/);
  });
});

describe("a trimmed case with mass items and a tail load: equilibrium of the whole semispan (beam statics)", () => {
  // Unswept rectangular wing, reference axis on the quarter-chord line (x = 0.5 m for a 2 m chord).
  const st = trapezoidalWing({ span: 16, rootChord: 2, taperRatio: 1, alphaL0: -2 });
  const items: MassItem[] = [
    { id: "engine", kg: 600, x: 1.2, y: 3 },
    { id: "fuel", kg: 800, x: 0.9, yFrom: 1, yTo: 6 },
  ];
  const sol = solveMach({ stations: st, massKg: 300, massItems: items }, 0.4, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 24 });
  const zeroFuel: MassCase = { id: "zero-fuel", fill: { fuel: 0 } };

  it("the wing carries nz·W − P: root shear = (nz·W − P)/2 − nz·g·(m_structure + Σ fill·m_item)", () => {
    const W = 90000;
    const nz = 2.5;
    const P = -6000; // a download on the tail puts more lift on the wing
    const c = evaluateCase(sol, { id: "A", mach: 0.4, altitude: 1000, weightN: W, nz, tailLoadN: P, massCase: zeroFuel });
    const q = dynamicPressure(0.4, 1000);
    expect(c.CL).toBeCloseTo((nz * W - P) / (q * 32), 12);
    expect(c.wingLift).toBeCloseTo(nz * W - P, 6);
    expect(c.tailLoad).toBe(P);
    expect(c.massCase).toBe("zero-fuel");
    // 2.5 × 9.80665 × (300 + 600 + 0 × 800) = 22064.96 N of relief at the root.
    expect(c.relief.shear[0]).toBeCloseTo(22064.96, 1);
    expect(c.root.shear).toBeCloseTo((nz * W - P) / 2 - 22064.96, 0);
    // The engine lies 0.7 m aft of the axis: nose-up torsion nz·g·600·0.7 = 10297.0 N·m (CASE-EXCHANGE sign rule).
    const full = evaluateCase(sol, { id: "B", mach: 0.4, altitude: 1000, weightN: W, nz, tailLoadN: P, massCase: { id: "no-engine", fill: { engine: 0, fuel: 0 } } });
    expect(c.root.torsion - full.root.torsion).toBeCloseTo(2.5 * g0 * 600 * 0.7, 6);
  });

  it("a mass case on a case given by α has no effect and says so", () => {
    const c = evaluateCase(sol, { id: "a", mach: 0.4, altitude: 1000, alphaDeg: 3, massCase: zeroFuel });
    expect(c.inertiaApplied).toBe(false);
    expect(c.relief.shear.every((v) => v === 0)).toBe(true);
    expect(c.warnings.join(" ")).toMatch(/mass case "zero-fuel" has no effect/);
  });
});

