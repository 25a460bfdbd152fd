import { describe, expect, it } from "vitest";
import { formatNumber, roundForDisplay } from "./units";

describe("values within round-off of zero are shown as 0", () => {
  it("tables and CSV get 0 for a round-off of zero, and the value to its significant figures otherwise", () => {
    expect(roundForDisplay(1.37e-15)).toBe(0);
    expect(roundForDisplay(-2.2e-12)).toBe(0);
    expect(Object.is(roundForDisplay(-2.2e-12), -0)).toBe(false);
    expect(roundForDisplay(0.30000000000000004, 12)).toBe(0.3);
    expect(roundForDisplay(123456.789)).toBe(123460);
    expect(roundForDisplay(-0.0012345678)).toBe(-0.0012346);
  });

  it("read-outs and tooltips print 0, never 1.37e-15 or -0", () => {
    expect(formatNumber(1.37e-15)).toBe("0");
    expect(formatNumber(-4e-7)).toBe("0");
    expect(formatNumber(-1.37e-15)).toBe("0");
    expect(formatNumber(0.01234)).toBe("0.01234");
    expect(formatNumber(31380)).toBe("31 380");
  });
});
