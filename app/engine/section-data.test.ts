import { describe, expect, it } from "vitest";
import { joukowski, joukowskiTable } from "../../tests/fixtures/engine/joukowski";
import { sectionScaleFactor } from "./compressibility";
import type { WingStation } from "./planform";
import type { ChordwisePressure } from "./section-data";
import { cpMinAt, integratePressures, pointByPointScaling } from "./section-data";
import { compressibleSectionAt } from "./spanwise";

// The section: a Joukowski section of about 13 % thickness and 2 % camber (ε = 0.1, κ = 0.04), whose exact
// incompressible pressures come from the closed form (Joukowski 1910; Glauert, Elements, Ch. VI [M]),
// computed in tests/fixtures/engine/joukowski.ts without the engine.
const sec = joukowski(0.1, 0.04);
const ANGLES = [-2, 0, 2, 4];
const cosine = (n: number) => Array.from({ length: n + 1 }, (_, k) => 0.5 * (1 - Math.cos((Math.PI * k) / n)));
const tableAt = (alphaDeg: number, n = 80): ChordwisePressure => ({ alphaDeg, ...joukowskiTable(sec, alphaDeg, cosine(n)) });
const pressures = ANGLES.map((a) => tableAt(a));

// Kármán–Tsien and Laitone as published (Tsien 1939, von Kármán 1941; Laitone 1951; REFERENCES 1.1), written
// out here, not taken from the engine.
const KT = (cp0: number, M: number) => {
  const b = Math.sqrt(1 - M * M);
  return cp0 / (b + ((M * M) / (1 + b)) * (cp0 / 2));
};
const LAITONE = (cp0: number, M: number) => {
  const b = Math.sqrt(1 - M * M);
  return cp0 / (b + ((M * M * (1 + 0.2 * M * M)) / (2 * b)) * cp0);
};

/** Independent integration: the exact distribution on 4 000 cosine points, rule applied at each, lines fitted over the angles. */
function independent(rule: (cp0: number, M: number) => number, M: number) {
  const xs = cosine(4000);
  const rows = ANGLES.map((a) => {
    const t = joukowskiTable(sec, a, xs, 40000);
    let cl0 = 0;
    let cl = 0;
    for (let k = 1; k < xs.length; k++) {
      const h = xs[k] - xs[k - 1];
      cl0 += (h * (t.cpLower[k] - t.cpUpper[k] + t.cpLower[k - 1] - t.cpUpper[k - 1])) / 2;
      cl += (h * (rule(t.cpLower[k], M) - rule(t.cpUpper[k], M) + rule(t.cpLower[k - 1], M) - rule(t.cpUpper[k - 1], M))) / 2;
    }
    return { a, cl0, cl };
  });
  const slope = (ys: number[]) => {
    const mx = ANGLES.reduce((s, v) => s + v, 0) / ANGLES.length;
    const my = ys.reduce((s, v) => s + v, 0) / ys.length;
    return ANGLES.reduce((s, v, i) => s + (v - mx) * (ys[i] - my), 0) / ANGLES.reduce((s, v) => s + (v - mx) ** 2, 0);
  };
  return { slopeRatio: slope(rows.map((r) => r.cl)) / slope(rows.map((r) => r.cl0)), rows };
}

describe("the section's pressures: a check of the reference distribution itself", () => {
  it("its integrated normal force equals the Kutta–Joukowski lift 8πR·sin(α + β)/c within 0.3 % up to 4° (closed form)", () => {
    for (const a of ANGLES.slice(1)) {
      const r = integratePressures(tableAt(a, 400), "prandtl-glauert", 0);
      expect(Math.abs(r.cl / sec.clExact(a) - 1)).toBeLessThan(3e-3);
    }
  });
});

