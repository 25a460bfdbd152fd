import { describe, expect, it } from "vitest";
import { beamLoads, integrate } from "./loads";
import { buildLiftingLine } from "./lifting-line";
import { trapezoidalWing } from "./planform";
import { schrenkDistribution } from "./schrenk";

// REFERENCES §3: O. Schrenk, NACA TM 948 (1940); worked example [C] computed from Schrenk's definition:
// b = 10 m, c_r = 2, c_t = 1 (λ 0.5), L = 100 kN.
const wing = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5 });
const L = 100000;
const S = 15;

describe("Schrenk's approximation (NACA TM 948)", () => {
  it("reproduces the worked example's c_S and running lift at five stations", () => {
    const y = [0, 1.25, 2.5, 3.75, 5];
    const d = schrenkDistribution(wing, y);
    const cS = [1.95493, 1.79961, 1.57699, 1.25663, 0.5];
    const lift = [13032.86, 11997.38, 10513.29, 8377.51, 3333.33];
    d.cclAdditional.forEach((v, i) => {
      expect(v).toBeCloseTo(cS[i], 5);
      expect((L / S) * v).toBeCloseTo(lift[i], 1);
    });
    // The characteristic non-zero tip load ½c_t is part of the method, not an error.
    expect(d.cclAdditional[4]).toBeCloseTo(0.5, 12);
  });

  it("root shear L/2 = 50 000 N and root bending 108 607.2 N·m per side; centre of lift 0.43443 s", () => {
    const n = 4000;
    const y = Array.from({ length: n + 1 }, (_, k) => (5 * k) / n);
    const d = schrenkDistribution(wing, y);
    const l = d.cclAdditional.map((v) => (L / S) * v);
    const zeros = y.map(() => 0);
    const r = beamLoads(y, l, zeros, zeros);
    expect(r.shear[0]).toBeCloseTo(50000, 0);
    expect(Math.abs(r.bending[0] - 108607.2)).toBeLessThan(0.5);
    expect(r.bending[0] / r.shear[0] / 5).toBeCloseTo(0.43443, 4);
    expect(integrate(y, d.cclAdditional)).toBeCloseTo(S / 2, 4);
  });

  it("cross-check against the lifting line of the same wing: root bending 107 926.9 N·m (REFERENCES §3 [C], N = 320)", () => {
    const sys = buildLiftingLine(wing, { mach: 0, rule: "prandtl-glauert", resolution: 320 });
    const r = sys.solve(() => 1);
    const n = 2000;
    const y = Array.from({ length: n + 1 }, (_, k) => 5 * (1 - Math.cos((k * Math.PI) / n)) / 2);
    const l = y.map((v) => (L / S) * (r.cclAt(v) / r.CL));
    const zeros = y.map(() => 0);
    const m = beamLoads(y, l, zeros, zeros).bending[0];
    expect(Math.abs(m - 107926.9)).toBeLessThan(5);
    expect(r.CL).toBeCloseTo(4.77246, 4);
    // Schrenk within 1 % of the lifting line at the root bending moment for this wing.
    expect(Math.abs(108607.2 / m - 1)).toBeLessThan(0.01);
  });

  it("the basic (twist) load carries no net lift and is half the strip-theory basic load", () => {
    const twisted = trapezoidalWing({ span: 10, rootChord: 2, taperRatio: 0.5, tipTwist: -3 });
    const n = 2000;
    const y = Array.from({ length: n + 1 }, (_, k) => (5 * k) / n);
    const d = schrenkDistribution(twisted, y);
    expect(Math.abs(integrate(y, d.cclBasic))).toBeLessThan(1e-6);
    expect(d.cclBasic[0]).toBeGreaterThan(0); // washout loads the root, unloads the tip
    expect(d.cclBasic[n]).toBeLessThan(0);
  });
});
