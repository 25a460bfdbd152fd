import { describe, expect, it } from "vitest";
import { convertTyped, toSIKeepingShown } from "./form-values";

// Exact unit definitions (international yard and pound, 1959; NIST SP 811 appendix B):
// 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 kt = 1852/3600 m/s.
const LB = 0.45359237;
const KT = 1852 / 3600;

describe("switching the units shown", () => {
  it("converts a typed number and a typed list, and leaves text that is not a number as typed", () => {
    expect(Number(convertTyped("6350", "mass", "SI", "US"))).toBeCloseTo(6350 / LB, 5);
    expect(convertTyped("0, 3048, 6096", "altitude", "SI", "US")).toBe("0, 10000, 20000");
    expect(convertTyped("fast", "speed", "SI", "US")).toBe("fast");
    expect(convertTyped("", "speed", "SI", "US")).toBe("");
  });

  it("goes back to the stored SI value exactly when the shown value was not changed", () => {
    const us = convertTyped("6350", "mass", "SI", "US", 6350) as string;
    // Ten figures shown in pounds, converted back by arithmetic alone, would give 6350.000001.
    expect(convertTyped(us, "mass", "US", "SI", 6350)).toBe("6350");
    expect(convertTyped(String(Number(us) + 1), "mass", "US", "SI", 6350)).not.toBe("6350");
  });
});

describe("typed values to SI", () => {
  it("stores what was typed in SI, and keeps the stored value of a number shown and not changed", () => {
    const shownVd = Number(convertTyped("150", "speed", "SI", "US", 150));
    const si = toSIKeepingShown({ vd: shownVd, vc: 220, altitudes: [0, 10000] }, "US", { vd: "speed", vc: "speed", altitudes: "altitude" }, { vd: 150, vc: 110, altitudes: [0, 3000] });
    expect(si.vd).toBe(150);
    expect(si.vc).toBeCloseTo(220 * KT, 12);
    expect(si.altitudes).toEqual([0, 10000 * 0.3048]);
  });
});
