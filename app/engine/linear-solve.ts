import { EngineError } from "./errors";

/**
 * LU factorisation with partial pivoting of a dense n×n row-major matrix, in place.
 * A flat Float64Array and blocked updates make it several times faster than the general-purpose
 * ml-matrix decomposition for the 1 000+ unknowns of a vortex lattice (see docs/benchmarks.md);
 * the tests check it against ml-matrix.
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

const BLOCK = 4;

/**
 * Factorise `a` (overwritten) as P·A = L·U by a blocked right-looking LU with partial pivoting
 * (full-row swaps): each panel of 4 columns is factorised on its own, then the trailing matrix
 * gets one rank-4 update, so it is streamed once per 4 pivots — memory traffic, not arithmetic,
 * bounds a dense factorisation in JavaScript.
 * @throws EngineError no-solution when the matrix is singular.
 */
export function luFactor(a: Float64Array, n: number): LuFactors {
  const pivot = new Int32Array(n);
  for (let k0 = 0; k0 < n; k0 += BLOCK) {
    const kend = Math.min(k0 + BLOCK, n);
    for (let c = k0; c < kend; c++) {
      // Bring column c up to date with the panel's earlier columns.
      for (let p = k0; p < c; p++) {
        const apc = a[p * n + c];
        if (apc === 0) continue;
        for (let i = p + 1; i < n; i++) a[i * n + c] -= a[i * n + p] * apc;
      }
      let pr = c;
      let max = Math.abs(a[c * n + c]);
      for (let i = c + 1; i < n; i++) {
        const v = Math.abs(a[i * n + c]);
        if (v > max) {
          max = v;
          pr = i;
        }
      }
      if (!(max > 0)) throw new EngineError("no-solution", "the influence matrix is singular (check the planform)");
      pivot[c] = pr;
      swapRows(a, n, c, pr);
      const inv = 1 / a[c * n + c];
      for (let i = c + 1; i < n; i++) a[i * n + c] *= inv;
    }
    // The panel's rows of U right of the panel.
    for (let r = k0 + 1; r < kend; r++) {
      const rr = r * n;
      for (let q = k0; q < r; q++) {
        const m = a[rr + q];
        if (m === 0) continue;
        const rq = q * n;
        for (let j = kend; j < n; j++) a[rr + j] -= m * a[rq + j];
      }
    }
    // Trailing update, rank 4 in one pass (the general loop only for a short last panel).
    if (kend - k0 === BLOCK) {
      const r0 = k0 * n;
      const r1 = r0 + n;
      const r2 = r1 + n;
      const r3 = r2 + n;
      for (let i = kend; i < n; i++) {
        const ri = i * n;
        const m0 = a[ri + k0];
        const m1 = a[ri + k0 + 1];
        const m2 = a[ri + k0 + 2];
        const m3 = a[ri + k0 + 3];
        for (let j = kend; j < n; j++) a[ri + j] -= m0 * a[r0 + j] + m1 * a[r1 + j] + m2 * a[r2 + j] + m3 * a[r3 + j];
      }
    } else {
      for (let i = kend; i < n; i++) {
        const ri = i * n;
        for (let q = k0; q < kend; q++) {
          const m = a[ri + q];
          if (m === 0) continue;
          const rq = q * n;
          for (let j = kend; j < n; j++) a[ri + j] -= m * a[rq + j];
        }
      }
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
