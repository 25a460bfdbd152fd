import { EngineError } from "./errors";

// Pure helpers for generating load cases from the airworthiness rules. They support, and never
// replace, what the certifying authority accepts. Rule strings name the paragraph each value comes from.

/** Unit constants (exact by definition unless noted). */
export const UNITS = {
  lbfToN: 4.4482216152605,
  ftToM: 0.3048,
  ktToMs: 1852 / 3600,
  /** Sea-level ISA density, slug/ft³. */
  rho0SlugFt3: 0.0023769,
  /** Standard gravity g0 = 9.80665 m/s² in ft/s², used in the gust mass ratio (the rule's "32.17" rounded). */
  gFtS2: 9.80665 / 0.3048,
} as const;

const RHO0 = 1.225;
const G0 = 9.80665;

/** A value with the rule it comes from. */
export interface RuleValue {
  value: number;
  rule: string;
}

/** Categories of the pre-2017 Part 23 (before Amendment 23-64). */
export type Part23Category = "normal" | "utility" | "acrobatic" | "commuter";

function positive(x: number, field: string): void {
  if (!(Number.isFinite(x) && x > 0)) throw new EngineError("invalid-argument", "must be a positive number", field);
}

/**
 * Manoeuvring limit load factors of 14 CFR 25.337: positive n ≥ 2.1 + 24 000/(W + 10 000), not below 2.5 and
 * need not exceed 3.8 (W design maximum take-off weight, lb); negative −1.0 up to V_C, linear to 0 at V_D.
 */
export function manoeuvreLoadFactorsPart25(mtowLb: number): { positive: RuleValue; negativeAtVc: RuleValue; negativeAtVd: RuleValue } {
  positive(mtowLb, "mtowLb");
  const n = Math.min(3.8, Math.max(2.5, 2.1 + 24000 / (mtowLb + 10000)));
  return {
    positive: { value: n, rule: "14 CFR 25.337(b)" },
    negativeAtVc: { value: -1.0, rule: "14 CFR 25.337(c)" },
    negativeAtVd: { value: 0, rule: "14 CFR 25.337(c)" },
  };
}

/**
 * Manoeuvring limit load factors of 14 CFR 23.337 (before Amendment 23-64): positive n ≥ 2.1 + 24 000/(W + 10 000)
 * for normal and commuter (need not exceed 3.8), 4.4 utility, 6.0 acrobatic; negative ≥ 0.4 × positive (0.5 ×
 * for acrobatic) at V_C, then per 23.333(b) linear to 0 at V_D (normal, commuter) or to −1.0 (utility, acrobatic).
 */
export function manoeuvreLoadFactorsPart23(
  mtowLb: number,
  category: Part23Category,
): { positive: RuleValue; negativeAtVc: RuleValue; negativeAtVd: RuleValue } {
  positive(mtowLb, "mtowLb");
  const formula = Math.min(3.8, 2.1 + 24000 / (mtowLb + 10000));
  const n = category === "utility" ? 4.4 : category === "acrobatic" ? 6.0 : formula;
  const neg = (category === "acrobatic" ? -0.5 : -0.4) * n;
  const atVd = category === "utility" || category === "acrobatic" ? -1.0 : 0;
  return {
    positive: { value: n, rule: "14 CFR 23.337(a)" },
    negativeAtVc: { value: neg, rule: "14 CFR 23.337(b)" },
    negativeAtVd: { value: atVd, rule: "14 CFR 23.333(b)" },
  };
}

/** 1-g stall speed V_S = √(2W/(ρ0·S·CLmax)), m/s EAS (W in N, S in m²). */
export function stallSpeed(weightN: number, areaM2: number, clMax: number): number {
  positive(weightN, "weightN");
  positive(areaM2, "areaM2");
  if (!(clMax !== 0 && Number.isFinite(clMax))) throw new EngineError("invalid-argument", "must be a non-zero number", "clMax");
  return Math.sqrt((2 * weightN) / (RHO0 * areaM2 * Math.abs(clMax)));
}

/** Stall (C_N max) line of the V–n diagram: n = ½ρ0·Ve²·S·CLmax/W (Ve m/s EAS; negative CLmax gives the negative line). */
export function stallLoadFactor(veas: number, areaM2: number, clMax: number, weightN: number): number {
  positive(weightN, "weightN");
  return (0.5 * RHO0 * veas * veas * areaM2 * clMax) / weightN;
}

