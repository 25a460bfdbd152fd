import { describe, expect, it } from "vitest";
import {
  UNITS,
  designGustVelocityPart25,
  designGustsPart23,
  flightProfileAlleviation,
  gustLoadFactorSI,
  gustLoadFactorUS,
  manoeuvreLoadFactorsPart23,
  manoeuvreLoadFactorsPart25,
  minimumDesignSpeedsPart23,
  minimumVbPart23,
  minimumVbPart25,
  referenceGustPart25,
  stallLoadFactor,
  stallSpeed,
  vnDiagram,
} from "./certification";
import { EngineError } from "./errors";

describe("manoeuvre load factors", () => {
  // 14 CFR 25.337(b),(c) [V]; values REFERENCES 6.1 [C] computed from the rule's formula.
  it.each([
    [4000, 3.8],
    [4117.65, 3.8],
    [6000, 3.6],
    [10000, 3.3],
    [20000, 2.9],
    [50000, 2.5],
    [150000, 2.5],
  ])("14 CFR 25.337: W = %d lb → n = %d", (w, n) => {
    const f = manoeuvreLoadFactorsPart25(w);
    expect(f.positive.value).toBeCloseTo(n, 4);
    expect(f.positive.rule).toBe("14 CFR 25.337(b)");
    expect(f.negativeAtVc.value).toBe(-1);
    expect(f.negativeAtVd.value).toBe(0);
  });

  // 14 CFR 23.337 (pre-Amendment 23-64) [M, with V support for 3.8/4.4/6.0 and −0.4n]; values REFERENCES 6.2 [C].
  it.each([
    [6000, "normal", 3.6, -1.44, 0],
    [10000, "commuter", 3.3, -1.32, 0],
    [4000, "normal", 3.8, -1.52, 0],
    [6000, "utility", 4.4, -1.76, -1],
    [6000, "acrobatic", 6.0, -3.0, -1],
  ] as const)("14 CFR 23.337: W = %d lb, %s → %d / %d", (w, cat, n, neg, vd) => {
    const f = manoeuvreLoadFactorsPart23(w, cat);
    expect(f.positive.value).toBeCloseTo(n, 10);
    expect(f.negativeAtVc.value).toBeCloseTo(neg, 10);
    expect(f.negativeAtVd.value).toBe(vd);
    expect(f.negativeAtVd.rule).toBe("14 CFR 23.333(b)");
  });

  it("refuses a non-positive weight", () => {
    expect(() => manoeuvreLoadFactorsPart25(0)).toThrow(EngineError);
  });
});

// REFERENCES 6.5/6.6 worked example [C]: Part 23 normal, W = 6000 lb, S = 180 ft², c̄ = 5 ft, a = 5 /rad,
// V_C = 200 kt, V_D = 280 kt EAS; CLmax = 1.6.
const W_N = 6000 * UNITS.lbfToN;
const S_M2 = 180 * UNITS.ftToM ** 2;

describe("stall line (REFERENCES 6.6, standard formula)", () => {
  it("V_S1 = 132.400 ft/s = 78.445 kt; V_A ≥ V_S1·√3.6 = 148.839 kt; n_stall(120 kt) = 2.34009", () => {
    // ρ0 = 1.225 kg/m³ vs the table's 0.0023769 slug/ft³ differ by 2e-5, within the last digit quoted.
    const vs = stallSpeed(W_N, S_M2, 1.6);
    expect(vs / UNITS.ftToM).toBeCloseTo(132.4, 2);
    expect(vs / UNITS.ktToMs).toBeCloseTo(78.445, 2);
    expect((vs * Math.sqrt(3.6)) / UNITS.ktToMs).toBeCloseTo(148.839, 2);
    expect(stallLoadFactor(120 * UNITS.ktToMs, S_M2, 1.6, W_N)).toBeCloseTo(2.34009, 4);
  });
});

