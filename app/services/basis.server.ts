import type { BasisData } from "~/domain/step-data";
import { fromSI, unitSymbol } from "~/domain/units";
import { manoeuvreLoadFactorsPart23, manoeuvreLoadFactorsPart25, minimumDesignSpeedsPart23, minimumFlapSpeed, stallSpeed, UNITS, type Part23Category } from "~/engine";

/** One line of the check of a saved basis: what the rule gives, and whether the typed value meets it. */
export interface BasisCheck {
  label: string;
  value: string;
  rule: string;
  ok?: boolean;
}

const G0 = 9.80665;
const PSF = 47.880259;
const KT = 1852 / 3600;

/**
 * What the rules of the saved basis give, beside what was typed: a check, not a substitute. Load
 * factors and minimum design speeds by the category's rules, the stall speed from CLmax, VA against
 * VS1·√n. Speeds in the basis's own display units, EAS.
 */
export function basisChecks(b: BasisData): BasisCheck[] {
  const speed = (si: number) => fromSI(b.units, "speed", si).toFixed(1);
  const sym = unitSymbol(b.units, "speed");
  const weightN = b.mtow * G0;
  const mtowLb = weightN / UNITS.lbfToN;
  const part23 = b.category !== "part25";
  const f = part23 ? manoeuvreLoadFactorsPart23(mtowLb, b.category.replace("part23-", "") as Part23Category) : manoeuvreLoadFactorsPart25(mtowLb);
  const vs = stallSpeed(weightN, b.wingArea, b.clMax);
  const rows: BasisCheck[] = [
    { label: "Wing loading at MTOW", value: b.units === "US" ? `${(weightN / b.wingArea / PSF).toFixed(1)} psf (${(weightN / b.wingArea).toFixed(0)} N/m²)` : `${(weightN / b.wingArea).toFixed(0)} N/m² (${(weightN / b.wingArea / PSF).toFixed(1)} psf)`, rule: "W/S" },
    { label: "Positive limit load factor", value: f.positive.value.toFixed(3), rule: f.positive.rule },
    { label: "Negative limit load factor at VC", value: f.negativeAtVc.value.toFixed(3), rule: f.negativeAtVc.rule },
    { label: "Negative limit load factor at VD", value: f.negativeAtVd.value.toFixed(3), rule: f.negativeAtVd.rule },
    { label: "1-g stall speed from CLmax", value: `${speed(vs)} ${sym} EAS (typed VS1 ${speed(b.vs1)})`, rule: "VS = √(2W/(ρ0·S·CLmax))", ok: Math.abs(vs - b.vs1) / vs < 0.05 },
    { label: "VA at least VS1·√n", value: `${speed(b.vs1 * Math.sqrt(f.positive.value))} ${sym} (typed ${speed(b.va)})`, rule: part23 ? "14 CFR 23.335(c)" : "14 CFR 25.335(c)", ok: b.va >= b.vs1 * Math.sqrt(f.positive.value) - 1e-9 },
  ];
  if (part23) {
    const m = minimumDesignSpeedsPart23(weightN / b.wingArea / PSF, b.category.replace("part23-", "") as Part23Category);
    rows.push(
      { label: "Minimum VC", value: `${speed(m.vc.value * KT)} ${sym} (typed ${speed(b.vc)})`, rule: m.vc.rule, ok: b.vc >= m.vc.value * KT - 1e-9 },
      { label: "Minimum VD", value: `${speed(m.vd.value * KT)} ${sym} (typed ${speed(b.vd)})`, rule: m.vd.rule, ok: b.vd >= m.vd.value * KT - 1e-9 },
    );
  }
  if (b.vf !== undefined && b.clMaxFlaps !== undefined) {
    // Part 25 takes V_S0 in the landing position at the maximum landing weight (MTOW where none is given).
    const flapsWeightN = (part23 ? b.mtow : (b.mlw ?? b.mtow)) * G0;
    const vsf = stallSpeed(flapsWeightN, b.wingArea, b.clMaxFlaps);
    const min = minimumFlapSpeed(part23 ? "23" : "25", vs, vsf);
    rows.push({
      label: "Minimum VF",
      value: `${speed(min.value)} ${sym} (typed ${speed(b.vf)}; flaps-extended stall speed ${speed(vsf)} ${sym})`,
      rule: `${min.rule} [from memory]: ${part23 ? "the greater of 1.4·VS and 1.8·VSF" : "1.8·VS0"}`,
      ok: b.vf >= min.value - 1e-9,
    });
  }
  return rows;
}
