import { EngineError } from "./errors";

/**
 * LU factorisation with partial pivoting of a dense n×n row-major matrix, in place.
 * A flat Float64Array keeps the inner loop contiguous: on the benchmark machine this is several
 * times faster than the general-purpose ml-matrix decomposition for the 1 000+ unknowns of a
 * vortex lattice (see docs/benchmarks.md); the tests check it against ml-matrix.
 */
export interface LuFactors {
  n: number;
  lu: Float64Array;
  pivot: Int32Array;
}

/** Factorise `a` (overwritten). @throws EngineError no-solution when the matrix is singular. */
export function luFactor(a: Float64Array, n: number): LuFactors {
  const pivot = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    let p = k;
    let max = Math.abs(a[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * n + k]);
      if (v > max) {
        max = v;
        p = i;
      }
    }
    if (!(max > 0)) throw new EngineError("no-solution", "the influence matrix is singular (check the planform)");
    pivot[k] = p;
    if (p !== k) {
      const rk = k * n;
      const rp = p * n;
      for (let j = 0; j < n; j++) {
        const t = a[rk + j];
        a[rk + j] = a[rp + j];
        a[rp + j] = t;
      }
    }
    const rk = k * n;
    const inv = 1 / a[rk + k];
    for (let i = k + 1; i < n; i++) {
      const ri = i * n;
      const m = a[ri + k] * inv;
      if (m === 0) continue;
      a[ri + k] = m;
      for (let j = k + 1; j < n; j++) a[ri + j] -= m * a[rk + j];
    }
  }
  return { n, lu: a, pivot };
}

/** Solve A·x = b with the factors of A; returns a new vector. */
export function luSolve(f: LuFactors, b: ArrayLike<number>): Float64Array {
  const { n, lu, pivot } = f;
  const x = Float64Array.from(b);
  for (let k = 0; k < n; k++) {
    const p = pivot[k];
    if (p !== k) {
      const t = x[k];
      x[k] = x[p];
      x[p] = t;
    }
  }
  for (let i = 0; i < n; i++) {
    let s = x[i];
    const ri = i * n;
    for (let j = 0; j < i; j++) s -= lu[ri + j] * x[j];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    const ri = i * n;
    for (let j = i + 1; j < n; j++) s -= lu[ri + j] * x[j];
    x[i] = s / lu[ri + i];
  }
  return x;
}
