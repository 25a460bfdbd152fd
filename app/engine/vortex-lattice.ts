import { EngineError } from "./errors";
import { factorDense } from "./linear-solve";
import type { SectionAt, WingStation } from "./planform";
import { sectionAt, validateStations, wingGeometry } from "./planform";
import type { SpanwiseOptions, SpanwiseResult, SpanwiseSystem } from "./spanwise";
import { checkMach, compressibleSectionAt } from "./spanwise";

/** Default number of spanwise strips per semispan. */
export const VORTEX_LATTICE_DEFAULT_STRIPS = 60;
/** Most strips per semispan the engine accepts (the dense solve grows as the cube of the count). */
export const VORTEX_LATTICE_MAX_STRIPS = 2000;

const FOUR_PI = 4 * Math.PI;

/** Downwash (positive up) at P from a unit horseshoe: legs from +∞ to A, bound A→B, B to +∞, all in z = 0. */
function horseshoeW(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const r1x = px - ax;
  const r1y = py - ay;
  const r2x = px - bx;
  const r2y = py - by;
  const l1 = Math.sqrt(r1x * r1x + r1y * r1y);
  const l2 = Math.sqrt(r2x * r2x + r2y * r2y);
  let w = 0;
  const cz = r1x * r2y - r1y * r2x;
  if (Math.abs(cz) > 1e-12 * (l1 * l2 + 1e-300)) {
    const r0x = bx - ax;
    const r0y = by - ay;
    w += (r0x * (r1x / l1 - r2x / l2) + r0y * (r1y / l1 - r2y / l2)) / cz;
  }
  if (Math.abs(r2y) > 1e-12) w += (1 + r2x / l2) / r2y;
  if (Math.abs(r1y) > 1e-12) w -= (1 + r1x / l1) / r1y;
  return w / FOUR_PI;
}

/** Spanwise strip edges on [0, s]: cosine spacing over the whole span, i.e. half-cosine on one side (fine at the tip), nearest edge snapped to each planform break. */
export function stripEdges(stations: readonly WingStation[], strips: number, spacing: "cosine" | "uniform" = "cosine"): number[] {
  const s = stations[stations.length - 1].y;
  const e: number[] = [];
  for (let j = 0; j <= strips; j++) e.push(spacing === "uniform" ? (s * j) / strips : s * Math.sin((j * Math.PI) / (2 * strips)));
  for (let i = 1; i < stations.length - 1; i++) {
    const yb = stations[i].y;
    let best = 1;
    for (let j = 1; j < strips; j++) if (Math.abs(e[j] - yb) < Math.abs(e[best] - yb)) best = j;
    if (strips > 1 && yb > e[best - 1] && yb < e[best + 1]) e[best] = yb;
  }
  return e;
}

/**
 * Vortex-lattice method on one semispan with its mirror image (symmetric load): one horseshoe vortex
 * per spanwise strip, its bound leg on the strip's quarter-chord line and trailing legs streamwise to
 * infinity; flat camber surface, camber through αL0.
 * Compressibility by the Prandtl–Glauert–Göthert transformation: the planform is stretched
 * streamwise by 1/β and solved as incompressible; lift per span is the same in both flows, so
 * c·cl and CL follow on the real planform. Section slopes other than 2π: the control point sits at
 * 1/4 + a′/(4π) of the chord (a′ the slope in the stretched flow), which makes a 2-D strip give a′
 * exactly and keeps the induced angle of the 3-D strip as it is (a′ = 2π gives the classical 3/4 chord).
 * One chordwise panel per strip only: scaling the normal-wash of several chordwise panels by a′/2π,
 * the only simple way to impose a′ there, also scales the induced angle and mis-states the lift of
 * sections whose slope is not 2π, so the engine does not offer it.
 */
