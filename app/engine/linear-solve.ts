import { DENSE_LU_WASM } from "./dense-lu.wasm";
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

// ---- Fast dense solve: WebAssembly kernel, single-precision LU with iterative refinement ----------

/** Exports of the kernel compiled from wasm/dense-lu.ts (addresses are byte offsets in its memory). */
interface Kernel {
  factor64(a: number, n: number, piv: number, pack: number): number;
  factor32(a: number, n: number, piv: number, pack: number): number;
  solve64(lu: number, n: number, piv: number, x: number): void;
  solve32(lu: number, n: number, piv: number, x: number): void;
  residual64(a: number, n: number, x: number, b: number, r: number): void;
  demote(src: number, dst: number, count: number): void;
  demoteMatrix(a64: number, a32: number, n: number): number;
  packBytes(): number;
}

/** A kernel instance with its memory, and the solver whose system the memory holds. */
interface KernelState {
  k: Kernel;
  memory: WebAssembly.Memory;
  owner: object | null;
}

/** Below this size the plain LU above is as fast as the kernel and keeps its exact numbers. */
export const DENSE_KERNEL_MIN_N = 64;
/** LAPACK dsgesv's refinement limit. */
const ITERMAX = 30;
/** Unit roundoff of double precision (LAPACK's DLAMCH('E')). */
const EPS = 2 ** -53;
/** Largest finite single-precision number: a matrix with larger entries is solved in double. */
const F32_MAX = 3.4028234663852886e38;
/** The kernel addresses memory with 32-bit offsets: larger systems take the plain LU. */
const KERNEL_MAX_BYTES = 2 ** 31;
/** Systems up to this size share one kernel memory, kept between solves (n ≈ 2 300). */
const SHARED_MAX_BYTES = 2 ** 26;

let compiled: WebAssembly.Module | null | undefined;
let shared: KernelState | undefined;

/** The compiled kernel, or null where WebAssembly with SIMD is not available (then the plain LU is used). */
function kernelModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      const text = atob(DENSE_LU_WASM);
      const bytes = new Uint8Array(text.length);
      for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
      compiled = new WebAssembly.Module(bytes);
    } catch {
      compiled = null;
    }
  }
  return compiled;
}

function newKernel(module: WebAssembly.Module): KernelState {
  const memory = new WebAssembly.Memory({ initial: 0 });
  const k = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as Kernel;
  return { k, memory, owner: null };
}

function ensureBytes(ks: KernelState, bytes: number): void {
  const have = ks.memory.buffer.byteLength;
  if (bytes > have) ks.memory.grow(Math.ceil((bytes - have) / 65536));
}

/** How a system was solved: the kernel's mixed-precision LU, its double-precision LU, or the plain LU. */
export type DenseMethod = "mixed" | "double" | "plain";

/** A factorised system, to be solved for any number of right-hand sides. */
export interface DenseSolver {
  n: number;
  /** Solve A·x = b; returns a new vector. */
  solve(b: ArrayLike<number>): Float64Array;
  /** How the system is solved (the mixed path turns to double precision when refinement stalls). */
  method(): DenseMethod;
}

const align16 = (x: number) => (x + 15) & ~15;
const singular = () => new EngineError("no-solution", "the influence matrix is singular (check the planform)");

/**
 * Factorise a dense n×n row-major system once and solve it for any right-hand side, with the
 * accuracy of a double-precision LU with partial pivoting. `a` is not modified, and must not be
 * while the solver is in use: it is read again if other systems have used the kernel since.
 *
 * How (the method of LAPACK's dsgesv; Langou et al. 2006): the LU is made in single precision by
 * a WebAssembly kernel with 128-bit SIMD (wasm/dense-lu.ts), about twice as fast as in double;
 * each solution is then refined in double precision, x ← x + (LU)⁻¹(b − A·x) with the residual
 * computed in double, until ‖b − A·x‖∞ ≤ ε·‖A‖∞·‖x‖∞ (ε = 2⁻⁵³: a backward error of one rounding,
 * no larger than a double-precision LU's) or, once the corrections stop shrinking (the residual's
 * own round-off), ≤ √n·ε·‖A‖∞·‖x‖∞ (dsgesv's test). Where neither happens within 30 steps (a
 * matrix too ill-conditioned for single precision), or the single-precision LU meets a zero pivot
 * or an entry beyond its range, the system is factorised again in double precision by the kernel.
 * Systems of fewer than 64 unknowns, and any where WebAssembly is not available, use `luFactor`.
 *
 * The kernel's memory is kept and reused by the next system (fresh memory costs more to touch
 * than the factorisation itself on some machines); a solver whose system has been displaced
 * factorises it again, with the same result, when next used.
 * @throws EngineError no-solution when the matrix is singular.
 */
