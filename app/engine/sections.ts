import { EngineError } from "./errors";

/** One row of a measured or computed section polar: angle (deg), lift and quarter-chord moment coefficients. */
export interface SectionTableRow {
  alphaDeg: number;
  cl: number;
  cm: number;
}

/** Linear section characteristics fitted to a polar table. */
export interface SectionFit {
  /** Lift-curve slope, per rad. */
  a0PerRad: number;
  /** Zero-lift angle, deg. */
  alphaL0Deg: number;
  /** Moment coefficient at zero lift (= about the aerodynamic centre). */
  cmAc: number;
  /** The angle range (deg) over which cl is linear within the tolerance. */
  linearRange: { alphaMinDeg: number; alphaMaxDeg: number };
  /** Root-mean-square deviation of cl from the fitted line over the linear range. */
  residual: number;
  /** Largest cl in the table. */
  clMaxObserved: number;
}

function lineFit(x: number[], y: number[]): { slope: number; intercept: number; maxDev: number; rms: number } {
  const n = x.length;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    sx += x[i];
    sy += y[i];
  }
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  const slope = sxx > 0 ? sxy / sxx : 0;
  const intercept = my - slope * mx;
  let maxDev = 0;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const d = y[i] - (intercept + slope * x[i]);
    maxDev = Math.max(maxDev, Math.abs(d));
    ss += d * d;
  }
  return { slope, intercept, maxDev, rms: Math.sqrt(ss / n) };
}

/**
 * Fit a0, αL0 and cmAc to a section table over its linear range.
 * The linear range is the longest run of consecutive angles (at least 3) whose cl lies within
 * `tolerance` (default 0.01 in cl, common practice, no source) of its own least-squares line
 * with a positive slope; among equally long runs the smallest residual wins. cmAc is the
 * zero-lift intercept of a straight-line fit of cm against cl over that range, since the moment
 * at zero lift is the same about every point and equals the moment about the aerodynamic centre.
 * @throws EngineError invalid-section for fewer than 3 rows, repeated angles, or no linear run.
 */
export function fitSectionTable(rows: readonly SectionTableRow[], tolerance = 0.01): SectionFit {
  if (!Array.isArray(rows) || rows.length < 3) throw new EngineError("invalid-section", "needs at least 3 rows", "rows");
  rows.forEach((r, i) => {
    for (const k of ["alphaDeg", "cl", "cm"] as const) {
      if (!Number.isFinite(r[k])) throw new EngineError("invalid-section", "must be a finite number", `rows[${i}].${k}`);
    }
  });
  const sorted = [...rows].sort((a, b) => a.alphaDeg - b.alphaDeg);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i].alphaDeg === sorted[i - 1].alphaDeg) {
      throw new EngineError("invalid-section", `angle ${sorted[i].alphaDeg}° appears twice`, "rows");
    }
  }
  const a = sorted.map((r) => r.alphaDeg);
  const cl = sorted.map((r) => r.cl);
  let best: { i: number; j: number; rms: number } | undefined;
  for (let i = 0; i < sorted.length; i++) {
    for (let j = i + 2; j < sorted.length; j++) {
      const f = lineFit(a.slice(i, j + 1), cl.slice(i, j + 1));
      if (f.slope <= 0 || f.maxDev > tolerance) continue;
      const len = j - i;
      if (!best || len > best.j - best.i || (len === best.j - best.i && f.rms < best.rms)) best = { i, j, rms: f.rms };
    }
  }
  if (!best) throw new EngineError("invalid-section", "no linear range of at least 3 points was found", "rows");
  const xs = a.slice(best.i, best.j + 1);
  const ys = cl.slice(best.i, best.j + 1);
  const f = lineFit(xs, ys);
  const cmFit = lineFit(ys, sorted.slice(best.i, best.j + 1).map((r) => r.cm));
  return {
    a0PerRad: (f.slope * 180) / Math.PI,
    alphaL0Deg: -f.intercept / f.slope,
    cmAc: cmFit.intercept,
    linearRange: { alphaMinDeg: xs[0], alphaMaxDeg: xs[xs.length - 1] },
    residual: f.rms,
    clMaxObserved: Math.max(...cl),
  };
}