/** Gust mass ratio μ_g = 2(W/S)/(ρ·c̄·a·g) (dimensionless; consistent units; ρ the actual density). */
export function gustMassRatio(wingLoading: number, density: number, meanChord: number, liftSlope: number, g: number): number {
  return (2 * wingLoading) / (density * meanChord * liftSlope * g);
}

/** Gust alleviation factor K_g = 0.88μ/(5.3 + μ) (Pratt, NACA TN 2964; 14 CFR 23.341(c)). */
export function gustAlleviationFactor(mu: number): number {
  return (0.88 * mu) / (5.3 + mu);
}

/** Result of the Pratt gust formula. */
export interface GustLoadFactor {
  mu: number;
  kg: number;
  deltaN: number;
  positive: number;
  negative: number;
  rule: string;
}

/**
 * Pratt gust load factor, SI form: Δn = ρ0·Ve·a·K_g·U_de/(2·W/S), with W/S in N/m², c̄ in m, ρ in kg/m³,
 * Ve and U_de in m/s EAS, a per rad. Algebraically the US form of 23.341(c) with the exact constant.
 */
export function gustLoadFactorSI(p: {
  wingLoading: number;
  density: number;
  meanChord: number;
  liftSlope: number;
  veas: number;
  ude: number;
}): GustLoadFactor {
  positive(p.wingLoading, "wingLoading");
  positive(p.density, "density");
  const mu = gustMassRatio(p.wingLoading, p.density, p.meanChord, p.liftSlope, G0);
  const kg = gustAlleviationFactor(mu);
  const deltaN = (RHO0 * p.veas * p.liftSlope * kg * p.ude) / (2 * p.wingLoading);
  return { mu, kg, deltaN, positive: 1 + deltaN, negative: 1 - deltaN, rule: "14 CFR 23.341(c) (SI form), Pratt NACA TN 2964" };
}

/**
 * Pratt gust load factor, US form of 14 CFR 23.341(c): n = 1 ± K_g·U_de·V·a/(498·w), with U_de ft/s EAS,
 * V kt EAS, w psf, ρ slug/ft³, c̄ ft and standard g = 32.174 ft/s².
 */
export function gustLoadFactorUS(p: {
  wingLoadingPsf: number;
  densitySlugFt3: number;
  meanChordFt: number;
  liftSlope: number;
  veasKt: number;
  udeFtS: number;
}): GustLoadFactor {
  positive(p.wingLoadingPsf, "wingLoadingPsf");
  positive(p.densitySlugFt3, "densitySlugFt3");
  const mu = gustMassRatio(p.wingLoadingPsf, p.densitySlugFt3, p.meanChordFt, p.liftSlope, UNITS.gFtS2);
  const kg = gustAlleviationFactor(mu);
  const deltaN = (kg * p.udeFtS * p.veasKt * p.liftSlope) / (498 * p.wingLoadingPsf);
  return { mu, kg, deltaN, positive: 1 + deltaN, negative: 1 - deltaN, rule: "14 CFR 23.341(c)" };
}

function lerp(x: number, x0: number, y0: number, x1: number, y1: number): number {
  return y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
}

/**
 * Design gust velocities of 14 CFR 23.333(c), ft/s EAS, at an altitude (ft): ±50 at V_C and ±25 at V_D up to
 * 20 000 ft, linear to 25 and 12.5 at 50 000 ft; commuter also ±66 at V_B, linear to 38 at 50 000 ft.
 * Above 50 000 ft the 50 000 ft values are held (outside the rule's table).
 */
export function designGustsPart23(altitudeFt: number, category: Part23Category): { vc: RuleValue; vd: RuleValue; vb?: RuleValue } {
  if (!(altitudeFt >= 0)) throw new EngineError("invalid-argument", "must be 0 or more", "altitudeFt");
  const h = Math.min(altitudeFt, 50000);
  const f = (u0: number, u1: number) => (h <= 20000 ? u0 : lerp(h, 20000, u0, 50000, u1));
  const out: { vc: RuleValue; vd: RuleValue; vb?: RuleValue } = {
    vc: { value: f(50, 25), rule: "14 CFR 23.333(c)(1)(i)" },
    vd: { value: f(25, 12.5), rule: "14 CFR 23.333(c)(1)(ii)" },
  };
  if (category === "commuter") out.vb = { value: f(66, 38), rule: "14 CFR 23.333(c)(1)(iii)" };
  return out;
}

