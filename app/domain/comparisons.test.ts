import { describe, expect, it } from "vitest";
import { formatChange, formatPercent, rootCriticalCases, spreadOf } from "./comparisons";

describe("comparison helpers", () => {
  it("names each case giving a root extreme once, with every extreme it gives", () => {
    const row = { y: 0, shearMax: 3, shearMaxCase: "A", shearMin: -1, shearMinCase: "B", bendingMax: 9, bendingMaxCase: "A", bendingMin: -4, bendingMinCase: "C", torsionMax: 2, torsionMaxCase: "D", torsionMin: -2, torsionMinCase: "B" };
    expect(rootCriticalCases(row)).toEqual([
      { id: "A", gives: ["max shear", "max bending"] },
      { id: "B", gives: ["min shear", "min torsion"] },
      { id: "C", gives: ["min bending"] },
      { id: "D", gives: ["max torsion"] },
    ]);
    expect(rootCriticalCases(undefined)).toEqual([]);
  });

  it("prints a difference to the last digit of its reference, never as -0 or round-off", () => {
    // 313.52 has five significant figures: two decimals.
    expect(formatChange(0.22388, 313.52)).toBe("+0.22");
    expect(formatChange(-1.5e-15, 87.101)).toBe("0");
    expect(formatChange(-0.0149, 12.656)).toBe("−0.015");
    expect(formatChange(1234.5, 98765)).toBe("+1 235");
    expect(formatPercent(0.000714)).toBe("0.07 %");
    expect(formatPercent(-1e-9)).toBe("0 %");
  });

  it("takes the spread as largest minus smallest, relative to the largest magnitude", () => {
    expect(spreadOf([-18.035, -24.051, -30.205])).toEqual({ spread: -18.035 - -30.205, relative: (-18.035 - -30.205) / 30.205 });
    expect(spreadOf([0, 0, 0])).toEqual({ spread: 0, relative: 0 });
  });
});
