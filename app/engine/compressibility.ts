import { EngineError } from "./errors";

/** The subsonic compressibility rules the engine offers. */
export type CompressibilityRule = "prandtl-glauert" | "karman-tsien" | "laitone";

export const COMPRESSIBILITY_RULES: readonly CompressibilityRule[] = ["prandtl-glauert", "karman-tsien", "laitone"];

const GAMMA = 1.4;

/**
 * Prandtl–Glauert factor β = √(1 − M²).
 * @throws EngineError mach-out-of-range unless 0 ≤ M < 1.
 */
export function prandtlGlauertBeta(mach: number, field = "mach"): number {
  if (!Number.isFinite(mach) || mach < 0) throw new EngineError("mach-out-of-range", "must be 0 or more", field);
  if (mach >= 1) throw new EngineError("mach-out-of-range", "must be below 1 (subsonic rules only)", field);
  return Math.sqrt(1 - mach * mach);
}

/**
 * Denominator D of Cp = Cp0/D for a rule. D > 0 is where the rule is usable;
 * Laitone's D (and Kármán–Tsien's for very negative Cp0) falls through zero as M → 1.
 */
export function ruleDenominator(rule: CompressibilityRule, cp0: number, mach: number): number {
  const b = Math.sqrt(1 - mach * mach);
  const m2 = mach * mach;
  switch (rule) {
    case "prandtl-glauert":
      return b;
    case "karman-tsien":
      return b + (m2 / (1 + b)) * (cp0 / 2);
    case "laitone":
      return b + ((m2 * (1 + ((GAMMA - 1) / 2) * m2)) / (2 * b)) * cp0;
  }
}

/**
 * Compressible pressure coefficient from the incompressible one (γ = 1.4):
 * PG Cp0/β (Glauert 1928); KT Cp0/[β + M²/(1+β)·Cp0/2] (Tsien 1939, von Kármán 1941);
 * Laitone Cp0/[β + M²(1 + (γ−1)M²/2)/(2β)·Cp0] (Laitone 1951).
 * @throws EngineError no-solution where the rule's denominator is not positive (rule singular there).
 */
export function compressibleCp(rule: CompressibilityRule, cp0: number, mach: number): number {
  prandtlGlauertBeta(mach);
  const d = ruleDenominator(rule, cp0, mach);
  if (!(d > 0)) {
    throw new EngineError("no-solution", `the ${rule} rule is singular at Cp0 = ${cp0}, M = ${mach}`, "mach");
  }
  return cp0 / d;
}

/** Critical pressure coefficient Cp*(M) where the local Mach number reaches 1 (isentropic, γ = 1.4; NACA Report 1135). */
export function criticalCp(mach: number): number {
  if (!(mach > 0)) throw new EngineError("mach-out-of-range", "must be above 0 for Cp*", "mach");
  const m2 = mach * mach;
  return (2 / (GAMMA * m2)) * (Math.pow((2 + (GAMMA - 1) * m2) / (GAMMA + 1), GAMMA / (GAMMA - 1)) - 1);
}

/**
 * Critical Mach number of a section from its incompressible minimum Cp under a rule:
 * the FIRST Mach number at which the corrected Cp reaches Cp*. A scan in steps of 0.005 brackets
 * the first crossing (a point where the rule's denominator is no longer positive counts as past it,
 * since Cp → −∞ at the pole), then bisection refines it to ~1e-14. Below the pole the corrected Cp
 * falls and Cp* rises with M, so the difference is monotonic and the bracket cannot skip a root.
 * @throws EngineError invalid-section unless cp0Min < 0.
 */
export function criticalMach(rule: CompressibilityRule, cp0Min: number, field = "cpMin"): number {
  if (!(cp0Min < 0)) throw new EngineError("invalid-section", "must be below 0", field);
  const f = (m: number): number => {
    const d = ruleDenominator(rule, cp0Min, m);
    if (!(d > 0)) return -Infinity;
    return cp0Min / d - criticalCp(m);
  };
  const steps = 200;
  let lo = 1e-6;
  let hi = 1;
  for (let i = 1; i <= steps; i++) {
    const m = Math.min(i / steps, 1 - 1e-12);
    if (f(m) <= 0) {
      hi = m;
      lo = (i - 1) / steps || 1e-6;
      break;
    }
  }
  for (let k = 0; k < 100 && hi - lo > 1e-14; k++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Factor k by which a rule scales a section's incompressible lift slope and cmAc at a Mach number.
 * PG: 1/β. KT and Laitone: the rule's own ratio Cp/Cp0 evaluated at the section's working
 * (minimum) Cp, which keeps the distribution linear in α; without cpMin both rules tend to PG
 * as Cp0 → 0, so 1/β is used. Returns `singular: true` (and PG) where the rule's denominator
 * is not positive there (far above the critical Mach number).
 */
export function sectionScaleFactor(
  rule: CompressibilityRule,
  mach: number,
  cpRef: number | undefined,
): { factor: number; singular: boolean } {
  const b = prandtlGlauertBeta(mach);
  if (rule === "prandtl-glauert" || cpRef === undefined || mach === 0) return { factor: 1 / b, singular: false };
  const d = ruleDenominator(rule, cpRef, mach);
  if (!(d > 0)) return { factor: 1 / b, singular: true };
  return { factor: 1 / d, singular: false };
}

const MCR_TABLE_POINTS = 1200;
const MCR_U_MIN = Math.log(0.002);
const MCR_U_MAX = Math.log(30);
const mcrTables = new Map<CompressibilityRule, Float64Array>();

/**
 * The critical Mach number for many minimum-Cp values at once (one per case and station in large
 * sweeps): criticalMach tabulated once per rule at 1 200 points evenly spaced in ln(−Cp0) from
 * −0.002 to −30, linear between them. Mcr is smooth and monotonic in ln(−Cp0), so the table is within
 * 1e-6 of the root (checked in its tests); outside the range the root is found directly.
 */
export function criticalMachTabulated(rule: CompressibilityRule, cp0Min: number): number {
  if (!(cp0Min < 0)) throw new EngineError("invalid-section", "must be below 0", "cpMin");
  const u = Math.log(-cp0Min);
  if (u < MCR_U_MIN || u > MCR_U_MAX) return criticalMach(rule, cp0Min);
  let t = mcrTables.get(rule);
  if (!t) {
    t = new Float64Array(MCR_TABLE_POINTS + 1);
    for (let k = 0; k <= MCR_TABLE_POINTS; k++) t[k] = criticalMach(rule, -Math.exp(MCR_U_MIN + ((MCR_U_MAX - MCR_U_MIN) * k) / MCR_TABLE_POINTS));
    mcrTables.set(rule, t);
  }
  const f = ((u - MCR_U_MIN) / (MCR_U_MAX - MCR_U_MIN)) * MCR_TABLE_POINTS;
  const k = Math.min(MCR_TABLE_POINTS - 1, Math.floor(f));
  return t[k] + (f - k) * (t[k + 1] - t[k]);
}
