import { describe, expect, it } from "vitest";
import { roundUp, roundedDataMax } from "./theme";

describe("an axis set to end at its data ends at a round value", () => {
  it("rounds up to a step of a fifth of the value's decade", () => {
    expect(roundUp(7.993832289925783)).toBe(8);
    expect(roundUp(8.7)).toBe(8.8);
    expect(roundUp(8.8)).toBe(8.8);
    expect(roundUp(0.93)).toBe(0.94);
    expect(roundUp(12.3)).toBe(14);
    expect(roundUp(26.24672)).toBe(28);
    expect(roundUp(-3.3)).toBe(-3.2);
    expect(roundUp(0)).toBe(0);
  });

  it("is what ECharts is given as the span axis's maximum", () => {
    expect(roundedDataMax({ max: 7.993832289925783 })).toBe(8);
  });
});