describe("gust load factor (Pratt, NACA TN 2964; 14 CFR 23.341(c))", () => {
  // REFERENCES 6.5 table [C] with the US form and the constant 498.
  it.each([
    ["SL", 0.0023769, 34.8702, 0.76389, 2.30089, 1.61062],
    ["10 000 ft", 0.0017553, 47.2189, 0.79119, 2.38311, 1.66818],
    ["20 000 ft", 0.0012664, 65.4456, 0.81407, 2.45203, 1.71642],
  ] as const)("US form at %s", (_alt, rho, mu, kg, dnC, dnD) => {
    const base = { wingLoadingPsf: 6000 / 180, densitySlugFt3: rho, meanChordFt: 5, liftSlope: 5 };
    const c = gustLoadFactorUS({ ...base, veasKt: 200, udeFtS: 50 });
    // The densities are quoted to 5 s.f., so μ agrees to 1e-4 relative.
    expect(Math.abs(c.mu / mu - 1)).toBeLessThan(1e-4);
    expect(c.kg).toBeCloseTo(kg, 4);
    expect(c.deltaN).toBeCloseTo(dnC, 4);
    expect(c.positive).toBeCloseTo(1 + dnC, 4);
    expect(c.negative).toBeCloseTo(1 - dnC, 4);
    expect(gustLoadFactorUS({ ...base, veasKt: 280, udeFtS: 25 }).deltaN).toBeCloseTo(dnD, 4);
  });

  it("SI form at sea level: μ = 34.8701, K_g = 0.76389, Δn = 2.29841 (0.1 % below the US form's rounded 498)", () => {
    const r = gustLoadFactorSI({
      wingLoading: 1596.009,
      density: 1.225,
      meanChord: 1.524,
      liftSlope: 5,
      veas: 102.8889,
      ude: 15.24,
    });
    expect(r.mu).toBeCloseTo(34.8701, 3);
    expect(r.kg).toBeCloseTo(0.76389, 5);
    expect(r.deltaN).toBeCloseTo(2.29841, 4);
  });
});

describe("design gust velocities", () => {
  it("14 CFR 23.333(c): 50/25 ft/s to 20 000 ft, linear to 25/12.5 at 50 000 ft; commuter 66 ft/s at V_B (38 at 50 000 ft [M])", () => {
    expect(designGustsPart23(10000, "normal").vc.value).toBe(50);
    expect(designGustsPart23(35000, "normal").vc.value).toBeCloseTo(37.5, 12);
    expect(designGustsPart23(35000, "normal").vd.value).toBeCloseTo(18.75, 12);
    expect(designGustsPart23(50000, "commuter").vb!.value).toBeCloseTo(38, 12);
    expect(designGustsPart23(0, "normal").vb).toBeUndefined();
  });

  it("14 CFR 25.341(a)(5): U_ref 56 → 44 at 15 000 ft → 20.86 at 60 000 ft; 26.00 at 50 000 ft and 41.4289 at 20 000 ft [C]; half at V_D", () => {
    expect(referenceGustPart25(0).vc.value).toBe(56);
    expect(referenceGustPart25(15000).vc.value).toBeCloseTo(44, 12);
    expect(referenceGustPart25(60000).vc.value).toBeCloseTo(20.86, 12);
    expect(referenceGustPart25(50000).vc.value).toBeCloseTo(26.0, 2);
    expect(referenceGustPart25(20000).vc.value).toBeCloseTo(41.4289, 4);
    expect(referenceGustPart25(20000).vd.value).toBeCloseTo(41.4289 / 2, 4);
  });

  it("F_g worked example (REFERENCES 6.4 [C]): MTOW 150 000, MLW 130 000, MZFW 120 000 lb, Z_mo 41 000 ft", () => {
    const p = { mtow: 150000, mlw: 130000, mzfw: 120000, zmoFt: 41000 };
    const rows: [number, number, number, number, number][] = [
      [0, 56, 0.82044, 45.9446, 30.5077],
      [15000, 44, 0.88613, 38.9898, 25.8897],
      [20000, 41.4289, 0.90803, 37.6187, 24.9792],
      [41000, 30.6302, 1.0, 30.6302, 20.3388],
    ];
    for (const [h, uref, fg, u350, u30] of rows) {
      const F = flightProfileAlleviation({ ...p, altitudeFt: h }).value;
      expect(F).toBeCloseTo(fg, 5);
      const U = referenceGustPart25(h).vc.value;
      expect(U).toBeCloseTo(uref, 4);
      expect(designGustVelocityPart25(U, F, 350).value).toBeCloseTo(u350, 3);
      expect(designGustVelocityPart25(U, F, 30).value).toBeCloseTo(u30, 3);
    }
  });

  it("14 CFR 23.335 minimum speeds at W/S = 33.333 psf: factors 32.26667 and 1.39167 → 186.292 and 259.256 kt (REFERENCES 6.5 [C])", () => {
    const s = minimumDesignSpeedsPart23(6000 / 180, "normal");
    expect(s.vc.value).toBeCloseTo(186.292, 2);
    expect(s.vd.value).toBeCloseTo(259.256, 2);
  });
});

