import { describe, expect, it } from "vitest";
import { dynamicPressure } from "../engine/atmosphere";
import { runCase } from "./run";
import { parsed, problems } from "./test-helpers";
import { resultToCsv } from "./csv";
import { attributionOf, rollingSideLabel } from "./rolling-labels";

// wing.aileron and cases[].roll (docs/exchange-format.md): a rolling case's loaded side carries the full
// airload and the down-going aileron, the other side the fraction and the up-going aileron, both less the same
// inertia relief. Expected values from equilibrium and beam statics, worked by hand (common practice, no source):
// a rectangular, unswept wing with its axis on the quarter chord, so the symmetric lift gives no torsion and the
// section moment q·c²·cm (cm = cmAc/β by Prandtl–Glauert) alone does.
const G0 = 9.80665;
const doc = () => ({
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
      { y: 8, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
    ],
    axis: { rootChordFraction: 0.25, tipChordFraction: 0.25 },
    mass: { kg: 300 },
    aileron: { yFrom: 5, yTo: 7.5, dClPerDeg: 0.04, dCmPerDeg: -0.01, deltaAtVa: 20 } as Record<string, unknown>,
  },
  method: { spanwise: "lifting-line", stations: 16 },
  cases: [
    { id: "sym", mach: 0.3, altitude: 0, weight: 60000, nz: 2 } as Record<string, unknown>,
    { id: "roll", mach: 0.3, altitude: 0, weight: 60000, nz: 2, roll: { fraction: 0.75, aileron: 12 } } as Record<string, unknown>,
    { id: "even", mach: 0.3, altitude: 0, weight: 60000, nz: 2, roll: { fraction: 1, aileron: 12 } } as Record<string, unknown>,
  ],
});

describe("rolling cases in the exchange contract", () => {
  it("root loads of both sides: shear by equilibrium, torsion from the section moments, plus or minus the aileron's increments", () => {
    const r = runCase(parsed(doc()));
    const roll = r.cases[1];
    const q = dynamicPressure(0.3, 0);
    const beta = Math.sqrt(1 - 0.09);
    const half = (2 * 60000) / 2; // nz·W on one semispan
    const relief = 2 * G0 * 300;
    const dL = q * 0.04 * 12 * 2 * 2.5; // q·Δcl·c·(yTo − yFrom)
    const dT = q * -0.01 * 12 * 4 * 2.5; // q·Δcm·c²·(yTo − yFrom)
    const symT = (q * 4 * 8 * -0.05) / beta;
    expect(roll.root.shear).toBeCloseTo(half - relief + dL, 3);
    expect(roll.roll!.other.root.shear).toBeCloseTo(0.75 * half - relief - dL, 3);
    expect(roll.root.torsion).toBeCloseTo(symT + dT, 3);
    expect(roll.roll!.other.root.torsion).toBeCloseTo(0.75 * symT - dT, 3);
    // With the full airload on both sides only the aileron differs: its lift at 5–7.5 m bends the root with
    // the arm of its centroid, 6.25 m, up on one side and down on the other.
    const even = r.cases[2];
    expect(even.root.bending - even.roll!.other.root.bending).toBeCloseTo(2 * dL * 6.25, 3);
    expect(roll.roll).toMatchObject({ fraction: 0.75, aileron: 12 });
    expect(roll.roll!.other.stations).toHaveLength(roll.stations!.length);
  });

  it("the envelope takes both sides and names the case and side of each extreme", () => {
    const r = runCase(parsed(doc()));
    const root = r.envelope[0];
    expect(root.shearMaxCase).toBe("roll (loaded side)");
    expect(root.shearMinCase).toBe("roll (other side)");
    expect(root.torsionMinCase).toBe("roll (loaded side)"); // the down-going aileron's nose-down moment
    expect(resultToCsv(r)).toMatch(/\nroll \(other side\),0,2,,,,/);
  });

  it("round-trips without loss, the moment increment defaulting to −0.01 per degree", () => {
    const d = doc();
    delete d.wing.aileron.dCmPerDeg;
    const once = parsed(d);
    const twice = parsed(JSON.parse(JSON.stringify(once)));
    expect(twice).toEqual(once);
    expect(twice.wing.aileron).toEqual({ yFrom: 5, yTo: 7.5, dClPerDeg: 0.04, dCmPerDeg: -0.01, deltaAtVa: 20 });
    expect(twice.cases[1].roll).toEqual({ fraction: 0.75, aileron: 12 });
    expect(twice.cases[0].roll).toBeUndefined();
  });

  it("names every broken rule by its field", () => {
    const d = doc();
    d.wing.aileron = { yFrom: 9, yTo: 12, dClPerDeg: 0.5, dCmPerDeg: 0.01, deltaAtVa: 0, chord: 0.3 };
    const byPath = problems(d);
    expect(byPath["wing.aileron.yFrom"]).toMatch(/inside the semispan, 0 to 8 m/);
    expect(byPath["wing.aileron.yTo"]).toMatch(/at most the semispan 8 m/);
    expect(byPath["wing.aileron.dClPerDeg"]).toMatch(/0 to 0.2 per degree/);
    expect(byPath["wing.aileron.dCmPerDeg"]).toMatch(/between −0.05 and 0/);
    expect(byPath["wing.aileron.deltaAtVa"]).toMatch(/above 0 and at most 40/);
    expect(byPath["wing.aileron.chord"]).toMatch(/not a field/);
    const e = doc();
    e.cases[1].roll = { fraction: 1.2, aileron: 50 };
    const eb = problems(e);
    expect(eb["cases[1].roll.fraction"]).toMatch(/above 0 and at most 1/);
    expect(eb["cases[1].roll.aileron"]).toMatch(/between 0 and 40/);
    const f = doc();
    delete (f.wing as Record<string, unknown>).aileron;
    expect(problems(f)["cases[1].roll.aileron"]).toMatch(/needs wing.aileron/);
    const g = doc();
    g.cases[1] = { id: "roll", mach: 0.3, altitude: 0, alpha: 4, roll: { fraction: 0.75 } };
    expect(problems(g)["cases[1].roll"]).toMatch(/only for a case given by weight and nz/);
  });
});

describe("a rolling case's sides by name", () => {
  it("names the sides in the envelope and reads them back", () => {
    expect(rollingSideLabel("W1-roll-VA", "other")).toBe("W1-roll-VA (other side)");
    expect(attributionOf("W1-roll-VA (loaded side)")).toEqual({ id: "W1-roll-VA", side: "loaded" });
    expect(attributionOf("W1-A")).toEqual({ id: "W1-A", side: null });
  });
});
