import type { CompressibilityRule } from "./compressibility";
import { ruleDenominator } from "./compressibility";
import { EngineError } from "./errors";

// Section data richer than one number per station (docs/decisions/009-richer-section-data.md):
// the incompressible chordwise pressure distribution at two or more angles (for applying the
// compressibility rule point by point), and the minimum pressure coefficient against lift (for the
// critical Mach number at each case's own lift). All incompressible, as measured or computed in 2-D.

/** The incompressible chordwise pressure distribution of a section at one angle of attack. */
export interface ChordwisePressure {
  /** Section angle of attack, deg. */
  alphaDeg: number;
  /** Chordwise positions x/c from the leading edge (0) to the trailing edge (1), increasing. */
  x: number[];
  /** Incompressible Cp on the upper and lower surface at each x. */
  cpUpper: number[];
  cpLower: number[];
}

/** One point of a section's minimum pressure coefficient against its (incompressible) lift coefficient. */
export interface CpMinPoint {
  cl: number;
  cpMin: number;
}

/**
 * Check the richer section data of a station; `field` is the station's path ("wing.stations[2]").
 * @throws EngineError invalid-section naming the field and rule.
 */
export function validateSectionData(
  s: { cpMin?: number; cpMinCl?: number; cpMinTable?: readonly CpMinPoint[]; pressures?: readonly ChordwisePressure[] },
  field: string,
): void {
  const bad = (f: string, m: string) => {
    throw new EngineError("invalid-section", m, `${field}.${f}`);
  };
  if (s.cpMinCl !== undefined) {
    if (!Number.isFinite(s.cpMinCl) || Math.abs(s.cpMinCl) > 5) bad("cpMinCl", "must be a lift coefficient between −5 and 5");
    if (s.cpMin === undefined) bad("cpMinCl", "states the lift of cpMin, so it needs cpMin");
  }
  if (s.cpMinTable !== undefined) {
    if (s.cpMinTable.length < 2) bad("cpMinTable", "needs at least 2 points (cl, cpMin)");
    s.cpMinTable.forEach((p, i) => {
      if (!Number.isFinite(p.cl)) bad(`cpMinTable[${i}].cl`, "must be a finite number");
      if (!(p.cpMin < 0 && p.cpMin >= -30)) bad(`cpMinTable[${i}].cpMin`, "must be below 0 and not below −30 (a suction peak)");
      if (i > 0 && !(p.cl > s.cpMinTable![i - 1].cl)) bad(`cpMinTable[${i}].cl`, "must be greater than the previous point's cl (increasing lift)");
    });
  }
  if (s.pressures !== undefined) {
    if (s.pressures.length < 2) bad("pressures", "needs the distribution at 2 or more angles of attack");
    s.pressures.forEach((p, i) => {
      const f = `pressures[${i}]`;
      if (!Number.isFinite(p.alphaDeg) || Math.abs(p.alphaDeg) > 30) bad(`${f}.alphaDeg`, "must be an angle within ±30°");
      if (i > 0 && !(p.alphaDeg > s.pressures![i - 1].alphaDeg)) bad(`${f}.alphaDeg`, "must be greater than the previous angle (increasing)");
      const n = p.x.length;
      if (n < 5) bad(`${f}.x`, "needs at least 5 chordwise points");
      if (p.cpUpper.length !== n) bad(`${f}.cpUpper`, `must have one value per x (${n})`);
      if (p.cpLower.length !== n) bad(`${f}.cpLower`, `must have one value per x (${n})`);
      p.x.forEach((x, k) => {
        if (!(x >= 0 && x <= 1)) bad(`${f}.x[${k}]`, "must be a chord fraction from 0 to 1");
        if (k > 0 && !(x > p.x[k - 1])) bad(`${f}.x[${k}]`, "must be greater than the previous x (leading edge to trailing edge)");
        if (!(Number.isFinite(p.cpUpper[k]) && p.cpUpper[k] <= 1 && p.cpUpper[k] >= -30)) bad(`${f}.cpUpper[${k}]`, "must be a pressure coefficient from −30 to 1 (1 is stagnation)");
        if (!(Number.isFinite(p.cpLower[k]) && p.cpLower[k] <= 1 && p.cpLower[k] >= -30)) bad(`${f}.cpLower[${k}]`, "must be a pressure coefficient from −30 to 1 (1 is stagnation)");
      });
      if (p.x[0] > 0.02 || p.x[n - 1] < 0.98) bad(`${f}.x`, "must cover the chord, from the leading edge (x ≤ 0.02) to the trailing edge (x ≥ 0.98)");
    });
  }
}

