import { describe, expect, it } from "vitest";
import { dynamicPressure } from "./atmosphere";
import { addToEnvelope, createEnvelope, envelopeRows, loadEnvelope } from "./envelope";
import { evaluateCase } from "./load-case";
import type { WingStation } from "./planform";
import { ellipticWing, trapezoidalWing } from "./planform";
import type { SolveOptions, WingModel } from "./superposition";
import { solveAtAlpha, solveMach, wingAerodynamicCentre, wingPitchingMoment } from "./superposition";

// A cranked, twisted wing in the spirit of the demo aircraft (invented data).
const stations: WingStation[] = [
  { y: 0, xLe: 0, chord: 2.3, twist: 0, a0: 6.1, alphaL0: -2.3, cmAc: -0.055, clMax: 1.6, cpMin: -0.6 },
  { y: 2.9, xLe: 0.08, chord: 2.05, twist: -0.6, a0: 6.05, alphaL0: -2.1, cmAc: -0.05, clMax: 1.55, cpMin: -0.58 },
  { y: 8.75, xLe: 0.62, chord: 0.95, twist: -2.6, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, clMax: 1.4, cpMin: -0.52 },
];
const model: WingModel = { stations, axis: { rootChordFraction: 0.38, tipChordFraction: 0.4 }, massKg: 410 };
const methods: SolveOptions[] = [
  { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 40 },
  { spanwise: "vortex-lattice", rule: "karman-tsien", stations: 40 },
];
const g0 = 9.80665;

