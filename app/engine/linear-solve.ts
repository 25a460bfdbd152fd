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

function swapRows(a: Float64Array, n: number, r1: number, r2: number): void {
  if (r1 === r2) return;
  const o1 = r1 * n;
  const o2 = r2 * n;
  for (let j = 0; j < n; j++) {
    const t = a[o1 + j];
    a[o1 + j] = a[o2 + j];
    a[o2 + j] = t;
  }
}

function pivotRow(a: Float64Array, n: number, k: number): number {
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
  return p;
}

/**
 * Factorise `a` (overwritten) as P·A = L·U, two columns at a time: the trailing matrix is
 * streamed once per pair of pivots (a rank-2 update), which halves the memory traffic that
 * bounds a dense factorisation in JavaScript. Partial pivoting, full-row swaps.
 * @throws EngineError no-solution when the matrix is singular.
 */
export function luFactor(a: Float64Array, n: number): LuFactors {
  const pivot = new Int32Array(n);
  let k = 0;
  for (; k + 1 < n; k += 2) {
    let p = pivotRow(a, n, k);
    pivot[k] = p;
    swapRows(a, n, k, p);
    const rk = k * n;
    const rk1 = (k + 1) * n;
    const inv = 1 / a[rk + k];
    const akk1 = a[rk + k + 1];
    for (let i = k + 1; i < n; i++) {
      const ri = i * n;
      const m = a[ri + k] * inv;
      a[ri + k] = m;
      a[ri + k + 1] -= m * akk1;
    }
    p = pivotRow(a, n, k + 1);
    pivot[k + 1] = p;
    swapRows(a, n, k + 1, p);
    const m10 = a[rk1 + k];
    for (let j = k + 2; j < n; j++) a[rk1 + j] -= m10 * a[rk + j];
    const inv2 = 1 / a[rk1 + k + 1];
    for (let i = k + 2; i < n; i++) {
      const ri = i * n;
      const m1 = a[ri + k];
      const m2 = a[ri + k + 1] * inv2;
      a[ri + k + 1] = m2;
      let j = k + 2;
      for (; j + 1 < n; j += 2) {
        a[ri + j] -= m1 * a[rk + j] + m2 * a[rk1 + j];
        a[ri + j + 1] -= m1 * a[rk + j + 1] + m2 * a[rk1 + j + 1];
      }
      if (j < n) a[ri + j] -= m1 * a[rk + j] + m2 * a[rk1 + j];
    }
  }
  if (k < n) {
    pivotRow(a, n, k);
    pivot[k] = k;
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
