import { describe, expect, it, vi } from "vitest";
import { formatCount, formatDecimal, formatNumber, messageInUnits, roundForDisplay } from "./units";

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

// The reference is ICU's en-GB number formatting (Intl.NumberFormat in Node), which the page's own
// formatter must reproduce digit for digit: half away from zero on the shortest decimal of the double.
describe("numbers written as en-GB's Intl.NumberFormat writes them, without Intl", () => {
  const intl = (x: number, max: number, min = 0) => new Intl.NumberFormat("en-GB", { maximumFractionDigits: max, minimumFractionDigits: min }).format(x).replace(/,/g, " ");
  const awkward = [0, -0, 1, -1, 0.5, 1.5, 2.5, -2.5, 0.125, 1.005, -1.005, 2.675, 1.0049999, 999.9995, 9.9999999, 0.0004, 0.0005, -0.0005, 5e-7, 1.37e-15,
    31380, 1234.5, 99999.5, 1e6, 123456789.123, 2 ** 53, 1e21, 1.2345e25, 0.1 + 0.2, 4.35, 1.45, 8.345, 1e-7, 123.456e-10];
  // A fixed spread of magnitudes and mantissas (deterministic: no random input in tests).
  const spread = Array.from({ length: 2000 }, (_, i) => (i % 2 ? -1 : 1) * ((i * 7919) % 10007) * 10 ** ((i % 23) - 11) * (1 + (i % 97) / 1000));
  it("matches Intl.NumberFormat for 0–6 decimals, with and without trailing zeros", () => {
    for (const x of [...awkward, ...spread])
      for (let max = 0; max <= 6; max++) {
        expect(formatDecimal(x, max), `${x} to ${max}`).toBe(intl(x, max));
        expect(formatDecimal(x, max, max), `${x} to exactly ${max}`).toBe(intl(x, max, max));
      }
  });
  it("writes counts with commas, as toLocaleString('en-GB') does", () => {
    for (const n of [0, 7, 999, 1000, 228, 100000, 1234567]) expect(formatCount(n)).toBe(n.toLocaleString("en-GB"));
  });
  it("never makes an Intl formatter: the first one costs a page 60–120 ms of main thread to load locale data", async () => {
    vi.resetModules();
    const made = vi.spyOn(Intl, "NumberFormat");
    const locale = vi.spyOn(Number.prototype, "toLocaleString");
    try {
      const units = await import("./units");
      const comparisons = await import("./comparisons");
      for (const x of [1.5, 31380, -0.0123, 1e-9]) units.formatNumber(x);
      units.formatCount(100000);
      comparisons.formatChange(1234.5, 98765);
      expect(made).not.toHaveBeenCalled();
      expect(locale).not.toHaveBeenCalled();
    } finally {
      made.mockRestore();
      locale.mockRestore();
    }
  });
});
