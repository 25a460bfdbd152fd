// AssemblyScript source of the engine's dense LU kernel (compiled to WebAssembly with SIMD by
// `npm run build:wasm`; the bytes are embedded in ../dense-lu.wasm.ts, whose test recompiles this
// file and compares). Row-major n×n matrices in the caller's memory, addressed by byte offsets.
//
// One generic algorithm, instantiated for f32 and f64: recursive LU with partial pivoting
// (Toledo 1997): factor the left half of the columns, solve for the top-right block, update the
// bottom-right block with one matrix product, factor the right half. Nearly all the arithmetic
// lands in the product, which runs in a register-blocked kernel (4 rows × 2 vectors of
// accumulators, 128-bit SIMD), over a packed copy of the right-hand factor so that its rows are
// read contiguously. Rows are swapped whole (LAPACK's convention), so P·A = L·U at the end.

/** Columns factorised one at a time below this width. */
const LEAF: i32 = 8;
/** Triangular solves done row by row below this height. */
const TRSM_LEAF: i32 = 16;
/** Cache blocking of the product: inner dimension and columns of one packed block. */
const KC: i32 = 256;
const NC: i32 = 512;

@inline function lanes<T>(): i32 {
  return 16 / <i32>sizeof<T>();
}

@inline function addr<T>(a: usize, ld: i32, i: i32, j: i32): usize {
  return a + (<usize>i * <usize>ld + <usize>j) * sizeof<T>();
}

/**
 * C -= A·B, C m×w, A m×k, B k×w, all row-major with leading dimension ld. `pack` holds up to
 * KC×NC elements of B in blocks of 2 vectors' width, row after row.
 */
function gemm<T>(c: usize, a: usize, b: usize, m: i32, w: i32, k: i32, ld: i32, pack: usize): void {
  if (m <= 0 || w <= 0 || k <= 0) return;
  const S = <usize>sizeof<T>();
  const NR = 2 * lanes<T>();
  const wFull = w - (w % NR);
  const rowBytes = <usize>ld * S;
  for (let jc = 0; jc < wFull; jc += NC) {
    const wc = min(NC, wFull - jc);
    for (let pc = 0; pc < k; pc += KC) {
      const kc = min(KC, k - pc);
      // Pack B[pc:pc+kc, jc:jc+wc] as [column block][row][NR].
      let dst = pack;
      for (let jr = 0; jr < wc; jr += NR) {
        let src = addr<T>(b, ld, pc, jc + jr);
        for (let q = 0; q < kc; q++) {
          v128.store(dst, v128.load(src));
          v128.store(dst, v128.load(src, 16), 16);
          dst += 32;
          src += rowBytes;
        }
      }
      let i = 0;
      for (; i + 4 <= m; i += 4) {
        const a0 = addr<T>(a, ld, i, pc);
        for (let jr = 0; jr < wc; jr += NR) {
          micro4<T>(addr<T>(c, ld, i, jc + jr), a0, pack + <usize>jr * <usize>kc * S, kc, rowBytes);
        }
      }
      for (; i < m; i++) {
        const a0 = addr<T>(a, ld, i, pc);
        for (let jr = 0; jr < wc; jr += NR) {
          micro1<T>(addr<T>(c, ld, i, jc + jr), a0, pack + <usize>jr * <usize>kc * S, kc);
        }
      }
    }
  }
  // Columns beyond the last whole block.
  if (wFull < w) {
    for (let i = 0; i < m; i++) {
      const ci = addr<T>(c, ld, i, 0);
      const ai = addr<T>(a, ld, i, 0);
      for (let j = wFull; j < w; j++) {
        let s: T = <T>0;
        let bq = addr<T>(b, ld, 0, j);
        for (let q = 0; q < k; q++) {
          s += load<T>(ai + <usize>q * S) * load<T>(bq);
          bq += rowBytes;
        }
        const cj = ci + <usize>j * S;
        store<T>(cj, load<T>(cj) - s);
      }
    }
  }
}

/**
 * 4 rows × 2 vectors of C -= A(4×kc)·Bpacked(kc×2 vectors): 8 accumulators, two loads of B and
 * four broadcasts of A per step, so x64's 16 vector registers hold it all. (Unrolling the loop,
 * or 5 or 6 rows, measured no faster in V8.)
 */