describe.each(methods)("superposition and loads ($spanwise, $rule)", (opts) => {
  const sol = solveMach(model, 0.42, opts);

  it("equilibrium of a trimmed case: ∫l dy = nz·W/2, root shear = nz·W/2 − nz·g·m, root bending = ∫(l − nz g m')·y dy (beam statics)", () => {
    const W = 62000;
    const nz = 3.6;
    const c = evaluateCase(sol, { id: "A", mach: 0.42, altitude: 3000, weightN: W, nz });
    const q = dynamicPressure(0.42, 3000);
    expect(c.CL).toBeCloseTo((nz * W) / (q * sol.geometry.area), 12);
    expect(c.root.shear).toBeCloseTo((nz * W) / 2 - nz * g0 * 410, 4);
    // Aerodynamic part alone (mass-free model).
    const bare = solveMach({ ...model, massKg: undefined }, 0.42, { ...opts, stations: 400 });
    const cb = evaluateCase(bare, { id: "A", mach: 0.42, altitude: 3000, weightN: W, nz });
    expect(cb.root.shear).toBeCloseTo((nz * W) / 2, 4);
    let ly = 0;
    for (let i = 0; i + 1 < cb.y.length; i++) {
      const h = cb.y[i + 1] - cb.y[i];
      ly += (h * (cb.lift[i] * cb.y[i] + cb.lift[i + 1] * cb.y[i + 1])) / 2;
    }
    // Trapezoid on 400 output stations (the last is just inboard of the tip): 0.1 %.
    expect(Math.abs(ly / cb.root.bending - 1)).toBeLessThan(1e-3);
  });

  it("superposition equals re-solving at the case angle", () => {
    for (const alpha of [-3, 0, 2.5, 9]) {
      const c = evaluateCase(sol, { id: "x", mach: 0.42, altitude: 0, alphaDeg: alpha });
      const d = solveAtAlpha(model, 0.42, alpha, opts);
      expect(c.CL).toBeCloseTo(d.CL, 10);
      // Linear algebra makes the two identical; what differs is only the lattice's strip interpolation,
      // whose integral is matched to the force sum in the superposed form (~1e-4 of the peak load).
      const scale = Math.max(...d.ccl.map(Math.abs));
      const tol = opts.spanwise === "lifting-line" ? 2e-5 : 5e-4;
      c.cl.forEach((cl, i) => expect(Math.abs(cl * c.chord[i] - d.ccl[i]) / scale).toBeLessThan(tol));
    }
  });

  it("the basic loading is self-equilibrated (no net lift) and, with washout, positive inboard and negative outboard; the additional loading integrates to S/2 per unit CL", () => {
    const trap = (f: number[]) => sol.y.reduce((a, y, i) => (i === 0 ? 0 : a + ((y - sol.y[i - 1]) * (f[i] + f[i - 1])) / 2), 0);
    // Trapezoid over the output stations, to the last station inboard of the tip: the definition holds to the rule's error.
    expect(Math.abs(trap(sol.cclBasic)) / trap(sol.cclAdditional)).toBeLessThan(5e-3);
    expect(Math.abs(trap(sol.cclAdditional) / (sol.geometry.area / 2) - 1)).toBeLessThan(5e-3);
    expect(sol.cclBasic[0]).toBeGreaterThan(0);
    expect(sol.cclBasic[sol.cclBasic.length - 1]).toBeLessThan(0);
    expect(sol.y[0]).toBe(0);
    expect(sol.y).toHaveLength(40);
  });

  it("a case given by α gets no inertia relief and says so; a trimmed case gets nz·g·m", () => {
    const a = evaluateCase(sol, { id: "a", mach: 0.42, altitude: 0, alphaDeg: 5 });
    expect(a.inertiaApplied).toBe(false);
    expect(a.warnings.join(" ")).toMatch(/inertia relief is not applied/);
    const t = evaluateCase(sol, { id: "t", mach: 0.42, altitude: 0, weightN: 60000, nz: 1 });
    expect(t.inertiaApplied).toBe(true);
  });

  it("flags stations above clMax and supercritical Mach numbers, still computing them", () => {
    const hi = evaluateCase(sol, { id: "hi", mach: 0.42, altitude: 0, alphaDeg: 16 });
    expect(hi.warnings.some((w) => /station y = .* exceeds the section clMax/.test(w))).toBe(true);
    expect(hi.clMaxExceeded.length).toBeGreaterThan(0);
    for (const i of hi.clMaxExceeded) expect(hi.cl[i]).toBeGreaterThan(sol.clMax[i]!);
    expect(hi.regime).toBe("subcritical");
    const fast = solveMach(model, 0.8, opts);
    const f = evaluateCase(fast, { id: "fast", mach: 0.8, altitude: 9000, alphaDeg: 1 });
    expect(f.regime).toBe("supercritical");
    expect(f.warnings.join(" ")).toMatch(/outside their validity/);
    expect(Number.isFinite(f.root.bending)).toBe(true);
  });

  it("an elliptic wing's loads are the closed forms: running lift l0·√(1 − η²) with l0 = 2L/(πs), root bending 2Ls/(3π) per side (REFERENCES 4 [C], beam statics)", () => {
    const el = ellipticWing({ span: 16, rootChord: 2, panels: 256 });
    const e = solveMach({ stations: el }, 0.42, { ...opts, stations: 60 });
    const L = 3 * 60000;
    const c = evaluateCase(e, { id: "e", mach: 0.42, altitude: 1000, weightN: 60000, nz: 3 });
    const s = 8;
    const l0 = (2 * L) / (Math.PI * s);
    expect(c.root.shear).toBeCloseTo(L / 2, 6);
    if (opts.spanwise === "lifting-line") {
      // Prandtl's theory gives the elliptic load exactly; what remains is the 256-panel ellipse: 0.1 %.
      c.y.forEach((y, i) => expect(Math.abs(c.lift[i] / (l0 * Math.sqrt(1 - (y / s) ** 2)) - 1)).toBeLessThan(1e-3));
      expect(Math.abs(c.root.bending / ((2 * L * s) / (3 * Math.PI)) - 1)).toBeLessThan(1e-3);
    } else {
      // A lifting surface of aspect ratio 10 unloads the tips a little (the load is not quite elliptic, 2 % low
      // at 90 % span): its centre of lift moves inboard by about 0.5 %.
      expect(Math.abs(c.root.bending / ((2 * L * s) / (3 * Math.PI)) - 1)).toBeLessThan(1e-2);
    }
  });
});

