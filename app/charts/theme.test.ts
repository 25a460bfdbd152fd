import { describe, expect, it } from "vitest";
import { CHART_FONT, roundUp, roundedDataMax } from "./theme";

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

describe("the charts' font", () => {
  it("is a family list CSS (and so a canvas) accepts: a family name holding a number is quoted", () => {
    // CSS Fonts Level 4, §2.1 font-family: an unquoted family name is a sequence of identifiers, and an
    // identifier cannot start with a digit (CSS Syntax Level 3, §4.3.11); an invalid list is ignored.
    for (const family of CHART_FONT.split(",").map((f) => f.trim())) {
      if (/^(['"]).*\1$/.test(family)) continue;
      for (const word of family.split(/\s+/)) expect(word).toMatch(/^-?[A-Za-z_][\w-]*$/);
    }
    expect(CHART_FONT).toContain("Source Sans 3");
  });
});