export function buildVortexLattice(stations: readonly WingStation[], opts: SpanwiseOptions): SpanwiseSystem {
  validateStations(stations);
  const beta = checkMach(opts.mach);
  const n = opts.resolution ?? VORTEX_LATTICE_DEFAULT_STRIPS;
  if (!Number.isInteger(n) || n < 2 || n > VORTEX_LATTICE_MAX_STRIPS) {
    throw new EngineError("invalid-argument", `must be a whole number from 2 to ${VORTEX_LATTICE_MAX_STRIPS}`, "method.strips");
  }
  const g = wingGeometry(stations);
  const s = g.semispan;
  const edges = stripEdges(stations, n, opts.spacing);
  // Strip geometry in the stretched frame (x' = x/β).
  const ax = new Float64Array(n);
  const ay = new Float64Array(n);
  const bx = new Float64Array(n);
  const by = new Float64Array(n);
  const cx = new Float64Array(n);
  const cy = new Float64Array(n);
  const mids: SectionAt[] = [];
  const yMid: number[] = [];
  const width: number[] = [];
  for (let j = 0; j < n; j++) {
    const y0 = edges[j];
    const y1 = edges[j + 1];
    const ym = 0.5 * (y0 + y1);
    const s0 = sectionAt(stations, y0);
    const s1 = sectionAt(stations, y1);
    const sm = compressibleSectionAt(stations, ym, opts.rule, opts.mach);
    mids.push(sm);
    yMid.push(ym);
    width.push(y1 - y0);
    // Slope the stretched flow must reproduce: real slope k·a0 times β.
    const aStretched = sm.a * beta;
    ax[j] = (s0.xLe + 0.25 * s0.chord) / beta;
    ay[j] = y0;
    bx[j] = (s1.xLe + 0.25 * s1.chord) / beta;
    by[j] = y1;
    cx[j] = (0.5 * (s0.xLe + s1.xLe) + (0.25 + aStretched / FOUR_PI) * 0.5 * (s0.chord + s1.chord)) / beta;
    cy[j] = ym;
  }
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const px = cx[i];
    const py = cy[i];
    const row = i * n;
    for (let k = 0; k < n; k++) {
      // Starboard horseshoe plus its port mirror image (bound leg again along +y: from −y1 to −y0).
      A[row + k] = horseshoeW(px, py, ax[k], ay[k], bx[k], by[k]) + horseshoeW(px, py, bx[k], -by[k], ax[k], -ay[k]);
    }
  }
  const system = (opts.denseSolver ?? factorDense)(A, n);
  const halfArea = g.area / 2;
  const solveOne = (alphaStrip: number[]): SpanwiseResult => {
    const rhs = new Float64Array(n);
    for (let j = 0; j < n; j++) rhs[j] = -alphaStrip[j];
    const gamma = system.solve(rhs);
    const ccl: number[] = [];
    let lift = 0;
    for (let j = 0; j < n; j++) {
      // Kutta–Joukowski per unit span: l = ρVΓ, so c·cl = 2Γ/V with V = 1.
      ccl.push(2 * gamma[j]);
      lift += 2 * gamma[j] * width[j];
    }
    const CL = lift / halfArea;
    const cclAt = (y: number): number => {
      if (y <= yMid[0]) return ccl[0];
      const last = n - 1;
      if (y >= yMid[last]) {
        // Square-root fall to zero at the tip, the shape of any smooth wing-tip load.
        if (y >= s) return 0;
        return ccl[last] * Math.sqrt((s - y) / (s - yMid[last]));
      }
      let lo = 0;
      let hi = last;
      while (hi - lo > 1) {
        const m = (lo + hi) >> 1;
        if (yMid[m] <= y) lo = m;
        else hi = m;
      }
      const t = (y - yMid[lo]) / (yMid[hi] - yMid[lo]);
      return ccl[lo] + t * (ccl[hi] - ccl[lo]);
    };
    return { CL, cclAt };
  };
  const solveMany = (list: ((s: SectionAt) => number)[]) => list.map((rhs) => solveOne(mids.map(rhs)));
  return {
    method: "vortex-lattice",
    mach: opts.mach,
    beta,
    breakpoints: stations.map((st) => st.y),
    solve: (rhs) => solveMany([rhs])[0],
    solveMany,
  };
}