describe("torsion, pitching moment and envelope", () => {
  it("a point mass relieves nz·g·kg of shear inboard of it and nz·g·kg·(y_p − y) of bending about the axis normal (beam statics)", () => {
    const opts: SolveOptions = { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 16 };
    const bare = solveMach({ stations }, 0.4, opts);
    const engine = solveMach({ stations, massItems: [{ id: "engine", y: 2.9, x: 0.5, kg: 420 }] }, 0.4, opts);
    const lc = { id: "n", mach: 0.4, altitude: 1000, weightN: 62000, nz: 2 };
    const a = evaluateCase(bare, lc);
    const b = evaluateCase(engine, lc);
    expect(a.root.shear - b.root.shear).toBeCloseTo(2 * g0 * 420, 6);
    // The default axis (quarter chord at root and tip) is swept by Λ, tan Λ = (x_tip − x_root)/s; the bending
    // is about its in-plane normal: M·n = W·(y_p cos Λ − (x_root − x_p) sin Λ) for the weight W at (x_p, y_p).
    const xr = 0.25 * 2.3;
    const xt = 0.62 + 0.25 * 0.95;
    const L = Math.hypot(xt - xr, 8.75);
    expect(a.root.bending - b.root.bending).toBeCloseTo(2 * g0 * 420 * (2.9 * (8.75 / L) - (xr - 0.5) * ((xt - xr) / L)), 6);
    const out = b.y.findIndex((y) => y > 2.9);
    expect(b.shear[out]).toBeCloseTo(a.shear[out], 9);
  });

  it("unswept rectangular wing with its axis on the quarter-chord line carries torsion from cm alone: T = q·c²·(cmAc/β)·s (CASE-EXCHANGE, REFERENCES §4)", () => {
    const st = trapezoidalWing({ span: 12, rootChord: 1.5, taperRatio: 1, cmAc: -0.05, alphaL0: -2 });
    const sol = solveMach({ stations: st }, 0.5, { spanwise: "lifting-line", rule: "prandtl-glauert", stations: 20 });
    const c = evaluateCase(sol, { id: "c", mach: 0.5, altitude: 2000, alphaDeg: 4 });
    const q = dynamicPressure(0.5, 2000);
    expect(c.root.torsion).toBeCloseTo(((q * 1.5 * 1.5 * -0.05) / Math.sqrt(0.75)) * 6, 4);
    expect(c.cm[0]).toBeCloseTo(-0.05 / Math.sqrt(0.75), 12);
  });

  it("falls back to Prandtl–Glauert scaling, with a warning, where Laitone's rule is singular at a section's working Cp", () => {
    // Laitone's denominator at Cp0 = −0.6, M = 0.9: β + M²(1 + 0.2M²)/(2β)·Cp0 < 0 (closed form, REFERENCES 1.1).
    const st = trapezoidalWing({ span: 14, rootChord: 2, taperRatio: 0.5 }).map((x) => ({ ...x, cpMin: -0.6 }));
    const sol = solveMach({ stations: st }, 0.9, { spanwise: "vortex-lattice", rule: "laitone", stations: 8 });
    expect(sol.warnings.join(" ")).toMatch(/laitone rule is singular .* Prandtl–Glauert scaling was used/);
    expect(sol.scale[0]).toBeCloseTo(1 / Math.sqrt(1 - 0.81), 12);
    const c = evaluateCase(sol, { id: "hs", mach: 0.9, altitude: 10000, alphaDeg: 1 });
    expect(c.regime).toBe("supercritical");
  });

  it("the vortex lattice takes a swept wing without a sweep warning", () => {
    const st = trapezoidalWing({ span: 17.5, rootChord: 2.6, taperRatio: 0.33, sweepQuarterChordDeg: 25 });
    expect(solveMach({ stations: st }, 0.5, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 10 }).warnings).toEqual([]);
  });

  it("wing Cm about its aerodynamic centre does not change with CL; about a point aft it rises with CL (statics)", () => {
    const sol = solveMach(model, 0.3, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 30 });
    const xac = wingAerodynamicCentre(sol);
    expect(wingPitchingMoment(sol, 0.2, xac)).toBeCloseTo(wingPitchingMoment(sol, 1.1, xac), 12);
    expect(wingPitchingMoment(sol, 1.0, xac + 0.3)).toBeGreaterThan(wingPitchingMoment(sol, 0.2, xac + 0.3));
    expect(wingPitchingMoment(sol, 0, xac)).toBeLessThan(0); // negative cmAc sections
  });

  it("the envelope keeps max and min per station with the case that gives it", () => {
    const y = [0, 1];
    const cases = [
      { id: "a", y, shear: [1, 2], bending: [5, -1], torsion: [0, 0] },
      { id: "b", y, shear: [3, -2], bending: [4, 1], torsion: [0, -7] },
    ];
    const e = loadEnvelope(cases);
    expect(e[0]).toMatchObject({ shearMax: 3, shearMaxCase: "b", shearMin: 1, shearMinCase: "a", bendingMax: 5, bendingMaxCase: "a" });
    expect(e[1]).toMatchObject({ shearMin: -2, shearMinCase: "b", torsionMin: -7, torsionMinCase: "b", torsionMax: 0, torsionMaxCase: "a" });
    const acc = createEnvelope(y);
    expect(envelopeRows(acc)).toEqual([]);
    addToEnvelope(acc, "only", cases[0]);
    expect(envelopeRows(acc)[1].bendingMinCase).toBe("only");
  });
});
