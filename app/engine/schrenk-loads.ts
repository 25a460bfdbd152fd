import type { CaseLoads } from "./load-case";
import { beamLoads, integrate } from "./loads";
import { sectionAt, wingGeometry } from "./planform";
import { schrenkDistribution } from "./schrenk";
import { compressibleSectionAt } from "./spanwise";
import { integrationGrid, referenceAxis, resolveAboutAxis, type MachSolution, type WingModel } from "./superposition";

/** Loads of one case at the output stations of its solution, with the lift spread by Schrenk's approximation. */
export interface SchrenkCaseLoads {
  y: number[];
  /** Aerodynamic running load, N/m. */
  lift: number[];
  /** Net internal loads (aerodynamic minus the case's inertia relief), N and N·m, resolved as the solver's are. */
  shear: number[];
  bending: number[];
  torsion: number[];
  root: { shear: number; bending: number; torsion: number };
}

/**
 * A solved case again with its lift spread along the span by Schrenk's approximation (NACA TM 948)
 * instead of the spanwise solver: the same wing lift (the case's CL at its dynamic pressure, the
 * additional loading scaled to carry exactly S/2 per unit CL and the basic loading none, as the
 * solver's are), the lift at each section's quarter chord, the section moments of the solution's
 * compressibility rule and the case's own inertia relief; cut at streamwise stations and resolved
 * about the reference axis exactly as the solver's loads. A cross-check of the spanwise method
 * only: Schrenk's loading is a planform approximation for unswept wings, its basic loading that of
 * the incompressible sections.
 */
export function schrenkCaseLoads(model: WingModel, sol: MachSolution, lc: Pick<CaseLoads, "CL" | "dynamicPressure" | "relief">, points = 400): SchrenkCaseLoads {
  const st = model.stations;
  const s = st[st.length - 1].y;
  const halfArea = wingGeometry(st).area / 2;
  const grid = integrationGrid(s, [...st.map((x) => x.y), ...sol.y], points);
  const schrenk = schrenkDistribution(st, grid);
  const ia = integrate(grid, schrenk.cclAdditional);
  const ccla = schrenk.cclAdditional.map((v) => (v * halfArea) / ia);
  const ib = integrate(grid, schrenk.cclBasic);
  const cclb = schrenk.cclBasic.map((v, k) => v - (ib / halfArea) * ccla[k]);
  const q = lc.dynamicPressure;
  const f = grid.map((_, k) => q * (cclb[k] + lc.CL * ccla[k]));
  const xAc = grid.map((y) => {
    const sec = sectionAt(st, y);
    return sec.xLe + 0.25 * sec.chord;
  });
  const t = grid.map((y) => {
    const sec = compressibleSectionAt(st, y, sol.rule, sol.mach);
    return q * sec.chord * sec.chord * sec.cm;
  });
  const axis = referenceAxis(model);
  const xRef = grid.map((y) => axis.rootX + ((axis.tipX - axis.rootX) * y) / s);
  const beam = beamLoads(grid, f, xAc, xRef, t);
  const idx = sol.y.map((y) => grid.findIndex((v) => Math.abs(v - y) <= 1e-9 * s));
  const out = { shear: idx.map((i) => beam.shear[i]), bending: idx.map((i) => beam.bending[i]), torsion: idx.map((i) => beam.torsion[i]) };
  resolveAboutAxis(out, axis);
  const shear = out.shear.map((v, k) => v - lc.relief.shear[k]);
  const bending = out.bending.map((v, k) => v - lc.relief.bending[k]);
  const torsion = out.torsion.map((v, k) => v - lc.relief.torsion[k]);
  return { y: [...sol.y], lift: idx.map((i) => f[i]), shear, bending, torsion, root: { shear: shear[0], bending: bending[0], torsion: torsion[0] } };
}
