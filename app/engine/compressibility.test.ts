import { describe, expect, it } from "vitest";
import { compressibleCp, criticalCp, criticalMach, prandtlGlauertBeta, sectionScaleFactor } from "./compressibility";
import type { CompressibilityRule } from "./compressibility";
import { EngineError } from "./errors";

describe("corrected Cp of the three rules", () => {
  // REFERENCES 1.2 [C], computed from the closed forms of Glauert 1928 (PG), Tsien 1939 / von Kármán 1941 (KT)
  // and Laitone 1951; table given to 5 decimals, so 5e-6 absolute.
  const rows: [number, number, number, number, number, number, number][] = [
    [0.45, -0.39192, -0.40032, -0.41092, -0.55989, -0.57718, -0.59949],
    [0.6, -0.4375, -0.45752, -0.48911, -0.625, -0.66667, -0.73594],
    [0.72, -0.50434, -0.54652, -0.63672, -0.72049, -0.80976, -1.02488],
    [0.78, -0.5593, -0.62468, -0.80471, -0.799, -0.93945, -1.41584],
  ];
  it.each(rows)("M = %d", (M, pg35, kt35, la35, pg5, kt5, la5) => {
    expect(compressibleCp("prandtl-glauert", -0.35, M)).toBeCloseTo(pg35, 5);
    expect(compressibleCp("karman-tsien", -0.35, M)).toBeCloseTo(kt35, 5);
    expect(compressibleCp("laitone", -0.35, M)).toBeCloseTo(la35, 5);
    expect(compressibleCp("prandtl-glauert", -0.5, M)).toBeCloseTo(pg5, 5);
    expect(compressibleCp("karman-tsien", -0.5, M)).toBeCloseTo(kt5, 5);
    expect(compressibleCp("laitone", -0.5, M)).toBeCloseTo(la5, 5);
  });

  it("Kármán–Tsien hand checks: −2/3 at M = 0.6 and −1 at M = 0.8 for Cp0 = −0.5 (REFERENCES 1.2, exact)", () => {
    expect(compressibleCp("karman-tsien", -0.5, 0.6)).toBeCloseTo(-2 / 3, 12);
    expect(compressibleCp("karman-tsien", -0.5, 0.8)).toBeCloseTo(-1, 12);
  });

  it("refuses M ≥ 1 and flags a singular Laitone denominator", () => {
    expect(() => prandtlGlauertBeta(1)).toThrow(/below 1/);
    expect(() => compressibleCp("laitone", -1.2, 0.95)).toThrow(EngineError);
  });
});

describe("critical pressure coefficient (isentropic, γ = 1.4; NACA Report 1135)", () => {
  // REFERENCES 1.3 [C] from the formula of NACA Report 1135 / Anderson Sec. 11.6; 5 decimals.
  it.each([
    [0.3, -6.94732],
    [0.5, -2.1334],
    [0.6, -1.29434],
    [0.7, -0.77907],
    [0.74, -0.62599],
    [0.8, -0.43464],
    [0.9, -0.18786],
    [1.0, 0],
  ])("Cp*(%d)", (M, cps) => expect(criticalCp(M)).toBeCloseTo(cps, 5));
});

describe("critical Mach number (root of Cp_rule(Cp0,min, M) = Cp*(M))", () => {
  // REFERENCES 1.4 [C]: roots computed from the rules' closed forms (sources as above); 5 decimals.
  const rows: [number, number, number, number][] = [
    [-0.35, 0.7645, 0.75213, 0.73081],
    [-0.43, 0.73711, 0.7229, 0.70005],
    [-0.6, 0.68857, 0.6714, 0.64657],
  ];
  it.each(rows)("Cp0,min = %d", (cp0, pg, kt, la) => {
    expect(criticalMach("prandtl-glauert", cp0)).toBeCloseTo(pg, 5);
    expect(criticalMach("karman-tsien", cp0)).toBeCloseTo(kt, 5);
    expect(criticalMach("laitone", cp0)).toBeCloseTo(la, 5);
  });

  it("textbook case: 12 % symmetric section, Cp0,min = −0.43 → Mcr ≈ 0.74 under PG (Anderson Sec. 11.6 example [M])", () => {
    expect(Math.abs(criticalMach("prandtl-glauert", -0.43) - 0.74)).toBeLessThan(0.005);
  });

  it("Anderson Fig. 11.5 illustration: Cp0 = −0.98938 gives Mcr(PG) = 0.6077 (REFERENCES 1.4 [V + C])", () => {
    expect(criticalMach("prandtl-glauert", -0.98938)).toBeCloseTo(0.6077, 4);
  });

  it("brackets the FIRST crossing for strongly negative Cp0 where Laitone's denominator goes through zero", () => {
    const rules: CompressibilityRule[] = ["prandtl-glauert", "karman-tsien", "laitone"];
    for (const rule of rules) {
      for (const cp0 of [-0.05, -0.2, -1.0, -2.0, -4.0]) {
        const m = criticalMach(rule, cp0);
        expect(m).toBeGreaterThan(0);
        expect(m).toBeLessThan(1);
        // Residual at the root, and the corrected Cp is above Cp* just below it (no earlier crossing).
        expect(Math.abs(compressibleCp(rule, cp0, m) - criticalCp(m))).toBeLessThan(1e-8);
        for (let k = 1; k < 50; k++) {
          const mm = (m * k) / 50;
          expect(compressibleCp(rule, cp0, mm)).toBeGreaterThan(criticalCp(mm));
        }
      }
    }
    // The ordering Laitone < KT < PG holds for every Cp0 because Laitone amplifies most (REFERENCES 1.4 rows).
    expect(criticalMach("laitone", -2)).toBeLessThan(criticalMach("karman-tsien", -2));
    expect(criticalMach("karman-tsien", -2)).toBeLessThan(criticalMach("prandtl-glauert", -2));
  });

  it("requires a negative Cp0,min", () => {
    expect(() => criticalMach("laitone", 0.1)).toThrow(EngineError);
  });
});

describe("section scaling of slope and cm", () => {
  // REFERENCES 1.5 [C]: a = a0/β with a0 = 2π (Glauert 1928 / Anderson Sec. 11.4 [M]); 5 decimals.
  it.each([
    [0.3, 6.58657],
    [0.5, 7.2552],
    [0.6, 7.85398],
    [0.7, 8.79822],
    [0.8, 10.47198],
  ])("PG slope at M = %d", (M, a) => {
    expect(2 * Math.PI * sectionScaleFactor("prandtl-glauert", M, undefined).factor).toBeCloseTo(a, 5);
  });

  it("KT and Laitone scale by the rule's own Cp/Cp0 at the working Cp; PG limit without cpMin", () => {
    expect(sectionScaleFactor("karman-tsien", 0.6, -0.5).factor).toBeCloseTo((-2 / 3) / -0.5, 12);
    expect(sectionScaleFactor("laitone", 0.6, -0.5).factor).toBeCloseTo(-0.73594 / -0.5, 4);
    expect(sectionScaleFactor("laitone", 0.6, undefined).factor).toBeCloseTo(1.25, 12);
    expect(sectionScaleFactor("laitone", 0.97, -1.5).singular).toBe(true);
  });
});
