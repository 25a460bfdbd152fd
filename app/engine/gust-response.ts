import { EngineError } from "./errors";
import { gustAlleviationFactor, gustMassRatio, UNITS } from "./certification";

// Response of a rigid aircraft, free only to move vertically (plunge), to a discrete
// one-minus-cosine gust, with the unsteady build-up of lift: Küssner's function for the gust's
// penetration of the wing and Wagner's for the aircraft's own vertical motion. This is the model
// behind the Pratt–Walker gust factor (NACA TN 2964; NACA Report 1206). Left out: flexibility of
// the structure, pitching motion and the tail's own lift lag (tail lift is neither built up nor
// delayed separately), compressibility and finite span in the indicial functions (two-dimensional,
// incompressible shapes scaled by the wing's own lift slope), and spanwise variation of the gust.
// The authority's accepted method governs; this supports it.

const RHO0 = 1.225;
const G0 = 9.80665;

/** An indicial lift function as 1 − Σ aᵢ·exp(−bᵢ·s), s in semichords travelled. */
export interface IndicialFunction {
  name: string;
  source: string;
  terms: readonly { a: number; b: number }[];
}

/**
 * Küssner's function (lift build-up as a wing enters a sharp-edged gust), two-dimensional
 * incompressible: ψ(s) ≈ 1 − 0.236e^(−0.058s) − 0.513e^(−0.364s) − 0.171e^(−2.42s).
 */
export const KUSSNER_JONES: IndicialFunction = {
  name: "Küssner",
  source: "R. T. Jones's exponential approximation (NACA Report 681, 1940) [constants from memory]",
  terms: [
    { a: 0.236, b: 0.058 },
    { a: 0.513, b: 0.364 },
    { a: 0.171, b: 2.42 },
  ],
};

/**
 * Wagner's function (lift build-up after a step change of angle of attack), two-dimensional
 * incompressible: φ(s) ≈ 1 − 0.165e^(−0.0455s) − 0.335e^(−0.3s).
 */
export const WAGNER_JONES: IndicialFunction = {
  name: "Wagner",
  source: "R. T. Jones's exponential approximation (NACA Report 681, 1940) [constants from memory]",
  terms: [
    { a: 0.165, b: 0.0455 },
    { a: 0.335, b: 0.3 },
  ],
};

/** Quasi-steady lift (no build-up): the sharp-edged-gust assumption, for comparison. */
export const QUASI_STEADY: IndicialFunction = { name: "quasi-steady", source: "no lift lag", terms: [] };

/** Value of an indicial function at s semichords. */
export function indicial(f: IndicialFunction, s: number): number {
  return 1 - f.terms.reduce((acc, t) => acc + t.a * Math.exp(-t.b * s), 0);
}

/** Options of the plunge response. */
export interface PlungeGustInput {
  /** Mass ratio μ_g = 2(W/S)/(ρ·c̄·a·g) (ρ the actual density, c̄ the mean geometric chord). */
  massRatio: number;
  /** Gust gradient H (distance from the gust's start to its peak) in semichords of c̄: H_s = 2H/c̄. */
  gradientSemichords: number;
  kussner?: IndicialFunction;
  wagner?: IndicialFunction;
  /** Integration step, semichords (default the smaller of 0.05 and H_s/200). */
  step?: number;
  /** Keep the history for a figure (about 200 samples). */
  history?: boolean;
}

/** One sample of the history: s semichords, gust velocity / its peak, and K = Δn/Δn_sharp. */
export interface PlungeSample {
  s: number;
  gust: number;
  k: number;
}

export interface PlungeGustResponse {
  /** Peak of K = Δn/Δn_sharp for a positive gust (a negative gust gives its mirror). */
  peak: number;
  /** Where the peak occurs, semichords from the gust's start. */
  sAtPeak: number;
  history: PlungeSample[];
}

/**
 * Peak incremental load factor of a rigid aircraft in plunge through a one-minus-cosine gust
 * U(s) = (U/2)[1 − cos(π s/H_s)] for 0 ≤ s ≤ 2H_s, as a fraction of the quasi-steady sharp-edged value
 * Δn_sharp = ρ0·V_e·a·U_e/(2W/S). With s = 2Vt/c̄ the equation of motion m·z̈ = L becomes
 * K(s) = ∫₀ˢ ψ(s−σ)·g′(σ) dσ − ∫₀ˢ φ(s−σ)·v′(σ) dσ, v′ = K/(2μ_g), with g the gust shape (peak 1) and v
 * the aircraft's upward velocity over U. The exponential indicial functions turn both convolutions
 * into first-order lags, integrated by the classical fourth-order Runge–Kutta method.
 */
