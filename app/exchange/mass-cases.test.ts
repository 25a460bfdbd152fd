import { describe, expect, it } from "vitest";
import { dynamicPressure } from "../engine/atmosphere";
import { parseCase } from "./parse";
import { runCase } from "./run";

// wing.mass.items, massCases, cases[].massCase and cases[].tailLoad as /work/shared/CASE-EXCHANGE.md
// states them. Expected loads are beam statics worked from the inputs (common practice, no source).
const g0 = 9.80665;
const doc = () => ({
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
      { y: 8, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
    ],
    axis: { rootChordFraction: 0.25, tipChordFraction: 0.25 },
    mass: {
      kg: 300,
      items: [
        { id: "engine", kg: 600, x: 1.2, y: 3 },
        { id: "inner-tank", kg: 800, x: 0.9, yFrom: 1, yTo: 6 },
      ] as Record<string, unknown>[],
    },
  },
  method: { spanwise: "lifting-line", stations: 16 },
  massCases: [
    { id: "full", fill: {} },
    { id: "zero-fuel", fill: { "inner-tank": 0 } as Record<string, number> },
  ],
  cases: [
    { id: "A-full", mach: 0.4, altitude: 1000, weight: 90000, nz: 2.5, massCase: "full", tailLoad: -6000 } as Record<string, unknown>,
    { id: "A-zfw", mach: 0.4, altitude: 1000, weight: 80000, nz: 2.5, massCase: "zero-fuel" } as Record<string, unknown>,
    { id: "A-default", mach: 0.4, altitude: 1000, weight: 90000, nz: 2.5 } as Record<string, unknown>,
  ],
});

function problems(d: unknown) {
  const r = parseCase(d);
  if (r.ok) throw new Error("expected problems");
  return r.problems;
}

describe("mass items, mass cases and tail load in the exchange contract", () => {
  it("runs: the wing carries nz·W − tailLoad, and each mass case relieves its own items (root shear by equilibrium)", () => {
    const p = parseCase(doc());
    expect(p.ok ? [] : p.problems).toEqual([]);
    if (!p.ok) return;
    const r = runCase(p.value);
    const q = dynamicPressure(0.4, 1000);
    // A-full: wing lift 2.5·90 000 + 6000 = 231 000 N; relief 2.5·g·(300 + 600 + 800) = 41 678.26 N.
    expect(r.cases[0].cl).toBeCloseTo(231000 / (q * 32), 10);
    expect(r.cases[0].root.shear).toBeCloseTo(231000 / 2 - 2.5 * g0 * 1700, 2);
    // A-zfw: the tank is empty: relief 2.5·g·900.
    expect(r.cases[1].root.shear).toBeCloseTo(200000 / 2 - 2.5 * g0 * 900, 2);
    // No mass case: every item at full mass, no tail load.
    expect(r.cases[2].root.shear).toBeCloseTo(225000 / 2 - 2.5 * g0 * 1700, 2);
    // Root bending of the items alone, by hand: engine 600·g·3 + tank 800·g·3.5 (at 2.5 g) = 2.5·g·4600.
    const bendingNoItems = runCase({ ...p.value, wing: { ...p.value.wing, mass: { kg: 300, distribution: "chord" } }, massCases: undefined, cases: [{ id: "x", mach: 0.4, altitude: 1000, weight: 90000, nz: 2.5 }] }).cases[0].root.bending;
    expect(bendingNoItems - r.cases[2].root.bending).toBeCloseTo(2.5 * g0 * 4600, 3);
  });

  it("takes items without a structural mass (kg may be left out where items are given)", () => {
    const d = doc();
    delete (d.wing.mass as Record<string, unknown>).kg;
    expect(parseCase(d).ok).toBe(true);
    const e = { ...doc(), wing: { ...doc().wing, mass: {} } };
    expect(problems(e).map((x) => x.path)).toContain("wing.mass.kg");
  });

  it("names every broken rule by its field", () => {
    const d = doc();
    d.wing.mass.items.push({ id: "engine", kg: -1, x: 1, y: 9 });
    d.wing.mass.items.push({ id: "tank2", kg: 10, x: 1, yFrom: 5, yTo: 4 });
    d.wing.mass.items.push({ id: "both", kg: 10, x: 1, y: 2, yFrom: 1, yTo: 3 });
    d.wing.mass.items.push({ id: "neither", kg: 10, x: 1 });
    d.wing.mass.items.push({ id: "odd", kg: 10, x: 1, y: 2, weight: 3 });
    d.massCases[1].fill["outer-tank"] = 0.5;
    d.massCases[1].fill["inner-tank"] = 1.5;
    d.massCases.push({ id: "full", fill: {} });
    d.cases[1].massCase = "reserve";
    d.cases.push({ id: "alpha", mach: 0.4, altitude: 0, alpha: 2, tailLoad: 100 });
    const byPath = Object.fromEntries(problems(d).map((x) => [x.path, x.message]));
    expect(byPath["wing.mass.items[2].id"]).toMatch(/unique/);
    expect(byPath["wing.mass.items[2].kg"]).toMatch(/0 or more/);
    expect(byPath["wing.mass.items[2].y"]).toMatch(/inside the semispan, 0 to 8 m/);
    expect(byPath["wing.mass.items[3].yTo"]).toMatch(/greater than yFrom/);
    expect(byPath["wing.mass.items[4].y"]).toMatch(/not both/);
    expect(byPath["wing.mass.items[5].y"]).toMatch(/is required/);
    expect(byPath["wing.mass.items[6].weight"]).toMatch(/not a field/);
    expect(byPath["massCases[1].fill.outer-tank"]).toMatch(/names no item/);
    expect(byPath["massCases[1].fill.inner-tank"]).toMatch(/between 0 and 1/);
    expect(byPath["massCases[2].id"]).toMatch(/unique/);
    expect(byPath["cases[1].massCase"]).toMatch(/names no mass case/);
    expect(byPath["cases[3].tailLoad"]).toMatch(/only for a case given by weight and nz/);
  });
});