/**
 * Reference gust velocity U_ref of 14 CFR 25.341(a)(5)(i), ft/s EAS: 56 at sea level, linear to 44 at 15 000 ft,
 * then linear to 20.86 at 60 000 ft; at V_D one half of it (25.341(a)(5)(ii)).
 */
export function referenceGustPart25(altitudeFt: number): { vb: RuleValue; vc: RuleValue; vd: RuleValue } {
  if (!(altitudeFt >= 0 && altitudeFt <= 60000)) throw new EngineError("invalid-argument", "must be between 0 and 60 000 ft", "altitudeFt");
  const u = altitudeFt <= 15000 ? lerp(altitudeFt, 0, 56, 15000, 44) : lerp(altitudeFt, 15000, 44, 60000, 20.86);
  // (5)(i) applies at speeds between V_B and V_C, so V_B takes the full reference gust.
  return {
    vb: { value: u, rule: "14 CFR 25.341(a)(5)(i)" },
    vc: { value: u, rule: "14 CFR 25.341(a)(5)(i)" },
    vd: { value: u / 2, rule: "14 CFR 25.341(a)(5)(ii)" },
  };
}

/**
 * Minimum design speed for maximum gust intensity of 14 CFR 25.335(d): V_B ≥ V_S1·[1 + K_g·U_ref·V_C·a/(498·w)]^½,
 * here in its SI form V_S1·√(1 + Δn), Δn the Pratt increment at V_C with U_ref (SI, m/s EAS, W/S in N/m²);
 * V_B need not exceed V_C (25.335(d)(2)).
 */
export function minimumVbPart25(p: {
  vs1: number;
  vcEas: number;
  uRef: number;
  wingLoading: number;
  density: number;
  meanChord: number;
  liftSlope: number;
}): RuleValue {
  positive(p.vs1, "vs1");
  positive(p.vcEas, "vcEas");
  const g = gustLoadFactorSI({ wingLoading: p.wingLoading, density: p.density, meanChord: p.meanChord, liftSlope: p.liftSlope, veas: p.vcEas, ude: p.uRef });
  return { value: Math.min(p.vs1 * Math.sqrt(1 + g.deltaN), p.vcEas), rule: "14 CFR 25.335(d)" };
}

/**
 * Flight profile alleviation factor F_g of 14 CFR 25.341(a)(6): at sea level ½(F_gz + F_gm),
 * F_gz = 1 − Z_mo/250 000, F_gm = √(R2·tan(πR1/4)), R1 = MLW/MTOW, R2 = MZFW/MTOW; linear to 1.0 at Z_mo (ft).
 */
export function flightProfileAlleviation(p: { mtow: number; mlw: number; mzfw: number; zmoFt: number; altitudeFt: number }): RuleValue {
  positive(p.mtow, "mtow");
  positive(p.zmoFt, "zmoFt");
  const r1 = p.mlw / p.mtow;
  const r2 = p.mzfw / p.mtow;
  const fgz = 1 - p.zmoFt / 250000;
  const fgm = Math.sqrt(r2 * Math.tan((Math.PI * r1) / 4));
  const sl = 0.5 * (fgz + fgm);
  const h = Math.min(Math.max(p.altitudeFt, 0), p.zmoFt);
  return { value: lerp(h, 0, sl, p.zmoFt, 1), rule: "14 CFR 25.341(a)(6)" };
}

/** Design gust velocity U_ds = U_ref·F_g·(H/350)^(1/6), H the gust gradient 30–350 ft (14 CFR 25.341(a)(4)). */
export function designGustVelocityPart25(uRef: number, fg: number, gradientFt: number): RuleValue {
  if (!(gradientFt >= 30 && gradientFt <= 350)) throw new EngineError("invalid-argument", "must be between 30 and 350 ft", "gradientFt");
  return { value: uRef * fg * Math.pow(gradientFt / 350, 1 / 6), rule: "14 CFR 25.341(a)(4)" };
}

