import { describe, expect, it } from "vitest";
import { EngineError } from "./errors";
import { panelSweepDeg, sectionAt, trapezoidalWing, validateStations, wingGeometry } from "./planform";
import type { WingStation } from "./planform";

const sec = { a0: 6, alphaL0: -2, cmAc: -0.05 };

describe("planform geometry", () => {
  it("trapezoid: area, AR, taper, MAC = (2/3)c_r(1+λ+λ²)/(1+λ), y_MAC = (b/6)(1+2λ)/(1+λ) (common practice, no source)", () => {
    // The example wing of CASE-EXCHANGE.md: output block lists area 22.875, AR 9.836, λ 0.452, MAC 1.597, yMac 3.278, xLeMac 0.153.
    const st: WingStation[] = [
      { y: 0, xLe: 0, chord: 2.1, twist: 0, ...sec },
      { y: 7.5, xLe: 0.35, chord: 0.95, twist: -2, ...sec },
    ];
    const g = wingGeometry(st);
    const lam = 0.95 / 2.1;
    expect(g.area).toBeCloseTo(22.875, 10);
    expect(g.span).toBe(15);
    expect(g.aspectRatio).toBeCloseTo(225 / 22.875, 10);
    expect(g.taperRatio).toBeCloseTo(lam, 12);
    expect(g.mac).toBeCloseTo(((2 / 3) * 2.1 * (1 + lam + lam * lam)) / (1 + lam), 10);
    expect(g.yMac).toBeCloseTo(((15 / 6) * (1 + 2 * lam)) / (1 + lam), 10);
    expect(g.xLeMac).toBeCloseTo(g.yMac * (0.35 / 7.5), 10);
    expect(g.mac).toBeCloseTo(1.597, 3);
    expect(Math.abs(g.yMac - 3.278)).toBeLessThan(1e-3); // the contract example truncates
    expect(g.xLeMac).toBeCloseTo(0.153, 3);
  });

  it("cranked wing: whole-wing values are the area-weighted sums of its two trapezoids", () => {
    const st: WingStation[] = [
      { y: 0, xLe: 0, chord: 2.4, twist: 0, ...sec },
      { y: 3, xLe: 0.1, chord: 2.0, twist: -0.5, ...sec },
      { y: 8.75, xLe: 0.75, chord: 0.9, twist: -2.5, ...sec },
    ];
    const g = wingGeometry(st);
    // Each trapezoid on its own, by the textbook trapezoid formulas, then combined.
    const trap = (y0: number, y1: number, cr: number, ct: number, x0: number, x1: number) => {
      const h = y1 - y0;
      const lam = ct / cr;
      const S = (h * (cr + ct)) / 2;
      const mac = ((2 / 3) * cr * (1 + lam + lam * lam)) / (1 + lam);
      const eta = ((1 + 2 * lam) / (3 * (1 + lam)));
      return { S, mac, y: y0 + eta * h, x: x0 + eta * (x1 - x0) };
    };
    const p1 = trap(0, 3, 2.4, 2.0, 0, 0.1);
    const p2 = trap(3, 8.75, 2.0, 0.9, 0.1, 0.75);
    const half = p1.S + p2.S;
    expect(g.area).toBeCloseTo(2 * half, 12);
    expect(g.mac).toBeCloseTo((p1.S * p1.mac + p2.S * p2.mac) / half, 12);
    expect(g.yMac).toBeCloseTo((p1.S * p1.y + p2.S * p2.y) / half, 12);
    expect(g.xLeMac).toBeCloseTo((p1.S * p1.x + p2.S * p2.x) / half, 12);
    expect(g.panels).toHaveLength(2);
    expect(g.panels[1].sweepLeDeg).toBeCloseTo((Math.atan(0.65 / 5.75) * 180) / Math.PI, 10);
  });

  it("sweep of any chord line: tan Λn = tan Λm − (4/A)(n − m)(1 − λ)/(1 + λ) (REFERENCES 2.5, derived from trapezoid geometry [C])", () => {
    const st = trapezoidalWing({ span: 12, rootChord: 2, taperRatio: 0.4, sweepQuarterChordDeg: 25 });
    const g = wingGeometry(st);
    const A = g.aspectRatio;
    const tq = Math.tan((25 * Math.PI) / 180);
    const expectAt = (n: number) => (Math.atan(tq - (4 / A) * (n - 0.25) * (0.6 / 1.4)) * 180) / Math.PI;
    expect(g.panels[0].sweepQuarterChordDeg).toBeCloseTo(25, 10);
    expect(g.panels[0].sweepLeDeg).toBeCloseTo(expectAt(0), 10);
    expect(g.panels[0].sweepHalfChordDeg).toBeCloseTo(expectAt(0.5), 10);
    expect(panelSweepDeg(st, 0, 0.7)).toBeCloseTo(expectAt(0.7), 10);
  });

  it("interpolates section data linearly and drops clMax/cpMin where a panel end lacks them", () => {
    const st: WingStation[] = [
      { y: 0, xLe: 0, chord: 2, twist: 0, ...sec, clMax: 1.6, cpMin: -0.6 },
      { y: 4, xLe: 0.4, chord: 1, twist: -2, ...sec, clMax: 1.4, cpMin: -0.5 },
      { y: 6, xLe: 0.6, chord: 0.8, twist: -3, ...sec },
    ];
    const s = sectionAt(st, 1);
    expect(s.chord).toBeCloseTo(1.75, 12);
    expect(s.twist).toBeCloseTo(-0.5, 12);
    expect(s.clMax).toBeCloseTo(1.55, 12);
    expect(s.cpMin).toBeCloseTo(-0.575, 12);
    expect(sectionAt(st, 5).cpMin).toBeUndefined();
    expect(sectionAt(st, 4).cpMin).toBe(-0.5);
  });

  it("rejects bad station lists naming the field and rule", () => {
    const base: WingStation = { y: 0, xLe: 0, chord: 1, twist: 0, ...sec };
    expect(() => validateStations([base])).toThrow(/at least 2/);
    expect(() => validateStations([{ ...base, y: 0.1 }, { ...base, y: 1 }])).toThrow(/wing\.stations\[0\]\.y/);
    expect(() => validateStations([base, { ...base, y: 0 }])).toThrow(/strictly increasing/);
    expect(() => validateStations([base, { ...base, y: 1, chord: 0 }])).toThrow(/wing\.stations\[1\]\.chord/);
    expect(() => validateStations([base, { ...base, y: 1, cpMin: 0.2 }])).toThrow(EngineError);
  });
});