@inline function micro4<T>(c: usize, a: usize, bp: usize, kc: i32, rowBytes: usize): void {
  const S = <usize>sizeof<T>();
  let c00 = v128.splat<T>(<T>0), c01 = c00, c10 = c00, c11 = c00;
  let c20 = c00, c21 = c00, c30 = c00, c31 = c00;
  let a0 = a;
  let a1 = a + rowBytes;
  let a2 = a1 + rowBytes;
  let a3 = a2 + rowBytes;
  let p = bp;
  for (let q = 0; q < kc; q++) {
    const b0 = v128.load(p);
    const b1 = v128.load(p, 16);
    let x = v128.load_splat<T>(a0);
    c00 = v128.add<T>(c00, v128.mul<T>(x, b0));
    c01 = v128.add<T>(c01, v128.mul<T>(x, b1));
    x = v128.load_splat<T>(a1);
    c10 = v128.add<T>(c10, v128.mul<T>(x, b0));
    c11 = v128.add<T>(c11, v128.mul<T>(x, b1));
    x = v128.load_splat<T>(a2);
    c20 = v128.add<T>(c20, v128.mul<T>(x, b0));
    c21 = v128.add<T>(c21, v128.mul<T>(x, b1));
    x = v128.load_splat<T>(a3);
    c30 = v128.add<T>(c30, v128.mul<T>(x, b0));
    c31 = v128.add<T>(c31, v128.mul<T>(x, b1));
    a0 += S;
    a1 += S;
    a2 += S;
    a3 += S;
    p += 32;
  }
  let r = c;
  v128.store(r, v128.sub<T>(v128.load(r), c00));
  v128.store(r, v128.sub<T>(v128.load(r, 16), c01), 16);
  r += rowBytes;
  v128.store(r, v128.sub<T>(v128.load(r), c10));
  v128.store(r, v128.sub<T>(v128.load(r, 16), c11), 16);
  r += rowBytes;
  v128.store(r, v128.sub<T>(v128.load(r), c20));
  v128.store(r, v128.sub<T>(v128.load(r, 16), c21), 16);
  r += rowBytes;
  v128.store(r, v128.sub<T>(v128.load(r), c30));
  v128.store(r, v128.sub<T>(v128.load(r, 16), c31), 16);
}

/** 1 row × 2 vectors (the rows left over below the last group of 4). */
@inline function micro1<T>(c: usize, a: usize, bp: usize, kc: i32): void {
  const S = <usize>sizeof<T>();
  let c0 = v128.splat<T>(<T>0), c1 = c0;
  let a0 = a;
  let p = bp;
  for (let q = 0; q < kc; q++) {
    const x = v128.load_splat<T>(a0);
    c0 = v128.add<T>(c0, v128.mul<T>(x, v128.load(p)));
    c1 = v128.add<T>(c1, v128.mul<T>(x, v128.load(p, 16)));
    a0 += S;
    p += 32;
  }
  v128.store(c, v128.sub<T>(v128.load(c), c0));
  v128.store(c, v128.sub<T>(v128.load(c, 16), c1), 16);
}

/** row y -= m · row x over w elements. */
@inline function axpyRow<T>(y: usize, x: usize, m: T, w: i32): void {
  const S = <usize>sizeof<T>();
  const L = lanes<T>();
  const mv = v128.splat<T>(m);
  let j = 0;
  for (; j + L <= w; j += L) {
    const o = <usize>j * S;
    v128.store(y + o, v128.sub<T>(v128.load(y + o), v128.mul<T>(mv, v128.load(x + o))));
  }
  for (; j < w; j++) {
    const o = <usize>j * S;
    store<T>(y + o, load<T>(y + o) - m * load<T>(x + o));
  }
}

/** B (h×w) := L⁻¹·B with L (h×h) unit lower triangular; both in the matrix of leading dimension ld. */
function trsm<T>(l: usize, b: usize, h: i32, w: i32, ld: i32, pack: usize): void {
  if (h <= TRSM_LEAF) {
    const rowBytes = <usize>ld * sizeof<T>();
    for (let r = 1; r < h; r++) {
      const br = b + <usize>r * rowBytes;
      const lr = l + <usize>r * rowBytes;
      for (let q = 0; q < r; q++) {
        const m = load<T>(lr + <usize>q * sizeof<T>());
        if (m != 0) axpyRow<T>(br, b + <usize>q * rowBytes, m, w);
      }
    }
    return;
  }
  const h1 = h >> 1;
  trsm<T>(l, b, h1, w, ld, pack);
  gemm<T>(addr<T>(b, ld, h1, 0), addr<T>(l, ld, h1, 0), b, h - h1, w, h1, ld, pack);
  trsm<T>(addr<T>(l, ld, h1, h1), addr<T>(b, ld, h1, 0), h - h1, w, ld, pack);
}