/**
 * Minimum design cruising and dive speeds of 14 CFR 23.335 (kt EAS, W/S in psf): V_C ≥ k_c·√(W/S),
 * k_c = 33 (36 acrobatic) up to 20 psf, linear to 28.6 at 100 psf; V_D ≥ k_d·V_C,min with k_d = 1.40 normal and
 * commuter, 1.50 utility, 1.55 acrobatic up to 20 psf, linear to 1.35 at 100 psf.
 */
export function minimumDesignSpeedsPart23(wingLoadingPsf: number, category: Part23Category): { vc: RuleValue; vd: RuleValue } {
  positive(wingLoadingPsf, "wingLoadingPsf");
  const w = Math.min(wingLoadingPsf, 100);
  const kc0 = category === "acrobatic" ? 36 : 33;
  const kd0 = category === "utility" ? 1.5 : category === "acrobatic" ? 1.55 : 1.4;
  const kc = w <= 20 ? kc0 : lerp(w, 20, kc0, 100, 28.6);
  const kd = w <= 20 ? kd0 : lerp(w, 20, kd0, 100, 1.35);
  const vc = kc * Math.sqrt(wingLoadingPsf);
  return { vc: { value: vc, rule: "14 CFR 23.335(a)" }, vd: { value: kd * vc, rule: "14 CFR 23.335(b)" } };
}

/**
 * Minimum design speed for maximum gust intensity of 14 CFR 23.335(d) (commuter category; text from memory [M]):
 * the lesser of the speed where the positive C_N max line meets the V_B gust line on the gust V–n diagram and
 * V_S1·√n_g, n_g the gust load factor at V_C (23.341); V_B need not exceed V_C. SI: speeds m/s EAS, W in N.
 */
export function minimumVbPart23(p: {
  vs1: number;
  vcEas: number;
  weightN: number;
  areaM2: number;
  clMax: number;
  gustAtVc: number;
  gustAtVb: number;
  density: number;
  meanChord: number;
  liftSlope: number;
}): RuleValue {
  positive(p.vs1, "vs1");
  positive(p.weightN, "weightN");
  const ws = p.weightN / p.areaM2;
  const g = (veas: number, ude: number) => gustLoadFactorSI({ wingLoading: ws, density: p.density, meanChord: p.meanChord, liftSlope: p.liftSlope, veas, ude });
  const ng = g(p.vcEas, p.gustAtVc).positive;
  // Stall line ½ρ0V²S·CLmax/W meets the gust line 1 + k·V: A·V² − k·V − 1 = 0.
  const A = (0.5 * RHO0 * p.areaM2 * p.clMax) / p.weightN;
  const k = g(1, p.gustAtVb).deltaN;
  const meet = (k + Math.sqrt(k * k + 4 * A)) / (2 * A);
  return { value: Math.min(meet, p.vs1 * Math.sqrt(ng), p.vcEas), rule: "14 CFR 23.335(d)" };
}

/** One corner point of the V–n diagram: EAS m/s, load factor, and the rule it comes from. */
export interface VnPoint {
  name: string;
  veas: number;
  nz: number;
  rule: string;
  /** A rolling or unsymmetrical condition: the other side's share of the airload and the aileron deflection, deg. */
  roll?: { fraction: number; aileron: number };
}

/** Input of the V–n diagram builder (SI; speeds m/s EAS; gusts m/s EAS). */
export interface VnInput {
  part: "23" | "25";
  /** Part 23 only. */
  category?: Part23Category;
  weightN: number;
  /** Design maximum take-off weight for the load-factor formula, N (default weightN). */
  mtowN?: number;
  areaM2: number;
  clMaxPositive: number;
  /** Negative C_N max (< 0). */
  clMaxNegative: number;
  vcEas: number;
  vdEas: number;
  /** Gust velocities at V_C and V_D, m/s EAS (from designGustsPart23 / referenceGustPart25, converted). */
  gustAtVc: number;
  gustAtVd: number;
  /** Actual air density at the altitude, kg/m³; mean geometric chord, m; airplane lift slope, per rad (at the V_C Mach number). */
  density: number;
  meanChord: number;
  liftSlope: number;
  /** Lift slope at the V_D Mach number, per rad (default liftSlope). */
  liftSlopeAtVd?: number;
  /** Design speed for maximum gust intensity, m/s EAS, its gust velocity, m/s EAS, and the lift slope at its Mach number: the V_B gust points (Part 25, Part 23 commuter). */
  vbEas?: number;
  gustAtVb?: number;
  liftSlopeAtVb?: number;
}