describe("V–n diagram corner points", () => {
  it("worked aircraft of REFERENCES 6.5/6.6: points with rule strings; manoeuvre governs (3.6 > 3.30)", () => {
    const pts = vnDiagram({
      part: "23",
      category: "normal",
      weightN: W_N,
      areaM2: S_M2,
      clMaxPositive: 1.6,
      clMaxNegative: -1.0,
      vcEas: 200 * UNITS.ktToMs,
      vdEas: 280 * UNITS.ktToMs,
      gustAtVc: 50 * UNITS.ftToM,
      gustAtVd: 25 * UNITS.ftToM,
      density: 1.225,
      meanChord: 5 * UNITS.ftToM,
      liftSlope: 5,
    });
    const by = Object.fromEntries(pts.map((p) => [p.name, p]));
    expect(by.A.nz).toBeCloseTo(3.6, 10);
    expect(by.A.veas / UNITS.ktToMs).toBeCloseTo(148.839, 1);
    expect(by.A.rule).toMatch(/14 CFR 23\.337\(a\)/);
    expect(by.D).toMatchObject({ nz: 3.6, rule: "14 CFR 23.337(a)" });
    expect(by.E.nz).toBe(0);
    expect(by.F.nz).toBeCloseTo(-1.44, 10);
    expect(by["gust+VC"].nz).toBeCloseTo(3.29841, 3);
    expect(by["gust+VC"].nz).toBeLessThan(by.A.nz);
    expect(by["gust-VD"].nz).toBeLessThan(1);
  });
});

