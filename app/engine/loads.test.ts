import { describe, expect, it } from "vitest";
import { beamLoads, integrate, integrateProduct } from "./loads";
import { schrenkDistribution } from "./schrenk";
import { trapezoidalWing } from "./planform";

const grid = (s: number, n: number) => Array.from({ length: n + 1 }, (_, k) => (s * (1 - Math.cos((k * Math.PI) / n))) / 2);

describe("beam statics from the tip inward (REFERENCES §4 closed forms [C], derived from beam statics)", () => {
  const s = 7;
  const L = 1;
  it("elliptic load: V/L and M/(L s) at η = 0, 0.25, 0.5, 0.75; root M = 2Ls/(3π)", () => {
    const y = grid(s, 20000);
    const l0 = (2 * L) / (Math.PI * s);
    const f = y.map((v) => l0 * Math.sqrt(Math.max(0, 1 - (v / s) ** 2)));
    const z = y.map(() => 0);
    const r = beamLoads(y, f, z, z);
    const at = (eta: number) => y.findIndex((v) => v >= eta * s - 1e-12);
    const V = [0.5, 0.342519, 0.195501, 0.072147];
    const M = [0.212207, 0.106997, 0.040082, 0.007298];
    [0, 0.25, 0.5, 0.75].forEach((eta, i) => {
      // Closed forms evaluated at the grid node nearest η.
      const e = y[at(eta)] / s;
      const Vx = ((l0 * s) / 2) * (Math.acos(e) - e * Math.sqrt(1 - e * e));
      const Mx = l0 * s * s * ((1 - e * e) ** 1.5 / 3 - (e / 2) * (Math.acos(e) - e * Math.sqrt(1 - e * e)));
      expect(r.shear[at(eta)]).toBeCloseTo(Vx, 6);
      expect(r.bending[at(eta)]).toBeCloseTo(Mx, 5);
      if (Math.abs(e - eta) < 1e-4) {
        expect(r.shear[at(eta)] / L).toBeCloseTo(V[i], 4);
        expect(r.bending[at(eta)] / (L * s)).toBeCloseTo(M[i], 4);
      }
    });
    expect(r.shear[0]).toBeCloseTo(L / 2, 6);
    expect(r.bending[0]).toBeCloseTo((2 * L * s) / (3 * Math.PI), 6);
  });

  it("uniform load is integrated exactly: V = (L/2)(1 − η), M = (L s/4)(1 − η)²", () => {
    const y = grid(s, 16);
    const f = y.map(() => L / (2 * s));
    const z = y.map(() => 0);
    const r = beamLoads(y, f, z, z);
    y.forEach((v, k) => {
      const eta = v / s;
      expect(r.shear[k]).toBeCloseTo((L / 2) * (1 - eta), 12);
      expect(r.bending[k]).toBeCloseTo(((L * s) / 4) * (1 - eta) ** 2, 12);
    });
  });

  it("torsion example: ∫c²dy = 11.66667 m³, T_root(cm only) = −5833.333 N·m, with Schrenk lift T_root = +5908.451 N·m", () => {
    // REFERENCES §4 example [C]: wing of §3, q = 10 kPa, cm = −0.05, x_ac = 0.25c, axis at 0.40c (unswept axis).
    const st = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5 }).map((x) => ({ ...x, xLe: 0.4 * (2 - x.chord) }));
    const y = grid(5, 4000);
    const c = y.map((v) => 2 - v / 5);
    const xLe = c.map((cc) => 0.4 * (2 - cc));
    const xAc = xLe.map((x, k) => x + 0.25 * c[k]);
    const xRef = xLe.map((x, k) => x + 0.4 * c[k]);
    const c2 = c.map((cc) => cc * cc);
    expect(integrate(y, c2)).toBeCloseTo(11.66667, 3);
    const t = c2.map((v) => 10000 * v * -0.05);
    const zero = y.map(() => 0);
    expect(beamLoads(y, zero, xAc, xRef, t).torsion[0]).toBeCloseTo(-5833.333, 1);
    const l = schrenkDistribution(st, y).cclAdditional.map((v) => (100000 / 15) * v);
    expect(beamLoads(y, l, xAc, xRef, t).torsion[0]).toBeCloseTo(5908.451, 0);
  });

  it("∫ f·g is exact for piecewise-linear functions", () => {
    expect(integrateProduct([0, 2], [1, 3], [2, 2])).toBeCloseTo(8, 12);
  });
});