/**
 * Normal-force and quarter-chord moment coefficients of a chordwise distribution, with each point's Cp
 * corrected by the rule at the Mach number (Mach 0: as given): cl ≈ cn = ∫(Cp_l − Cp_u) d(x/c) and
 * cm_c/4 = ∫(Cp_u − Cp_l)(x/c − 1/4) d(x/c), nose up positive, by the trapezoid rule. Pressure only (no
 * friction); the small-angle cl ≈ cn, as thin-airfoil practice has it. `singular` where the rule's
 * denominator is not positive at some point (far above the critical Mach number).
 */
export function integratePressures(p: ChordwisePressure, rule: CompressibilityRule, mach: number): { cl: number; cm: number; singular: boolean } {
  let singular = false;
  const corr = (cp0: number) => {
    if (mach === 0) return cp0;
    const d = ruleDenominator(rule, cp0, mach);
    if (!(d > 0)) {
      singular = true;
      return cp0 / Math.sqrt(1 - mach * mach);
    }
    return cp0 / d;
  };
  let cl = 0;
  let cm = 0;
  let prevDn = 0;
  let prevX = 0;
  for (let k = 0; k < p.x.length; k++) {
    const x = p.x[k];
    const dn = corr(p.cpLower[k]) - corr(p.cpUpper[k]);
    if (k > 0) {
      const h = x - prevX;
      cl += (h * (dn + prevDn)) / 2;
      cm -= (h * (dn * (x - 0.25) + prevDn * (prevX - 0.25))) / 2;
    }
    prevDn = dn;
    prevX = x;
  }
  return { cl, cm, singular };
}

function line(x: readonly number[], y: readonly number[]): { slope: number; intercept: number } {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx };
}

/** What the rule, applied point by point over a section's pressures, does to its linear characteristics. */
export interface PointByPointScaling {
  /** Ratio of the compressible to the incompressible lift-curve slope (both fitted over the table's angles). */
  slopeRatio: number;
  /** Shift of the zero-lift angle, deg (compressible minus incompressible). */
  alphaL0Shift: number;
  /** Incompressible and compressible moment coefficients at zero lift (about the quarter chord). */
  cmAc0: number;
  cmAcM: number;
  /** True where the rule was singular at some point of some angle (Prandtl–Glauert used there). */
  singular: boolean;
}

/**
 * Apply the rule point by point over the section's incompressible chordwise pressures at each angle,
 * integrate, and fit straight lines over the angles given: cl against α for the slope and the zero-lift
 * angle, cm against cl for the moment at zero lift — before (Mach 0) and after the correction. The
 * result is linear over the table's angles, as superposition needs; Prandtl–Glauert gives exactly 1/β.
 */
export function pointByPointScaling(pressures: readonly ChordwisePressure[], rule: CompressibilityRule, mach: number): PointByPointScaling {
  const a = pressures.map((p) => p.alphaDeg);
  const inc = pressures.map((p) => integratePressures(p, rule, 0));
  const com = pressures.map((p) => integratePressures(p, rule, mach));
  const l0 = line(a, inc.map((r) => r.cl));
  const lm = line(a, com.map((r) => r.cl));
  const m0 = line(inc.map((r) => r.cl), inc.map((r) => r.cm));
  const mm = line(com.map((r) => r.cl), com.map((r) => r.cm));
  return {
    slopeRatio: lm.slope / l0.slope,
    alphaL0Shift: -lm.intercept / lm.slope - -l0.intercept / l0.slope,
    cmAc0: m0.intercept,
    cmAcM: mm.intercept,
    singular: com.some((r) => r.singular),
  };
}

/** Below this size (in cm) a section's zero-lift moment counts as nil (a symmetric section). */
const CM_NIL = 0.002;

/**
 * The compressible cm about the aerodynamic centre of a station whose incompressible value is `cmAc`,
 * from a point-by-point scaling: cmAc times the ratio the pressures give, or, for a symmetric section
 * whose own zero-lift moment is nil, cmAc plus their increment.
 */
export function scaledCmAc(cmAc: number, s: PointByPointScaling): number {
  return Math.abs(s.cmAc0) > CM_NIL ? cmAc * (s.cmAcM / s.cmAc0) : cmAc + (s.cmAcM - s.cmAc0);
}

/**
 * The incompressible minimum Cp at an incompressible section cl from a table, linear between its
 * points and held at the end values beyond them (`beyond` then says which end).
 */
export function cpMinAt(table: readonly CpMinPoint[], cl: number): { cpMin: number; beyond: "below" | "above" | null } {
  if (cl <= table[0].cl) return { cpMin: table[0].cpMin, beyond: cl < table[0].cl ? "below" : null };
  const last = table[table.length - 1];
  if (cl >= last.cl) return { cpMin: last.cpMin, beyond: cl > last.cl ? "above" : null };
  let i = 1;
  while (table[i].cl < cl) i++;
  const p = table[i - 1];
  const q = table[i];
  return { cpMin: p.cpMin + ((cl - p.cl) / (q.cl - p.cl)) * (q.cpMin - p.cpMin), beyond: null };
}