describe("the V_B gust points and the V_D slope (REFERENCES 6.3–6.5)", () => {
  // Worked aircraft of REFERENCES 6.5 in SI at sea level: W/S = 1596.009 N/m², c̄ = 1.524 m, a = 5 /rad;
  // Pratt's Δn at V_C = 200 kt with U = 50 ft/s is 2.29841 [C]. Δn is linear in V and U at a fixed a (the
  // formula of 23.341(c)), so at V_B = 150 kt with 66 ft/s (23.333(c)(1)(iii), commuter) it is 2.29841·0.75·1.32.
  const base = {
    part: "23" as const,
    category: "commuter" as const,
    weightN: W_N,
    areaM2: S_M2,
    clMaxPositive: 1.6,
    clMaxNegative: -1.0,
    vcEas: 200 * UNITS.ktToMs,
    vdEas: 280 * UNITS.ktToMs,
    gustAtVc: 50 * UNITS.ftToM,
    gustAtVd: 25 * UNITS.ftToM,
    density: 1.225,
    meanChord: 5 * UNITS.ftToM,
    liftSlope: 5,
  };

  it("V_B points: n = 1 ± 2.29841·0.75·1.32 = 3.27543 / −1.27543, traced to 23.333(c)(1)(iii)", () => {
    const pts = vnDiagram({ ...base, vbEas: 150 * UNITS.ktToMs, gustAtVb: 66 * UNITS.ftToM });
    const by = Object.fromEntries(pts.map((p) => [p.name, p]));
    expect(by["gust+VB"].nz).toBeCloseTo(1 + 2.29841 * 0.75 * 1.32, 4);
    expect(by["gust-VB"].nz).toBeCloseTo(1 - 2.29841 * 0.75 * 1.32, 4);
    expect(by["gust+VB"].rule).toMatch(/23\.333\(c\)\(1\)\(iii\)/);
    expect(vnDiagram(base).some((p) => p.name === "gust+VB")).toBe(false);
  });

  it("the V_D gust takes the lift slope at the V_D Mach number: Pratt's formula with a = 6 there (μ and K_g with it)", () => {
    // By hand from 23.341(c) in SI (REFERENCES 6.5): μ = 2(W/S)/(ρ c̄ a g), K_g = 0.88μ/(5.3 + μ), Δn = ρ0 V a K_g U/(2 W/S).
    const ws = W_N / S_M2;
    const mu = (2 * ws) / (1.225 * 5 * UNITS.ftToM * 6 * 9.80665);
    const kg = (0.88 * mu) / (5.3 + mu);
    const dn = (1.225 * 280 * UNITS.ktToMs * 6 * kg * 25 * UNITS.ftToM) / (2 * ws);
    const by = Object.fromEntries(vnDiagram({ ...base, liftSlopeAtVd: 6 }).map((p) => [p.name, p]));
    expect(by["gust+VD"].nz).toBeCloseTo(1 + dn, 10);
    // …and the V_C points keep a = 5: the 2.29841 of the worked example.
    expect(by["gust+VC"].nz).toBeCloseTo(3.29841, 3);
  });

  it("14 CFR 25.335(d): V_B ≥ V_S1·[1 + K_g·U_ref·V_C·a/(498·w)]^½ — 148.31 kt for the worked aircraft with U_ref = 56 ft/s; need not exceed V_C", () => {
    // w = 33.333 psf, K_g = 0.76389 (REFERENCES 6.5), V_C = 200 kt, a = 5, V_S1 = 78.445 kt (6.6); the SI form
    // uses the exact constant 2/(ρ0·1.68781) = 498.535 (REFERENCES 6.5) in place of the rounded 498.
    const expected = 78.445 * Math.sqrt(1 + (0.76389 * 56 * 200 * 5) / (498.535 * (6000 / 180)));
    const vs1 = stallSpeed(W_N, S_M2, 1.6);
    const vb = minimumVbPart25({ vs1, vcEas: 200 * UNITS.ktToMs, uRef: 56 * UNITS.ftToM, wingLoading: W_N / S_M2, density: 1.225, meanChord: 5 * UNITS.ftToM, liftSlope: 5 });
    expect(vb.value / UNITS.ktToMs).toBeCloseTo(expected, 1);
    expect(vb.rule).toBe("14 CFR 25.335(d)");
    const capped = minimumVbPart25({ vs1, vcEas: 120 * UNITS.ktToMs, uRef: 56 * UNITS.ftToM, wingLoading: W_N / S_M2, density: 1.225, meanChord: 5 * UNITS.ftToM, liftSlope: 5 });
    expect(capped.value).toBeCloseTo(120 * UNITS.ktToMs, 12);
  });

  it("14 CFR 25.341(a)(5)(i): the reference gust applies from V_B to V_C", () => {
    expect(referenceGustPart25(10000).vb.value).toBe(referenceGustPart25(10000).vc.value);
  });
});

describe("14 CFR 23.335(d) minimum V_B of a commuter (text from memory [M])", () => {
  // Worked aircraft of REFERENCES 6.5/6.6 (SI at sea level): V_S1 = 78.445 kt, n_g at V_C = 200 kt with 50 ft/s is
  // 3.29841 [C]. The 66 ft/s gust line has slope Δn/V = 2.29841·1.32/200 per kt (linear in V and U at fixed a).
  it("the lesser of the C_N max line meeting the V_B gust line and V_S1·√n_g, by hand", () => {
    const vs1 = stallSpeed(W_N, S_M2, 1.6);
    const r = minimumVbPart23({ vs1, vcEas: 200 * UNITS.ktToMs, weightN: W_N, areaM2: S_M2, clMax: 1.6, gustAtVc: 50 * UNITS.ftToM, gustAtVb: 66 * UNITS.ftToM, density: 1.225, meanChord: 5 * UNITS.ftToM, liftSlope: 5 });
    // Stall line n = (V/V_S1)², V in kt: (V/78.445)² = 1 + 0.0151695·V → V² − 93.347·V − 6153.6 = 0 → V = 137.95 kt; V_S1·√n_g = 142.47 kt.
    const k = (2.29841 * 1.32) / 200;
    const a = 1 / 78.445 ** 2;
    const meet = (k + Math.sqrt(k * k + 4 * a)) / (2 * a);
    const root = 78.445 * Math.sqrt(3.29841);
    expect(Math.min(meet, root)).toBeCloseTo(137.95, 1);
    expect(r.value / UNITS.ktToMs).toBeCloseTo(Math.min(meet, root), 1);
    expect(r.rule).toBe("14 CFR 23.335(d)");
  });
});
