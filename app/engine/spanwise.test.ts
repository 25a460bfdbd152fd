import { describe, expect, it } from "vitest";
import { compressibleSectionAt, sectionCriticalMach } from "./spanwise";
import type { WingStation } from "./planform";

const st: WingStation[] = [
  { y: 0, xLe: 0, chord: 2, twist: 0, a0: 6, alphaL0: -2, cmAc: -0.05, cpMin: -0.43 },
  { y: 5, xLe: 0.5, chord: 1, twist: -2, a0: 6, alphaL0: -1, cmAc: -0.04 },
];

describe("compressible section data", () => {
  it("scales the slope by 1/β under Prandtl–Glauert (Glauert 1928) and by the rule's Cp ratio otherwise", () => {
    const s = compressibleSectionAt(st, 0, "prandtl-glauert", 0.6);
    expect(s.a).toBeCloseTo(6 / 0.8, 12);
    const k = compressibleSectionAt(st, 0, "karman-tsien", 0.6);
    // KT at Cp0 = −0.43, M = 0.6: D = 0.8 + 0.2·(−0.43)/2 = 0.757 (closed form, REFERENCES 1.1).
    expect(k.scale).toBeCloseTo(1 / 0.757, 12);
    // No cpMin inside the panel (tip lacks it): the PG limit of the rule.
    expect(compressibleSectionAt(st, 2, "karman-tsien", 0.6).scale).toBeCloseTo(1.25, 12);
  });

  it("critical Mach number of the 12 % section case (Cp0,min = −0.43 → 0.73711 under PG, REFERENCES 1.4 [C])", () => {
    expect(sectionCriticalMach(st, 0, "prandtl-glauert")).toBeCloseTo(0.73711, 5);
    expect(sectionCriticalMach(st, 3, "prandtl-glauert")).toBeNull();
  });
});