export function plungeGustResponse(p: PlungeGustInput): PlungeGustResponse {
  if (!(Number.isFinite(p.massRatio) && p.massRatio > 0)) throw new EngineError("invalid-argument", "must be greater than 0", "massRatio");
  const H = p.gradientSemichords;
  if (!(Number.isFinite(H) && H > 0)) throw new EngineError("invalid-argument", "must be greater than 0", "gradientSemichords");
  const psi = (p.kussner ?? KUSSNER_JONES).terms;
  const phi = (p.wagner ?? WAGNER_JONES).terms;
  const h = p.step ?? Math.min(0.05, H / 200);
  const inv2mu = 1 / (2 * p.massRatio);
  const gust = (s: number) => (s <= 0 || s >= 2 * H ? 0 : 0.5 * (1 - Math.cos((Math.PI * s) / H)));
  const gustRate = (s: number) => (s <= 0 || s >= 2 * H ? 0 : ((0.5 * Math.PI) / H) * Math.sin((Math.PI * s) / H));
  const nx = psi.length;
  const ny = phi.length;
  // State: [X_1..X_nx (Küssner lags), v, Y_1..Y_ny (Wagner lags)], all zero before the gust.
  const dim = nx + 1 + ny;
  const kOf = (s: number, u: Float64Array) => {
    let k = gust(s) - u[nx];
    for (let i = 0; i < nx; i++) k -= psi[i].a * u[i];
    for (let j = 0; j < ny; j++) k += phi[j].a * u[nx + 1 + j];
    return k;
  };
  const deriv = (s: number, u: Float64Array, out: Float64Array) => {
    const k = kOf(s, u);
    const gp = gustRate(s);
    for (let i = 0; i < nx; i++) out[i] = -psi[i].b * u[i] + gp;
    const vp = k * inv2mu;
    out[nx] = vp;
    for (let j = 0; j < ny; j++) out[nx + 1 + j] = -phi[j].b * u[nx + 1 + j] + vp;
  };
  let u = new Float64Array(dim);
  const k1 = new Float64Array(dim);
  const k2 = new Float64Array(dim);
  const k3 = new Float64Array(dim);
  const k4 = new Float64Array(dim);
  const tmp = new Float64Array(dim);
  // After the gust the response decays; 20 semichords more is well past any later extreme.
  const end = 2 * H + 20;
  const steps = Math.ceil(end / h);
  const every = Math.max(1, Math.floor(steps / 200));
  const history: PlungeSample[] = [];
  let peak = -Infinity;
  let sAtPeak = 0;
  for (let n = 0; n <= steps; n++) {
    const s = n * h;
    const k = kOf(s, u);
    if (k > peak) {
      peak = k;
      sAtPeak = s;
    }
    if (p.history && n % every === 0) history.push({ s, gust: gust(s), k });
    if (n === steps) break;
    deriv(s, u, k1);
    for (let i = 0; i < dim; i++) tmp[i] = u[i] + (h / 2) * k1[i];
    deriv(s + h / 2, tmp, k2);
    for (let i = 0; i < dim; i++) tmp[i] = u[i] + (h / 2) * k2[i];
    deriv(s + h / 2, tmp, k3);
    for (let i = 0; i < dim; i++) tmp[i] = u[i] + h * k3[i];
    deriv(s + h, tmp, k4);
    const next = new Float64Array(dim);
    for (let i = 0; i < dim; i++) next[i] = u[i] + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
    u = next;
  }
  return { peak, sAtPeak, history };
}

/** Quasi-steady sharp-edged gust increment Δn = ρ0·V_e·a·U_e/(2·W/S) (EAS, SI; W/S in N/m²). */
export function sharpEdgedIncrement(veas: number, liftSlope: number, ude: number, wingLoading: number): number {
  return (RHO0 * veas * liftSlope * ude) / (2 * wingLoading);
}

/** Gust gradients of 14 CFR 25.341(a)(3), m: 30 ft to 350 ft. */
export const PART25_GRADIENT_RANGE_M = { min: 30 * UNITS.ftToM, max: 350 * UNITS.ftToM } as const;

/** Input of the tuned discrete-gust search (SI, speeds m/s EAS). */
export interface TunedGustInput {
  veas: number;
  /** Actual air density at the altitude, kg/m³ (for the mass ratio). */
  density: number;
  /** W/S, N/m². */
  wingLoading: number;
  /** Mean geometric chord, m. */
  meanChord: number;
  /** Lift slope of the aeroplane at this speed's Mach number, per rad. */
  liftSlope: number;
  /** Reference gust velocity U_ref at this altitude and speed (halved at V_D), m/s EAS. */
  uRef: number;
  /** Flight-profile alleviation factor F_g. */
  fg: number;
  /** Gradients to examine, m (default: 30 to 350 ft every 10 ft, refined about the critical one). */
  gradients?: number[];
}

