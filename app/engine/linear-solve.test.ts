import { describe, expect, it } from "vitest";
import { LuDecomposition, Matrix, solve } from "ml-matrix";
import { DENSE_KERNEL_MIN_N, factorDense, luFactor, luSolve } from "./linear-solve";
import type { DenseSolver } from "./linear-solve";
import { buildVortexLattice } from "./vortex-lattice";
import type { WingStation } from "./planform";

/** Deterministic pseudo-random numbers in [−0.5, 0.5). */
function lcg(seed: number) {
  return () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648 - 0.5;
}

function randomSystem(n: number, seed: number) {
  const rnd = lcg(seed);
  const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => rnd()));
  if (n > 1) rows[0][0] = 0; // forces a row swap at the first step
  const b = Array.from({ length: n }, () => rnd());
  return { rows, a: Float64Array.from(rows.flat()), b };
}

const normInf = (v: ArrayLike<number>) => {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
};

/** ‖b − A·x‖∞ / (‖A‖∞ ‖x‖∞): the normwise backward error, computed here in plain double precision. */
function backwardError(a: Float64Array, n: number, x: ArrayLike<number>, b: ArrayLike<number>): number {
  let r = 0;
  let normA = 0;
  for (let i = 0; i < n; i++) {
    let s = b[i];
    let row = 0;
    for (let j = 0; j < n; j++) {
      s -= a[i * n + j] * x[j];
      row += Math.abs(a[i * n + j]);
    }
    r = Math.max(r, Math.abs(s));
    normA = Math.max(normA, row);
  }
  return r / (normA * normInf(x));
}

/** The stated accuracy for a well-conditioned system: a backward error of one rounding, ε = 2⁻⁵³ (with 1 % for the round-off of this check). */
const ONE_ROUNDING = 1.01 * 2 ** -53;
/** Where refinement stalls first: LAPACK dsgesv's test, √n·ε. */
const bound = (n: number) => 1.01 * Math.sqrt(n) * 2 ** -53;

describe("dense LU solve (plain)", () => {
  it.each([1, 2, 3, 4, 5, 9, 37, 38])("n = %d agrees with ml-matrix (a well-known linear-algebra package) on a non-symmetric system needing pivoting", (n) => {
    const { rows, b } = randomSystem(n, 12345);
    const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
    const x = luSolve(luFactor(Float64Array.from(rows.flat()), n), b);
    for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(ref[i], 9);
  });

  it("throws on a singular matrix", () => {
    expect(() => luFactor(Float64Array.from([1, 2, 2, 4]), 2)).toThrow(/singular/);
  });
});

