import { describe, expect, it } from "vitest";
import { dynamicPressure } from "../engine/atmosphere";
import { runCase } from "./run";
import { parsed, problems } from "./test-helpers";

// wing.flaps and cases[].flaps (docs/exchange-format.md): a case with flaps is solved on the wing with
// the flap's section increments over the flapped span. Expected values come from the superposition of
// linear lifting theory and beam statics, worked by hand (common practice, no source).
const doc = () => ({
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
      { y: 8, xLe: 0, chord: 2, twist: 0, a0: 6.0, alphaL0: -2, cmAc: -0.05 },
    ],
    axis: { rootChordFraction: 0.25, tipChordFraction: 0.25 },
    mass: { kg: 300 },
    flaps: { yFrom: 0, yTo: 8, dAlphaL0: -8, dCmAc: -0.12, clMax: 2.4 } as Record<string, unknown>,
  },
  method: { spanwise: "lifting-line", stations: 16 },
  cases: [
    { id: "clean", mach: 0.2, altitude: 0, weight: 60000, nz: 2 } as Record<string, unknown>,
    { id: "flaps", mach: 0.2, altitude: 0, weight: 60000, nz: 2, flaps: true } as Record<string, unknown>,
  ],
});

describe("flaps extended in the exchange contract", () => {
  it("a full-span flap at the same lift changes only the section moments: root torsion by q·c²·s·Δcm/β, shear and bending unchanged", () => {
    const r = runCase(parsed(doc()));
    const [clean, flaps] = r.cases;
    // Trimmed to the same nz·W, so the same CL; a uniform Δα_L0 shifts the zero-lift angle by exactly Δα_L0
    // and leaves the (zero) basic loading as it is, so the spanwise lift is the same.
    expect(flaps.cl).toBeCloseTo(clean.cl, 12);
    expect(flaps.alpha - clean.alpha).toBeCloseTo(-8, 6);
    expect(flaps.root.shear).toBeCloseTo(clean.root.shear, 6);
    expect(flaps.root.bending).toBeCloseTo(clean.root.bending, 4);
    // Prandtl–Glauert scales cm by 1/β; the lift acts on the axis (quarter chord), so torsion is ∫ q c² cm dy.
    const q = dynamicPressure(0.2, 0);
    expect(flaps.root.torsion - clean.root.torsion).toBeCloseTo((q * 4 * 8 * -0.12) / Math.sqrt(1 - 0.04), 3);
  });

  it("a part-span inboard flap: the same root shear (equilibrium of nz·W less the relief), less root bending (lift moves inboard)", () => {
    const d = doc();
    d.wing.flaps = { yFrom: 0.5, yTo: 4, dAlphaL0: -8, dCmAc: -0.12 };
    const r = runCase(parsed(d));
    const [clean, flaps] = r.cases;
    const g0 = 9.80665;
    expect(flaps.root.shear).toBeCloseTo(60000 - 2 * g0 * 300, 4);
    expect(clean.root.shear).toBeCloseTo(60000 - 2 * g0 * 300, 4);
    expect(flaps.root.bending).toBeLessThan(clean.root.bending);
    // The flapped span carries more of the lift: the section cl rises inboard and falls outboard.
    const at = (c: typeof clean, y: number) => c.stations!.reduce((best, s) => (Math.abs(s.y - y) < Math.abs(best.y - y) ? s : best)).cl;
    expect(at(flaps, 2)).toBeGreaterThan(at(clean, 2));
    expect(at(flaps, 7)).toBeLessThan(at(clean, 7));
  });

  it("round-trips without loss: the parsed document written as JSON and read again is the same", () => {
    const once = parsed(doc());
    const twice = parsed(JSON.parse(JSON.stringify(once)));
    expect(twice).toEqual(once);
    expect(twice.wing.flaps).toEqual({ yFrom: 0, yTo: 8, dAlphaL0: -8, dCmAc: -0.12, clMax: 2.4 });
    expect(twice.cases[1].flaps).toBe(true);
    expect(twice.cases[0].flaps).toBeUndefined();
  });

  it("names every broken rule by its field", () => {
    const d = doc();
    d.wing.flaps = { yFrom: 9, yTo: 12, dAlphaL0: -25, dCmAc: 0.9, span: 3 };
    const byPath = problems(d);
    expect(byPath["wing.flaps.yFrom"]).toMatch(/inside the semispan, 0 to 8 m/);
    expect(byPath["wing.flaps.yTo"]).toMatch(/at most the semispan 8 m/);
    expect(byPath["wing.flaps.dAlphaL0"]).toMatch(/within ±20°/);
    expect(byPath["wing.flaps.dCmAc"]).toMatch(/within ±0.6/);
    expect(byPath["wing.flaps.span"]).toMatch(/not a field/);
    const e = doc();
    e.cases[0].flaps = "yes";
    expect(problems(e)["cases[0].flaps"]).toMatch(/true or false/);
    const f = doc();
    delete (f.wing as Record<string, unknown>).flaps;
    expect(problems(f)["cases[1].flaps"]).toMatch(/needs wing.flaps/);
  });

  it("refuses a flapped section outside the refusal range, naming the flap's field, and computes nothing", () => {
    const d = doc();
    d.wing.stations[0].alphaL0 = -15;
    d.wing.stations[1].alphaL0 = -15;
    d.wing.flaps = { yFrom: 0, yTo: 4, dAlphaL0: -8, dCmAc: 0 };
    expect(() => runCase(parsed(d))).toThrow(/^wing\.flaps\.dAlphaL0: with the flaps extended stations\[\d\]\.alphaL0 -23 is outside -20 to 20/);
  });
});
