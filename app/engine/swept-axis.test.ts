import { describe, expect, it } from "vitest";
import { evaluateCase } from "./load-case";
import type { WingStation } from "./planform";
import type { SolveOptions, WingModel } from "./superposition";
import { solveMach } from "./superposition";

// A cranked, swept, twisted wing of our own (invented data): about 30° of leading-edge sweep outboard.
const stations: WingStation[] = [
  { y: 0, xLe: 0, chord: 3.0, twist: 0, a0: 6.2, alphaL0: -2.4, cmAc: -0.06 },
  { y: 4, xLe: 1.6, chord: 2.2, twist: -1, a0: 6.0, alphaL0: -2.0, cmAc: -0.05 },
  { y: 11, xLe: 5.2, chord: 1.0, twist: -3.5, a0: 5.8, alphaL0: -1.4, cmAc: -0.03 },
];
const axisFractions = { rootChordFraction: 0.35, tipChordFraction: 0.45 };
const g0 = 9.80665; // standard gravity, m/s² (ICAO Doc 7488 / USSA 1976)

/** Linear interpolation of a station quantity (the planform is piecewise linear by definition). */
function lerpAt(y: number, f: (s: WingStation) => number): number {
  let i = 0;
  while (i < stations.length - 2 && y > stations[i + 1].y) i++;
  const a = stations[i];
  const b = stations[i + 1];
  const t = (y - a.y) / (b.y - a.y);
  return f(a) + t * (f(b) - f(a));
}

describe("loads resolved about a swept reference axis (CASE-EXCHANGE: streamwise cuts, moments resolved)", { timeout: 60_000 }, () => {
  const s = 11;
  const axisRootX = 0 + 0.35 * 3.0;
  const axisTipX = 5.2 + 0.45 * 1.0;
  const len = Math.hypot(axisTipX - axisRootX, s);
  const e = { x: (axisTipX - axisRootX) / len, y: s / len }; // axis unit vector in the wing plane
  const axisX = (y: number) => axisRootX + ((axisTipX - axisRootX) * y) / s;
  const opts: SolveOptions = { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 300 };

  it("equilibrium: bending and torsion at every station equal the moment of the outboard station loads about the axis point, resolved (independent statics)", () => {
    const structuralKg = 350;
    const model: WingModel = { stations, axis: axisFractions, massKg: structuralKg };
    const sol = solveMach(model, 0.5, opts);
    const nz = 2.5;
    const c = evaluateCase(sol, { id: "A", mach: 0.5, altitude: 3000, weightN: 90000, nz });
    const q = c.dynamicPressure;
    // The running loads as the result reports them, extended to the tip (zero lift there).
    const y = [...c.y, s];
    const lift = [...c.lift, 0];
    const chord = y.map((v) => lerpAt(v, (st) => st.chord));
    const cm = [...c.cm, c.cm[c.cm.length - 1]];
    const xAc = y.map((v) => lerpAt(v, (st) => st.xLe + 0.25 * st.chord));
    // Structural mass spread in proportion to chord (the contract's "chord" distribution), on the axis.
    const semispanArea = (3.0 + 2.2) * 2 + (2.2 + 1.0) * 3.5;
    const weight = chord.map((ch) => (nz * g0 * structuralKg * ch) / semispanArea);
    let worstT = 0;
    let worstB = 0;
    for (let k = 0; k < c.y.length; k += 7) {
      const yk = y[k];
      const px = axisX(yk);
      let mx = 0;
      let my = 0;
      for (let j = k; j + 1 < y.length; j++) {
        const h = y[j + 1] - y[j];
        // Trapezoid rule over the station intervals: force up (lift minus weight), section couple q c² cm.
        const fx = (i: number) => (lift[i] - weight[i]) * (y[i] - yk);
        const fy = (i: number) => q * chord[i] * chord[i] * cm[i] + lift[i] * (px - xAc[i]) - weight[i] * (px - axisX(y[i]));
        mx += (h * (fx(j) + fx(j + 1))) / 2;
        my += (h * (fy(j) + fy(j + 1))) / 2;
      }
      const torsion = mx * e.x + my * e.y;
      const bending = mx * e.y - my * e.x;
      worstT = Math.max(worstT, Math.abs(c.torsion[k] - torsion));
      worstB = Math.max(worstB, Math.abs(c.bending[k] - bending));
    }
    // 300 stations, trapezoid rule: agreement to 0.1 % of the root bending moment.
    expect(worstB / Math.abs(c.root.bending)).toBeLessThan(1e-3);
    expect(worstT / Math.abs(c.root.bending)).toBeLessThan(1e-3);
  });

  it("a point mass off the axis: root torsion changes by nz·g·m·d, d its distance aft of the axis measured normal to it (closed-form statics)", () => {
    const yp = 6;
    const xp = 4.1;
    const kg = 500;
    const bare = solveMach({ stations, axis: axisFractions }, 0.45, opts);
    const loaded = solveMach({ stations, axis: axisFractions, massItems: [{ id: "store", y: yp, x: xp, kg }] }, 0.45, opts);
    const lc = { id: "n", mach: 0.45, altitude: 1000, weightN: 90000, nz: 3 };
    const a = evaluateCase(bare, lc);
    const b = evaluateCase(loaded, lc);
    const W = 3 * g0 * kg;
    // Distance of the mass from the axis, normal to it and aft positive: (x_p − x_axis(y_p))·cos Λ.
    const d = (xp - axisX(yp)) * e.y;
    expect(d).toBeGreaterThan(0);
    // Its weight acts down; aft of the axis it twists the wing nose up about the axis.
    expect(b.root.torsion - a.root.torsion).toBeCloseTo(W * d, 6);
    // Bending about the axis normal n = (cos Λ, −sin Λ): the weight's moment about the root axis point is
    // M = (−W·y_p, −W·(x_axis(0) − x_p)), so M·n = −W·(y_p cos Λ − (x_axis(0) − x_p) sin Λ).
    const bendingArm = yp * e.y - (axisRootX - xp) * e.x;
    expect(b.root.bending - a.root.bending).toBeCloseTo(-W * bendingArm, 6);
    // Outboard of the mass nothing changes.
    const out = b.y.findIndex((v) => v > yp);
    expect(b.torsion[out]).toBeCloseTo(a.torsion[out], 6);
  });

  it("a mass on the axis adds no torsion about it, only bending (statics)", () => {
    const yp = 5;
    const bare = solveMach({ stations, axis: axisFractions }, 0.45, { ...opts, stations: 40 });
    const loaded = solveMach({ stations, axis: axisFractions, massItems: [{ id: "store", y: yp, x: axisX(yp), kg: 400 }] }, 0.45, { ...opts, stations: 40 });
    const lc = { id: "n", mach: 0.45, altitude: 1000, weightN: 90000, nz: 2 };
    const a = evaluateCase(bare, lc);
    const b = evaluateCase(loaded, lc);
    expect(b.root.torsion - a.root.torsion).toBeCloseTo(0, 6);
    // Moment arm along the axis: y_p / cos Λ.
    expect(b.root.bending - a.root.bending).toBeCloseTo((-2 * g0 * 400 * yp) / e.y, 6);
  });
});