describe("dense solve (WebAssembly kernel, single-precision LU refined in double)", () => {
  it.each([DENSE_KERNEL_MIN_N, 65, 100, 131, 257])("n = %d: same solution as ml-matrix's LU, backward error within one rounding (the plain LU's within √n), A untouched", (n) => {
    const { rows, a, b } = randomSystem(n, 777 + n);
    const copy = a.slice();
    const s = factorDense(a, n);
    const x = s.solve(b);
    expect(s.method()).toBe("mixed");
    expect(a).toEqual(copy);
    const ref = new LuDecomposition(new Matrix(rows)).solve(Matrix.columnVector(b)).to1DArray();
    // Forward error ≤ condition number × backward error: 1e-10 leaves room for κ up to 10⁶.
    const scale = normInf(ref);
    for (let i = 0; i < n; i++) expect(Math.abs(x[i] - ref[i]) / scale).toBeLessThan(1e-10);
    expect(backwardError(copy, n, x, b)).toBeLessThan(ONE_ROUNDING);
    // The plain double-precision LU, for comparison, meets dsgesv's √n·ε (here 1–3 roundings).
    expect(backwardError(copy, n, luSolve(luFactor(copy.slice(), n), b), b)).toBeLessThan(bound(n));
  });

  it("solves several right-hand sides with one factorisation", () => {
    const n = 90;
    const { rows, a } = randomSystem(n, 42);
    const s = factorDense(a, n);
    const rnd = lcg(9);
    for (let k = 0; k < 3; k++) {
      const b = Array.from({ length: n }, () => rnd());
      const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
      const x = s.solve(b);
      for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(ref[i], 9);
    }
    expect(Array.from(s.solve(new Float64Array(n))).every((v) => v === 0)).toBe(true);
  });

  it("a solver displaced from the kernel's memory by another system factorises again and gives the same numbers", () => {
    const n = 96;
    const one = randomSystem(n, 21);
    const two = randomSystem(n, 22);
    const s1 = factorDense(one.a, n);
    const first = s1.solve(one.b);
    const s2 = factorDense(two.a, n);
    expect(s1.solve(one.b)).toEqual(first);
    const ref = solve(new Matrix(two.rows), Matrix.columnVector(two.b)).to1DArray();
    const x2 = s2.solve(two.b);
    for (let i = 0; i < n; i++) expect(x2[i]).toBeCloseTo(ref[i], 9);
    expect(s1.solve(one.b)).toEqual(first);
  });

  it("falls back to the double-precision LU for a matrix too ill-conditioned for single precision (κ ≈ 10¹⁰), still accurate", () => {
    // A = U·diag(σ)·Vᵀ-like: a graded diagonal mixed by two well-conditioned triangular factors.
    const n = 80;
    const rnd = lcg(5);
    const L = new Float64Array(n * n);
    const U = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        if (j < i) L[i * n + j] = 0.3 * rnd();
        if (j > i) U[i * n + j] = 0.3 * rnd();
      }
      L[i * n + i] = 1;
      U[i * n + i] = 10 ** (-10 * (i / (n - 1)));
    }
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) for (let j = 0; j < n; j++) a[i * n + j] += L[i * n + k] * U[k * n + j];
    const b = Array.from({ length: n }, () => rnd());
    const s = factorDense(a, n);
    const x = s.solve(b);
    expect(s.method()).toBe("double");
    expect(backwardError(a, n, x, b)).toBeLessThan(bound(n) * 10);
    const plain = luSolve(luFactor(a.slice(), n), b);
    expect(backwardError(a, n, plain, b)).toBeLessThan(bound(n) * 10);
  });

  it("uses double precision where entries exceed single precision's range", () => {
    const n = 70;
    const { rows, a, b } = randomSystem(n, 3);
    const big = a.map((v) => v * 1e40);
    const s = factorDense(big, n);
    const x = s.solve(b);
    expect(s.method()).toBe("double");
    const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
    for (let i = 0; i < n; i++) expect(x[i] * 1e40).toBeCloseTo(ref[i], 8);
  });

  it("throws on a singular matrix (a zero column)", () => {
    const n = 70;
    const { a } = randomSystem(n, 11);
    for (let i = 0; i < n; i++) a[i * n + 40] = 0;
    expect(() => factorDense(a, n)).toThrow(/singular/);
  });

  it("refuses a right-hand side of the wrong length", () => {
    const { a } = randomSystem(70, 1);
    expect(() => factorDense(a, 70).solve([1, 2])).toThrow(/right-hand-side/);
  });

  it("on real vortex-lattice systems (a cranked wing, 400 and 1 200 strips): backward error of one rounding and the plain LU's loads to 1e-12", () => {
    const stations: WingStation[] = [
      { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055 },
      { y: 3.1, xLe: 0.25, chord: 1.8, twist: -0.8, a0: 6.0, alphaL0: -2.0, cmAc: -0.05 },
      { y: 8.7, xLe: 0.95, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04 },
    ];
    let used: DenseSolver | undefined;
    let worst = 0;
    const spy = (a: Float64Array, n: number) => {
      used = factorDense(a, n);
      const b = Array.from({ length: n }, lcg(n));
      worst = Math.max(worst, backwardError(a, n, used.solve(b), b) / ONE_ROUNDING);
      return used;
    };
    const plain = (a: Float64Array, n: number): DenseSolver => {
      const f = luFactor(a.slice(), n);
      return { n, solve: (b) => luSolve(f, b), method: () => "plain" };
    };
    for (const resolution of [400, 1200]) {
      const opts = { mach: 0.6, rule: "prandtl-glauert" as const, resolution };
      const rhs = [() => 1, (s: { twist: number }) => s.twist * (Math.PI / 180)];
      const fast = buildVortexLattice(stations, { ...opts, denseSolver: spy }).solveMany(rhs);
      expect(used?.method()).toBe("mixed");
      expect(worst).toBeLessThan(1);
      const ref = buildVortexLattice(stations, { ...opts, denseSolver: plain }).solveMany(rhs);
      // Both solutions are within κ·(backward error) of the exact one; κ₁ of these systems is up to
      // 6·10⁵ (numpy.linalg.cond, 1 200 strips) and both backward errors are below 10⁻¹⁷ here.
      for (let k = 0; k < rhs.length; k++) {
        expect(Math.abs(fast[k].CL - ref[k].CL)).toBeLessThan(1e-12 * Math.abs(ref[k].CL));
        for (const y of [0, 1, 3.1, 5, 8, 8.6]) expect(Math.abs(fast[k].cclAt(y) - ref[k].cclAt(y))).toBeLessThan(1e-12 * Math.abs(ref[k].cclAt(0)));
      }
    }
  }, 60_000);
});