export function factorDense(a: Float64Array, n: number): DenseSolver {
  if (a.length !== n * n) throw new EngineError("invalid-argument", `expected ${n * n} matrix entries, got ${a.length}`);
  const module = n >= DENSE_KERNEL_MIN_N && 12 * n * n < KERNEL_MAX_BYTES ? kernelModule() : null;
  if (!module) {
    const f = luFactor(a.slice(), n);
    return { n, solve: (b) => luSolve(f, checkRhs(b, n)), method: () => "plain" };
  }
  const ks = 12 * n * n <= SHARED_MAX_BYTES ? (shared ??= newKernel(module)) : newKernel(module);
  const k = ks.k;
  // Layout (byte offsets): A (f64), its single-precision LU, pivots, work area, x, b, r (f64),
  // d (f32); the double-precision LU goes after them, only when needed.
  const S = n * n;
  const oA = 0;
  const oA32 = align16(8 * S);
  const oPiv = align16(oA32 + 4 * S);
  const oPack = align16(oPiv + 4 * n);
  const oX = align16(oPack + k.packBytes());
  const oB = align16(oX + 8 * n);
  const oR = align16(oB + 8 * n);
  const oD = align16(oR + 8 * n);
  const oLu = align16(oD + 4 * n);

  const owner = {};
  let mode: DenseMethod = "mixed";
  let normA = 0;
  const factorDouble = () => {
    mode = "double";
    ensureBytes(ks, oLu + 8 * S);
    new Float64Array(ks.memory.buffer, oLu, S).set(new Float64Array(ks.memory.buffer, oA, S));
    if (k.factor64(oLu, n, oPiv, oPack) !== 0) throw singular();
  };
  /** Put this system in the kernel's memory and factorise it. */
  const load = () => {
    ks.owner = owner;
    ensureBytes(ks, oLu);
    new Float64Array(ks.memory.buffer, oA, S).set(a);
    normA = k.demoteMatrix(oA, oA32, n);
    if (mode === "mixed" && normA <= F32_MAX && k.factor32(oA32, n, oPiv, oPack) === 0) return;
    factorDouble();
  };
  load();

  /** Refined solution, or null when refinement does not reach dsgesv's test. */
  const solveMixed = (b: ArrayLike<number>): Float64Array | null => {
    const oneRounding = EPS * normA;
    const dsgesvTest = Math.sqrt(n) * EPS * normA;
    const x = new Float64Array(ks.memory.buffer, oX, n);
    const r = new Float64Array(ks.memory.buffer, oR, n);
    const d = new Float32Array(ks.memory.buffer, oD, n);
    new Float64Array(ks.memory.buffer, oB, n).set(b);
    k.demote(oB, oD, n);
    k.solve32(oA32, n, oPiv, oD);
    for (let i = 0; i < n; i++) x[i] = d[i];
    let lastStep = Infinity;
    let stalled = false;
    for (let iter = 0; ; iter++) {
      k.residual64(oA, n, oX, oB, oR);
      let rNorm = 0;
      let xNorm = 0;
      for (let i = 0; i < n; i++) {
        rNorm = Math.max(rNorm, Math.abs(r[i]));
        xNorm = Math.max(xNorm, Math.abs(x[i]));
      }
      if (rNorm <= oneRounding * xNorm || (stalled && rNorm <= dsgesvTest * xNorm)) return x.slice();
      if (iter === ITERMAX || !(rNorm < Infinity)) return null;
      k.demote(oR, oD, n);
      k.solve32(oA32, n, oPiv, oD);
      let step = 0;
      for (let i = 0; i < n; i++) {
        x[i] += d[i];
        step = Math.max(step, Math.abs(d[i]));
      }
      stalled = step > lastStep / 2;
      lastStep = step;
    }
  };
  const solveDouble = (b: ArrayLike<number>): Float64Array => {
    const x = new Float64Array(ks.memory.buffer, oX, n);
    x.set(b);
    k.solve64(oLu, n, oPiv, oX);
    return x.slice();
  };
  return {
    n,
    solve(b) {
      checkRhs(b, n);
      if (ks.owner !== owner) load();
      if (mode === "mixed") {
        const x = solveMixed(b);
        if (x) return x;
        factorDouble();
      }
      return solveDouble(b);
    },
    method: () => mode,
  };
}

function checkRhs(b: ArrayLike<number>, n: number): ArrayLike<number> {
  if (b.length !== n) throw new EngineError("invalid-argument", `expected ${n} right-hand-side entries, got ${b.length}`);
  return b;
}