/** One gust gradient of the search. */
export interface TunedGustRow {
  /** Gust gradient H, m. */
  gradient: number;
  /** H in mean geometric chords. */
  gradientChords: number;
  /** Design gust velocity U_ds = U_ref·F_g·(H/350 ft)^(1/6), m/s EAS. */
  uds: number;
  /** Dynamic factor K = Δn/Δn_sharp from the plunge response. */
  k: number;
  /** Peak incremental load factor from the plunge response. */
  deltaN: number;
  /** Pratt's K_g = 0.88μ/(5.3 + μ) applied to the same U_ds, for comparison. */
  prattDeltaN: number;
}

export interface TunedGustResult {
  massRatio: number;
  prattKg: number;
  rows: TunedGustRow[];
  /** The gradient giving the largest Δn. */
  critical: TunedGustRow;
  rule: string;
  method: string;
}

/**
 * The discrete tuned gust of 14 CFR 25.341(a): the one-minus-cosine gust over the range of gradients
 * H = 30–350 ft with U_ds = U_ref·F_g·(H/350)^(1/6), each on the rigid aircraft in plunge with
 * unsteady lift; the critical gradient is the one giving the largest incremental load factor. Pratt's
 * formula with the same U_ds is given beside each gradient.
 */
export function tunedDiscreteGust(p: TunedGustInput): TunedGustResult {
  for (const k of ["veas", "density", "wingLoading", "meanChord", "liftSlope", "uRef", "fg"] as const) {
    if (!(Number.isFinite(p[k]) && p[k] > 0)) throw new EngineError("invalid-argument", "must be greater than 0", k);
  }
  const mu = gustMassRatio(p.wingLoading, p.density, p.meanChord, p.liftSlope, G0);
  const kg = gustAlleviationFactor(mu);
  const { min, max } = PART25_GRADIENT_RANGE_M;
  const row = (H: number): TunedGustRow => {
    const uds = p.uRef * p.fg * Math.pow(H / max, 1 / 6);
    const k = plungeGustResponse({ massRatio: mu, gradientSemichords: (2 * H) / p.meanChord }).peak;
    const dn = sharpEdgedIncrement(p.veas, p.liftSlope, uds, p.wingLoading);
    return { gradient: H, gradientChords: H / p.meanChord, uds, k, deltaN: k * dn, prattDeltaN: kg * dn };
  };
  let rows: TunedGustRow[];
  if (p.gradients) {
    rows = p.gradients.map((H, i) => {
      if (!(H >= min - 1e-9 && H <= max + 1e-9)) throw new EngineError("invalid-argument", "must lie between 30 and 350 ft (14 CFR 25.341(a)(3))", `gradients[${i}]`);
      return row(H);
    });
  } else {
    rows = [];
    for (let ft = 30; ft <= 350; ft += 10) rows.push(row(ft * UNITS.ftToM));
    // Refine about the best of the grid by golden-section search (Δn is smooth and single-peaked in H).
    const i = rows.reduce((b, r, j) => (r.deltaN > rows[b].deltaN ? j : b), 0);
    let a = rows[Math.max(0, i - 1)].gradient;
    let b = rows[Math.min(rows.length - 1, i + 1)].gradient;
    const r = (Math.sqrt(5) - 1) / 2;
    let c = b - r * (b - a);
    let d = a + r * (b - a);
    let fc = row(c);
    let fd = row(d);
    for (let it = 0; it < 20 && b - a > 0.01; it++) {
      if (fc.deltaN >= fd.deltaN) {
        b = d;
        d = c;
        fd = fc;
        c = b - r * (b - a);
        fc = row(c);
      } else {
        a = c;
        c = d;
        fc = fd;
        d = a + r * (b - a);
        fd = row(d);
      }
    }
    const best = fc.deltaN >= fd.deltaN ? fc : fd;
    if (best.deltaN > rows[i].deltaN) rows.push(best);
    rows.sort((x, y) => x.gradient - y.gradient);
  }
  const critical = rows.reduce((b, r) => (r.deltaN > b.deltaN ? r : b), rows[0]);
  return {
    massRatio: mu,
    prattKg: kg,
    rows,
    critical,
    rule: "14 CFR 25.341(a)",
    method: `rigid aircraft in plunge, one-minus-cosine gust, ${KUSSNER_JONES.name} and ${WAGNER_JONES.name} functions (${KUSSNER_JONES.source})`,
  };
}