/**
 * V–n diagram corner points as data: S (1-g stall), A (positive stall line meets n_pos), D (V_D, n_pos),
 * E (V_D, negative factor at V_D), F (V_C, negative factor), H (negative stall line meets n_neg), and the gust
 * points at V_C and V_D (and V_B where given) by the Pratt formula (SI form), each with the lift slope at its
 * own speed's Mach number where given. For Part 25 the Pratt points are a preliminary
 * estimate only: 25.341(a) requires a dynamic discrete-gust analysis.
 */
export function vnDiagram(p: VnInput): VnPoint[] {
  positive(p.weightN, "weightN");
  positive(p.areaM2, "areaM2");
  if (!(p.clMaxNegative < 0)) throw new EngineError("invalid-argument", "must be below 0", "clMaxNegative");
  if (!(p.vdEas > p.vcEas && p.vcEas > 0)) throw new EngineError("invalid-argument", "must be greater than vcEas (> 0)", "vdEas");
  const mtowLb = (p.mtowN ?? p.weightN) / UNITS.lbfToN;
  const f = p.part === "25" ? manoeuvreLoadFactorsPart25(mtowLb) : manoeuvreLoadFactorsPart23(mtowLb, p.category ?? "normal");
  const npos = f.positive.value;
  const nneg = f.negativeAtVc.value;
  const vs1 = stallSpeed(p.weightN, p.areaM2, p.clMaxPositive);
  const vsNeg = stallSpeed(p.weightN, p.areaM2, p.clMaxNegative);
  const ref = p.part === "25" ? "14 CFR 25.333(b)" : "14 CFR 23.333(d)";
  const gust = (v: number, u: number, a: number) =>
    gustLoadFactorSI({ wingLoading: p.weightN / p.areaM2, density: p.density, meanChord: p.meanChord, liftSlope: a, veas: v, ude: u });
  const gc = gust(p.vcEas, p.gustAtVc, p.liftSlope);
  const gd = gust(p.vdEas, p.gustAtVd, p.liftSlopeAtVd ?? p.liftSlope);
  const gustRule = p.part === "25" ? "Pratt formula (NACA TN 2964) with the 14 CFR 25.341(a)(5) reference gust, preliminary" : "14 CFR 23.341(c)";
  const vb: VnPoint[] = [];
  if (p.vbEas !== undefined && p.gustAtVb !== undefined) {
    if (!(p.vbEas > 0 && p.vbEas <= p.vcEas)) throw new EngineError("invalid-argument", "must be above 0 and not above vcEas", "vbEas");
    const gb = gust(p.vbEas, p.gustAtVb, p.liftSlopeAtVb ?? p.liftSlope);
    const rule = p.part === "25" ? gustRule : "14 CFR 23.333(c)(1)(iii); 23.341(c)";
    vb.push({ name: "gust+VB", veas: p.vbEas, nz: gb.positive, rule }, { name: "gust-VB", veas: p.vbEas, nz: gb.negative, rule });
  }
  return [
    { name: "S", veas: vs1, nz: 1, rule: "1-g stall, n = ½ρ0V²S·CLmax/W" },
    { name: "A", veas: Math.min(vs1 * Math.sqrt(npos), p.vcEas), nz: npos, rule: `${f.positive.rule}; ${ref}` },
    { name: "D", veas: p.vdEas, nz: npos, rule: f.positive.rule },
    { name: "E", veas: p.vdEas, nz: f.negativeAtVd.value, rule: f.negativeAtVd.rule },
    { name: "F", veas: p.vcEas, nz: nneg, rule: f.negativeAtVc.rule },
    { name: "H", veas: Math.min(vsNeg * Math.sqrt(-nneg), p.vcEas), nz: nneg, rule: `${f.negativeAtVc.rule}; negative stall line` },
    { name: "gust+VC", veas: p.vcEas, nz: gc.positive, rule: gustRule },
    { name: "gust-VC", veas: p.vcEas, nz: gc.negative, rule: gustRule },
    { name: "gust+VD", veas: p.vdEas, nz: gd.positive, rule: gustRule },
    { name: "gust-VD", veas: p.vdEas, nz: gd.negative, rule: gustRule },
    ...vb,
  ];
}
