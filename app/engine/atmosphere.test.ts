import { describe, expect, it } from "vitest";
import {
  casFromMach,
  dynamicPressure,
  easFromMach,
  easFromTas,
  geopotentialFromGeometric,
  impactPressure,
  isa,
  machFromEas,
  machFromTas,
  tasFromEas,
  tasFromMach,
} from "./atmosphere";
import { EngineError } from "./errors";

// Altitudes here are geopotential unless a test says geometric.
describe("ISA (U.S. Standard Atmosphere 1976 / ICAO Doc 7488/3)", () => {
  // REFERENCES 5.2 table [C], computed from the USSA-1976 layer formulas; tolerance 5e-5 relative because the table has 5 s.f.
  const table: [number, number, number, number, number, number][] = [
    [0, 288.15, 101325, 1.225, 340.29, 1.0],
    [1000, 281.65, 89875, 1.1116, 336.43, 0.90746],
    [3000, 268.65, 70109, 0.90912, 328.58, 0.74214],
    [5000, 255.65, 54020, 0.73612, 320.53, 0.60091],
    [8000, 236.15, 35600, 0.52517, 308.06, 0.42871],
    [11000, 216.65, 22632, 0.36392, 295.07, 0.29708],
    [15000, 216.65, 12045, 0.19367, 295.07, 0.1581],
    [20000, 216.65, 5474.9, 0.088035, 295.07, 0.071866],
  ];
  it.each(table)("H = %d m matches the 5-s.f. table", (h, T, p, rho, a, sigma) => {
    const s = isa(h);
    const rel = (x: number, y: number) => Math.abs(x / y - 1);
    expect(rel(s.temperature, T)).toBeLessThan(5e-5);
    expect(rel(s.pressure, p)).toBeLessThan(5e-5);
    expect(rel(s.density, rho)).toBeLessThan(5e-5);
    expect(rel(s.speedOfSound, a)).toBeLessThan(5e-5);
    expect(rel(s.sigma, sigma)).toBeLessThan(5e-5);
  });

  // Mechanical Engineers' Handbook Vol. 4, Table 6 (U.S. Standard Atmosphere, geometric altitude) [V]; table precision.
  it.each([
    [1000, 281.65, 0.8988, 1.1117],
    [5000, 255.68, 0.5405, 0.7364],
    [8000, 236.22, 0.3565, 0.5258],
    [11000, 216.77, 0.227, 0.3648],
  ])("geometric Z = %d m agrees with the handbook table", (z, T, pBar, rho) => {
    const s = isa(geopotentialFromGeometric(z));
    expect(s.temperature).toBeCloseTo(T, 1);
    expect(s.pressure / 1e5).toBeCloseTo(pBar, 4);
    expect(s.density).toBeCloseTo(rho, 4);
  });

  it("sea-level speed of sound is 661.47 kt (published tables, REFERENCES 5.1 [V])", () => {
    expect(isa(0).speedOfSound / (1852 / 3600)).toBeCloseTo(661.47, 1);
  });

  it("refuses altitudes outside the supported range with an EngineError naming the field", () => {
    expect(() => isa(-1)).toThrow(EngineError);
    expect(() => isa(40000, "cases[2].altitude")).toThrow(/cases\[2\]\.altitude/);
    expect(() => isa(Number.NaN)).toThrow(EngineError);
  });
});

describe("airspeed relations (REFERENCES 7 [C], formulas from Clancy §3.8 / Anderson Ch. 8)", () => {
  // Rows of REFERENCES 7: H, TAS, M, EAS, q, q_c, CAS. Tolerances at the table's last digit.
  it.each([
    [0, 100, 0.29386, 100.0, 6125.0, 6258.38, 100.0],
    [3000, 150, 0.45651, 129.2213, 10227.62, 10771.65, 130.2172],
    [11000, 230, 0.77948, 125.3607, 9625.62, 11177.89, 132.5624],
  ])("H = %d m, TAS = %d m/s", (h, tas, M, eas, q, qc, cas) => {
    const m = machFromTas(tas, h);
    expect(m).toBeCloseTo(M, 4);
    expect(easFromTas(tas, h)).toBeCloseTo(eas, 2);
    expect(easFromMach(m, h)).toBeCloseTo(eas, 2);
    expect(dynamicPressure(m, h)).toBeCloseTo(q, 0);
    expect(impactPressure(m, h)).toBeCloseTo(qc, 0);
    expect(casFromMach(m, h)).toBeCloseTo(cas, 2);
    expect(tasFromMach(m, h)).toBeCloseTo(tas, 9);
    expect(tasFromEas(eas, h)).toBeCloseTo(tas, 2);
    expect(machFromEas(easFromMach(m, h), h)).toBeCloseTo(m, 12);
  });

  it("q = ½ρV² equals 0.7·p·M² (common practice identity)", () => {
    const h = 4500;
    const s = isa(h);
    const v = 0.55 * s.speedOfSound;
    expect(dynamicPressure(0.55, h)).toBeCloseTo(0.5 * s.density * v * v, 6);
  });
});
