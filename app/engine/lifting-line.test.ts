import { describe, expect, it } from "vitest";
import { buildLiftingLine } from "./lifting-line";
import { ellipticWing, trapezoidalWing, wingGeometry } from "./planform";
import { DEG } from "./spanwise";

const unitAlpha = () => 1; // 1 rad everywhere: the result's CL is the lift slope per rad
const pg = { mach: 0, rule: "prandtl-glauert" as const };

describe("lifting line (Glauert Fourier series)", () => {
  it("elliptic wing: CLα = a0/(1 + a0/(πA)), uniform cl (constant downwash), e = 1 (Prandtl, NACA Report 116; REFERENCES 2.1)", () => {
    const st = ellipticWing({ span: 12, rootChord: 2, panels: 256 });
    const A = wingGeometry(st).aspectRatio;
    const r = buildLiftingLine(st, { ...pg, resolution: 120 }).solveDetailed(unitAlpha);
    const exact = (2 * Math.PI) / (1 + 2 / A);
    // 0.2 %: the planform is a 256-panel piecewise-linear ellipse, not the exact one.
    expect(Math.abs(r.CL / exact - 1)).toBeLessThan(2e-3);
    expect(r.spanEfficiency).toBeGreaterThan(0.999);
    const cl = [0.05, 0.3, 0.6, 0.9].map((f) => r.cclAt(f * 6) / (2 * Math.sqrt(1 - f * f)));
    for (const v of cl) expect(Math.abs(v / cl[0] - 1)).toBeLessThan(3e-3);
  });

  // REFERENCES 2.3 [C]: converged lifting-line values computed from Glauert's monoplane equation (untwisted,
  // unswept, a0 = 2π) — computed references, not published tables. Rectangular wings converge spectrally (1e-4 at N = 10).
  it.each([
    [4, 1.0, 4.02839, 0.02848],
    [6, 1.0, 4.53042, 0.04829],
    [8, 1.0, 4.8377, 0.06761],
    [10, 1.0, 5.04679, 0.08591],
  ])("rectangular AR %d: CLα and δ", (AR, lam, cla, delta) => {
    const st = trapezoidalWing({ span: AR * 1.5, rootChord: 1.5, taperRatio: lam });
    const r = buildLiftingLine(st, { ...pg, resolution: 80 }).solveDetailed(unitAlpha);
    expect(r.CL).toBeCloseTo(cla, 5);
    expect(r.delta).toBeCloseTo(delta, 5);
  });

  // Tapered wings converge as O(N⁻²) (root kink); at N = 320 the table's Richardson value is reached to ~1e-5.
  it.each([
    [6, 0.4, 4.66769, 0.00878],
    [6, 0.5, 4.65317, 0.01168],
    [8, 0.4, 4.97923, 0.01297],
    [8, 0.5, 4.96385, 0.01719],
    [6, 0.3, 4.67189, 0.00988],
    [8, 0.3, 4.98438, 0.01409],
  ])("tapered AR %d, λ %d: CLα and δ", (AR, lam, cla, delta) => {
    const cr = 2 / (1 + lam);
    const st = trapezoidalWing({ span: AR, rootChord: cr, taperRatio: lam });
    expect(wingGeometry(st).aspectRatio).toBeCloseTo(AR, 12);
    const r = buildLiftingLine(st, { ...pg, resolution: 320 }).solveDetailed(unitAlpha);
    expect(Math.abs(r.CL - cla)).toBeLessThan(3e-5);
    expect(Math.abs(r.delta - delta)).toBeLessThan(2e-5);
  });

  it("straight wings agree with Helmbold's equation CLα = a0/[√(1 + (a0/πA)²) + a0/(πA)] (Helmbold 1942 [M]; REFERENCES 2.4 [C])", () => {
    // Helmbold is an interpolation meant for low aspect ratio; at A = 6–10 it and the lifting line agree within 2.5 %.
    for (const [A, h] of [[6, 4.52866], [8, 4.90576], [10, 5.15098]]) {
      const st = trapezoidalWing({ span: A, rootChord: 1, taperRatio: 1 });
      const k = (2 * Math.PI) / (Math.PI * A);
      expect(2 * Math.PI / (Math.sqrt(1 + k * k) + k)).toBeCloseTo(h, 4);
      const r = buildLiftingLine(st, { ...pg, resolution: 80 }).solve(unitAlpha);
      expect(Math.abs(r.CL / h - 1)).toBeLessThan(0.025);
    }
  });

  it("converges with the number of terms (REFERENCES 2.3 convergence row, AR 6, λ 0.4 [C])", () => {
    const st = trapezoidalWing({ span: 6, rootChord: 2 / 1.4, taperRatio: 0.4 });
    const expected: [number, number][] = [
      [10, 4.67283],
      [20, 4.66898],
      [40, 4.66801],
      [80, 4.66777],
      [160, 4.66771],
    ];
    let prev = Infinity;
    for (const [N, cla] of expected) {
      const CL = buildLiftingLine(st, { ...pg, resolution: N }).solve(unitAlpha).CL;
      expect(CL).toBeCloseTo(cla, 5);
      expect(Math.abs(CL - 4.66769)).toBeLessThan(prev);
      prev = Math.abs(CL - 4.66769);
    }
  });

  it("Göthert check: rectangular AR 8 at M = 0.6 gives 5.75380 /rad (REFERENCES 2.6(b) [C], Göthert NACA TM 1105)", () => {
    const st = trapezoidalWing({ span: 8, rootChord: 1, taperRatio: 1 });
    const r = buildLiftingLine(st, { mach: 0.6, rule: "prandtl-glauert", resolution: 80 }).solve(unitAlpha);
    expect(r.CL).toBeCloseTo(5.7538, 4);
  });

  it("a uniform zero-lift angle only shifts the lift curve: CL(α) = CLα(α − αL0) (thin-airfoil superposition)", () => {
    const st = trapezoidalWing({ span: 10, rootChord: 1.4, taperRatio: 0.5, alphaL0: -2 });
    const sys = buildLiftingLine(st, pg);
    const cla = sys.solve(unitAlpha).CL;
    const r = sys.solve((s) => (4 - s.alphaL0) * DEG);
    expect(r.CL).toBeCloseTo(cla * 6 * DEG, 10);
  });
});