/** Swap rows r1 and r2 (n elements each). */
function swapRows<T>(a: usize, n: i32, r1: i32, r2: i32): void {
  const p = addr<T>(a, n, r1, 0);
  const q = addr<T>(a, n, r2, 0);
  const bytes = <usize>n * sizeof<T>();
  let o: usize = 0;
  for (; o + 16 <= bytes; o += 16) {
    const t = v128.load(p + o);
    v128.store(p + o, v128.load(q + o));
    v128.store(q + o, t);
  }
  for (; o < bytes; o += sizeof<T>()) {
    const t = load<T>(p + o);
    store<T>(p + o, load<T>(q + o));
    store<T>(q + o, t);
  }
}

/** Factorise columns k0…k0+kb−1 over rows k0…n−1 (already up to date). Returns 0, or c+1 for a zero pivot in column c. */
function factorColumns<T>(a: usize, n: i32, k0: i32, kb: i32, piv: usize, pack: usize): i32 {
  const S = <usize>sizeof<T>();
  const rowBytes = <usize>n * S;
  if (kb <= LEAF) {
    const kend = k0 + kb;
    for (let c = k0; c < kend; c++) {
      let p = c;
      let big: T = abs<T>(load<T>(addr<T>(a, n, c, c)));
      let at = addr<T>(a, n, c + 1, c);
      for (let i = c + 1; i < n; i++) {
        const v = abs<T>(load<T>(at));
        if (v > big) {
          big = v;
          p = i;
        }
        at += rowBytes;
      }
      if (!(big > 0)) return c + 1;
      store<i32>(piv + (<usize>c << 2), p);
      if (p != c) swapRows<T>(a, n, c, p);
      const rc = addr<T>(a, n, c, 0);
      const inv: T = <T>1 / load<T>(rc + <usize>c * S);
      const w = kend - c - 1;
      let ri = rc + rowBytes;
      for (let i = c + 1; i < n; i++) {
        const lp = ri + <usize>c * S;
        const m: T = load<T>(lp) * inv;
        store<T>(lp, m);
        if (m != 0) {
          for (let j = 1; j <= w; j++) {
            const o = <usize>(c + j) * S;
            store<T>(ri + o, load<T>(ri + o) - m * load<T>(rc + o));
          }
        }
        ri += rowBytes;
      }
    }
    return 0;
  }
  // Split near the middle, on a multiple of 8 columns so the products see whole vector blocks.
  let h = ((kb >> 1) + 7) & ~7;
  if (h >= kb) h = kb >> 1;
  const r = factorColumns<T>(a, n, k0, h, piv, pack);
  if (r != 0) return r;
  const k1 = k0 + h;
  const w = kb - h;
  trsm<T>(addr<T>(a, n, k0, k0), addr<T>(a, n, k0, k1), h, w, n, pack);
  gemm<T>(addr<T>(a, n, k1, k1), addr<T>(a, n, k1, k0), addr<T>(a, n, k0, k1), n - k1, w, h, n, pack);
  return factorColumns<T>(a, n, k1, w, piv, pack);
}

/** Solve with the factors in place of x (length n): row swaps, unit-lower forward, upper backward. */
function luSolve<T>(lu: usize, n: i32, piv: usize, x: usize): void {
  const S = <usize>sizeof<T>();
  const L = lanes<T>();
  for (let k = 0; k < n; k++) {
    const p = load<i32>(piv + (<usize>k << 2));
    if (p != k) {
      const xk = x + <usize>k * S;
      const xp = x + <usize>p * S;
      const t = load<T>(xk);
      store<T>(xk, load<T>(xp));
      store<T>(xp, t);
    }
  }
  for (let i = 1; i < n; i++) {
    const ri = addr<T>(lu, n, i, 0);
    let acc = v128.splat<T>(<T>0);
    let j = 0;
    for (; j + L <= i; j += L) acc = v128.add<T>(acc, v128.mul<T>(v128.load(ri + <usize>j * S), v128.load(x + <usize>j * S)));
    let s: T = hsum<T>(acc);
    for (; j < i; j++) s += load<T>(ri + <usize>j * S) * load<T>(x + <usize>j * S);
    const xi = x + <usize>i * S;
    store<T>(xi, load<T>(xi) - s);
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = addr<T>(lu, n, i, 0);
    let j = i + 1;
    let s: T = <T>0;
    // Scalar up to an aligned start, then vectors.
    for (; j < n && (j & (L - 1)) != 0; j++) s += load<T>(ri + <usize>j * S) * load<T>(x + <usize>j * S);
    let acc = v128.splat<T>(<T>0);
    for (; j + L <= n; j += L) acc = v128.add<T>(acc, v128.mul<T>(v128.load(ri + <usize>j * S), v128.load(x + <usize>j * S)));
    s += hsum<T>(acc);
    for (; j < n; j++) s += load<T>(ri + <usize>j * S) * load<T>(x + <usize>j * S);
    const xi = x + <usize>i * S;
    store<T>(xi, (load<T>(xi) - s) / load<T>(ri + <usize>i * S));
  }
}