describe("compressibility point by point over the chordwise pressures", { timeout: 120_000 }, () => {
  it("Prandtl–Glauert point by point is exactly 1/β on slope and cm, with no zero-lift shift (Glauert 1928: linear in Cp)", () => {
    const s = pointByPointScaling(pressures, "prandtl-glauert", 0.6);
    expect(s.slopeRatio).toBeCloseTo(1 / 0.8, 12);
    expect(s.alphaL0Shift).toBeCloseTo(0, 10);
    expect(s.cmAcM / s.cmAc0).toBeCloseTo(1 / 0.8, 10);
  });

  it.each([
    ["karman-tsien", 0.5, KT],
    ["karman-tsien", 0.6, KT],
    ["laitone", 0.5, LAITONE],
  ] as const)("%s at M %d: the slope ratio equals an independent integration of the rule over the Joukowski distribution within 0.3 %", (rule, M, f) => {
    const engine = pointByPointScaling(pressures, rule, M).slopeRatio;
    const ref = independent(f, M).slopeRatio;
    expect(Math.abs(engine / ref - 1)).toBeLessThan(3e-3);
  });

  it("the single-cpMin scaling (the documented default) misses it by several per cent: why the point-by-point way is offered", () => {
    const M = 0.6;
    const cpMin4 = Math.min(...pressures[3].cpUpper); // the suction peak at 4°
    const heuristic = sectionScaleFactor("karman-tsien", M, cpMin4).factor;
    const ref = independent(KT, M).slopeRatio;
    expect(Math.abs(heuristic / ref - 1)).toBeGreaterThan(0.03);
  });

  it("the solvers see it: a station with pressures (both panel ends) takes the point-by-point slope, zero-lift angle and cm", () => {
    const base = { xLe: 0, chord: 1.5, twist: 0, a0: 6.3, alphaL0: -1.9, cmAc: -0.05, cpMin: -0.6 };
    const stations: WingStation[] = [
      { y: 0, ...base, pressures },
      { y: 6, ...base, pressures },
    ];
    const s = pointByPointScaling(pressures, "karman-tsien", 0.6);
    const c = compressibleSectionAt(stations, 2.5, "karman-tsien", 0.6);
    expect(c.scaling).toBe("point-by-point");
    expect(c.a).toBeCloseTo(6.3 * s.slopeRatio, 12);
    expect(c.alphaL0).toBeCloseTo(-1.9 + s.alphaL0Shift, 12);
    expect(c.cm).toBeCloseTo(-0.05 * (s.cmAcM / s.cmAc0), 12);
    // One end without pressures: the panel keeps the documented default.
    const half: WingStation[] = [stations[0], { y: 6, ...base }];
    expect(compressibleSectionAt(half, 2.5, "karman-tsien", 0.6).scaling).toBe("at-cp-min");
    expect(compressibleSectionAt(half, 0, "karman-tsien", 0.6).scaling).toBe("point-by-point");
  });
});

describe("minimum Cp against lift", { timeout: 60_000 }, () => {
  it("is read linearly between the table's points and held at its ends, saying so", () => {
    const t = [
      { cl: 0, cpMin: -0.4 },
      { cl: 0.5, cpMin: -0.6 },
      { cl: 1, cpMin: -1.4 },
    ];
    expect(cpMinAt(t, 0.25)).toEqual({ cpMin: -0.5, beyond: null });
    expect(cpMinAt(t, 0.75).cpMin).toBeCloseTo(-1.0, 12);
    expect(cpMinAt(t, 1.3)).toEqual({ cpMin: -1.4, beyond: "above" });
    expect(cpMinAt(t, -0.2)).toEqual({ cpMin: -0.4, beyond: "below" });
  });

  it("the Joukowski section's exact Cp,min over its lift range grows fast with lift: the reason one value cannot serve every case", () => {
    // Exact potential flow (closed form above): Cp,min from −0.6 near cl 0.25 to about −2.5 at cl 0.96.
    const cpMin = (a: number) => {
      const t = joukowskiTable(sec, a, cosine(2000));
      return Math.min(...t.cpUpper, ...t.cpLower);
    };
    expect(cpMin(0)).toBeGreaterThan(-0.7);
    expect(cpMin(6)).toBeLessThan(-2.2);
  });
});
