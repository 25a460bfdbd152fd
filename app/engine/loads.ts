/** Internal loads along the span at the integration nodes. */
export interface BeamLoads {
  /** Shear force, N: ∫_y^s f dy'. Positive for upward outboard load. */
  shear: Float64Array;
  /** Bending moment, N·m: ∫_y^s f(y')(y' − y) dy'. Positive for upward outboard load. */
  bending: Float64Array;
  /** Torsion about the reference axis at y, N·m, nose up positive. */
  torsion: Float64Array;
}

/**
 * Cantilever statics from the tip inward (no load outboard of the last node).
 * `f` is an upward force per span (N/m) at nodes `y` (ascending, m), linear between nodes, acting at
 * streamwise position `xa` (m, linear between nodes); `t` an optional nose-up moment per span (N·m/m).
 * Torsion at node k is taken about the reference-axis point `xRef[k]` of that station, in the
 * streamwise-cut convention: T(y) = ∫_y^s t dy' + ∫_y^s f(y')·(x_ref(y) − x_a(y')) dy'.
 * Shear and bending are exact for piecewise-linear f; the moment term uses the trapezoid rule.
 */
export function beamLoads(
  y: ArrayLike<number>,
  f: ArrayLike<number>,
  xa: ArrayLike<number>,
  xRef: ArrayLike<number>,
  t?: ArrayLike<number>,
): BeamLoads {
  const n = y.length;
  const shear = new Float64Array(n);
  const bending = new Float64Array(n);
  const torsion = new Float64Array(n);
  let V = 0;
  let M = 0;
  let X = 0;
  let C = 0;
  torsion[n - 1] = 0;
  for (let k = n - 2; k >= 0; k--) {
    const h = y[k + 1] - y[k];
    const fa = f[k];
    const fb = f[k + 1];
    M += V * h + (h * h * (fa + 2 * fb)) / 6;
    V += (h * (fa + fb)) / 2;
    X += (h * (2 * fa * xa[k] + fa * xa[k + 1] + fb * xa[k] + 2 * fb * xa[k + 1])) / 6;
    if (t) C += (h * (t[k] + t[k + 1])) / 2;
    shear[k] = V;
    bending[k] = M;
    torsion[k] = C + xRef[k] * V - X;
  }
  return { shear, bending, torsion };
}

/** Trapezoid integral of piecewise-linear values over the nodes. */
export function integrate(y: ArrayLike<number>, f: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k + 1 < y.length; k++) s += ((y[k + 1] - y[k]) * (f[k] + f[k + 1])) / 2;
  return s;
}

/** ∫ f·g for two piecewise-linear functions (exact). */
export function integrateProduct(y: ArrayLike<number>, f: ArrayLike<number>, g: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k + 1 < y.length; k++) {
    const h = y[k + 1] - y[k];
    s += (h * (2 * f[k] * g[k] + f[k] * g[k + 1] + f[k + 1] * g[k] + 2 * f[k + 1] * g[k + 1])) / 6;
  }
  return s;
}
