import { describe, expect, it } from "vitest";
import { formatNumber, messageInUnits, roundForDisplay } from "./units";

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

describe("engine messages in the chosen units (factors: NIST SP 811 App. B — 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 lbf = 4.4482216152605 N, 1 kt = 1852/3600 m/s, 1 lbf/ft² = 47.88026 Pa)", () => {
  it("leaves SI messages as the engine wrote them", () => {
    const m = "station y = 3.048 m: cl 1.200 exceeds the section clMax 1.100";
    expect(messageInUnits(m, "SI")).toBe(m);
  });
  it("converts lengths, ranges of lengths, masses, forces, speeds and wing loading", () => {
    expect(messageInUnits("station y = 3.048 m: cl 1.200 exceeds the section clMax 1.100", "US")).toBe("station y = 10 ft: cl 1.200 exceeds the section clMax 1.100");
    expect(messageInUnits("panel 2 (y = 0.3048–6.096 m) is swept 12.0°", "US")).toBe("panel 2 (y = 1–20 ft) is swept 12.0°");
    expect(messageInUnits("wing loading W/S = 4788.026 N/m² is unusual", "US")).toBe("wing loading W/S = 100 psf is unusual");
    expect(messageInUnits("a mass of 453.59237 kg", "US")).toBe("a mass of 1 000 lb");
    expect(messageInUnits("a load of 4448.2216 N and 1355.8179 N·m", "US")).toBe("a load of 1 000 lbf and 1 000 lbf·ft");
    expect(messageInUnits("at 25.722222 m/s EAS", "US")).toBe("at 50 kt EAS");
  });
  it("leaves numbers that carry no SI unit alone (Mach, cl, degrees, counts)", () => {
    const m = "the prandtl-glauert rule is singular at Mach 0.85 over 3 stations at 12.5°";
    expect(messageInUnits(m, "US")).toBe(m);
  });
});