@inline function hsum<T>(v: v128): T {
  if (sizeof<T>() == 8) return <T>(f64x2.extract_lane(v, 0) + f64x2.extract_lane(v, 1));
  return <T>(f32x4.extract_lane(v, 0) + f32x4.extract_lane(v, 1) + f32x4.extract_lane(v, 2) + f32x4.extract_lane(v, 3));
}

// ---- exports -----------------------------------------------------------------------------------

/** LU of the f64 matrix at `a` in place; pivots (i32) at `piv`; `pack` ≥ KC·NC·8 bytes. 0, or c+1 for a zero pivot. */
export function factor64(a: usize, n: i32, piv: usize, pack: usize): i32 {
  return factorColumns<f64>(a, n, 0, n, piv, pack);
}

/** The same in f32. */
export function factor32(a: usize, n: i32, piv: usize, pack: usize): i32 {
  return factorColumns<f32>(a, n, 0, n, piv, pack);
}

export function solve64(lu: usize, n: i32, piv: usize, x: usize): void {
  luSolve<f64>(lu, n, piv, x);
}

export function solve32(lu: usize, n: i32, piv: usize, x: usize): void {
  luSolve<f32>(lu, n, piv, x);
}

/** r = b − A·x in f64 (A n×n row-major). */
export function residual64(a: usize, n: i32, x: usize, b: usize, r: usize): void {
  for (let i = 0; i < n; i++) {
    const ri = addr<f64>(a, n, i, 0);
    let acc0 = f64x2.splat(0);
    let acc1 = acc0;
    let j = 0;
    for (; j + 4 <= n; j += 4) {
      const o = <usize>j << 3;
      acc0 = f64x2.add(acc0, f64x2.mul(v128.load(ri + o), v128.load(x + o)));
      acc1 = f64x2.add(acc1, f64x2.mul(v128.load(ri + o, 16), v128.load(x + o, 16)));
    }
    let s = hsum<f64>(f64x2.add(acc0, acc1));
    for (; j < n; j++) s += load<f64>(ri + (<usize>j << 3)) * load<f64>(x + (<usize>j << 3));
    store<f64>(r + (<usize>i << 3), load<f64>(b + (<usize>i << 3)) - s);
  }
}

/** dst (f32) = src (f64), count elements. */
export function demote(src: usize, dst: usize, count: i32): void {
  let i = 0;
  for (; i + 4 <= count; i += 4) {
    const lo = f32x4.demote_f64x2_zero(v128.load(src + (<usize>i << 3)));
    const hi = f32x4.demote_f64x2_zero(v128.load(src + (<usize>i << 3), 16));
    v128.store(dst + (<usize>i << 2), v128.shuffle<i32>(lo, hi, 0, 1, 4, 5));
  }
  for (; i < count; i++) store<f32>(dst + (<usize>i << 2), <f32>load<f64>(src + (<usize>i << 3)));
}

/**
 * a32 (f32) = a64 (f64) for an n×n matrix, in one pass that also returns ‖A‖∞ = max over rows of
 * Σ|aᵢⱼ| in f64 (NaN or ∞ when A holds one).
 */
export function demoteMatrix(a64: usize, a32: usize, n: i32): f64 {
  let best: f64 = 0;
  for (let i = 0; i < n; i++) {
    const src = addr<f64>(a64, n, i, 0);
    const dst = addr<f32>(a32, n, i, 0);
    let acc = f64x2.splat(0);
    let j = 0;
    for (; j + 4 <= n; j += 4) {
      const lo = v128.load(src + (<usize>j << 3));
      const hi = v128.load(src + (<usize>j << 3), 16);
      acc = f64x2.add(acc, f64x2.add(f64x2.abs(lo), f64x2.abs(hi)));
      v128.store(dst + (<usize>j << 2), v128.shuffle<i32>(f32x4.demote_f64x2_zero(lo), f32x4.demote_f64x2_zero(hi), 0, 1, 4, 5));
    }
    let s = hsum<f64>(acc);
    for (; j < n; j++) {
      const v = load<f64>(src + (<usize>j << 3));
      s += abs<f64>(v);
      store<f32>(dst + (<usize>j << 2), <f32>v);
    }
    if (s > best || s != s) best = s; // a NaN, once met, stays
  }
  return best;
}

/** Bytes of the work area `pack` the factorisations need. */
export function packBytes(): i32 {
  return KC * NC * 8;
}
