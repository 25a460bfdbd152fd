import { EngineError } from "./errors";
import type { Part23Category, RuleValue } from "./certification";
import type { StationLoads } from "./mass";
import type { WingStation } from "./planform";
import { sectionAt, validateStations } from "./planform";
import type { ReferenceAxis } from "./superposition";
import { resolveAboutAxis } from "./superposition";

// Rolling and unsymmetrical conditions: one semispan carries the symmetric condition's airload, the
// other a fraction of it, and the aileron adds torsion over its span. The loads of each side follow from
// a symmetric case's aerodynamic loads and inertia relief (no new spanwise solve). Rigid aircraft; the
// roll acceleration's inertia and the aileron's lift increment are not modelled (the rules' simplified
// method). Paragraph texts marked [M] are from memory: confirm them against the applicable regulation.

/**
 * Airload on the less loaded side as a fraction of the symmetric semispan airload.
 * 14 CFR 23.349(a) [M]: 75 % in condition A for normal, utility and commuter; 60 % in conditions A and F
 * for acrobatic. 14 CFR 25.349(b) [M]: unsymmetrical gusts, 80 % of the maximum airload on the other side.
 */
export function unsymmetricalFraction(part: "23" | "25", category?: Part23Category): RuleValue & { conditions: string[] } {
  if (part === "25") return { value: 0.8, rule: "14 CFR 25.349(b)", conditions: ["gust+VB", "gust+VC", "gust+VD", "gust-VB", "gust-VC", "gust-VD"] };
  if (category === "acrobatic") return { value: 0.6, rule: "14 CFR 23.349(a)(1)", conditions: ["A", "F"] };
  return { value: 0.75, rule: "14 CFR 23.349(a)(2)", conditions: ["A"] };
}

/** Load factor of the rolling conditions: two thirds of the positive manoeuvring factor (23.349(b), 25.349(a) [M]). */
export function rollingLoadFactor(part: "23" | "25", n1: number): RuleValue {
  if (!(n1 > 0)) throw new EngineError("invalid-argument", "must be greater than 0", "n1");
  return { value: (2 / 3) * n1, rule: part === "25" ? "14 CFR 25.349(a)" : "14 CFR 23.349(b)" };
}

/**
 * Aileron deflections of the rolling conditions from the full deflection at V_A: at V_C the deflection giving
 * the same rate of roll, at V_D the one giving a third of it (25.349(a)(3)–(5) [M]; 23.455 [M]). The steady
 * rate of roll is taken proportional to δ·V (p·b/2V ∝ δ: common practice, no source), so
 * δ_C = δ_A·V_A/V_C and δ_D = δ_A·V_A/(3·V_D).
 */
export function aileronDeflections(p: { vaEas: number; vcEas: number; vdEas: number; deltaAtVa: number }, part: "23" | "25"): { va: RuleValue; vc: RuleValue; vd: RuleValue } {
  if (!(p.vaEas > 0 && p.vcEas >= p.vaEas && p.vdEas > p.vcEas)) throw new EngineError("invalid-argument", "speeds must rise: 0 < V_A ≤ V_C < V_D", "vaEas");
  if (!(p.deltaAtVa > 0 && p.deltaAtVa <= 40)) throw new EngineError("invalid-argument", "must be above 0 and at most 40 (deg)", "deltaAtVa");
  const r = part === "25" ? "14 CFR 25.349(a)" : "14 CFR 23.455";
  return {
    va: { value: p.deltaAtVa, rule: `${r}: full deflection at V_A` },
    vc: { value: (p.deltaAtVa * p.vaEas) / p.vcEas, rule: `${r}: the rate of roll of V_A at V_C` },
    vd: { value: (p.deltaAtVa * p.vaEas) / (3 * p.vdEas), rule: `${r}: one third of that rate at V_D` },
  };
}

/** The simplified aileron moment increment of 14 CFR 23.349(b) [M]: Δcm = −0.01·δ (δ the down-aileron deflection, deg). */
export function aileronCmIncrement(deltaDeg: number, perDeg = -0.01): RuleValue {
  return { value: perDeg * deltaDeg, rule: "14 CFR 23.349(b)" };
}

/**
 * Torsion and bending (N·m) at stations `y` from a section moment increment Δcm over the aileron span
 * [yFrom, yTo] at dynamic pressure q: the pitching couple ∫ q·c²·Δcm dy outboard of each station (exact for the
 * piecewise-linear chord), resolved about the reference axis like every other load (a couple about the
 * lateral line gives torsion My·cos Λ and bending −My·sin Λ).
 */
export function aileronMoments(
  stations: readonly WingStation[],
  y: readonly number[],
  q: number,
  dCm: number,
  span: { yFrom: number; yTo: number },
  axis: Pick<ReferenceAxis, "sin" | "cos">,
): StationLoads {
  validateStations(stations);
  const s = stations[stations.length - 1].y;
  if (!(span.yFrom >= 0 && span.yTo > span.yFrom && span.yTo <= s)) throw new EngineError("invalid-argument", `must satisfy 0 ≤ yFrom < yTo ≤ ${s} m`, "aileron.yTo");
  const breaks = stations.map((x) => x.y);
  // ∫_a^b c² dy with c linear between breakpoints: Simpson's rule is exact for the quadratic c² on each piece.
  const c2 = (a: number, b: number) => {
    const pts = [...new Set([a, b, ...breaks.filter((v) => v > a && v < b)])].sort((u, v) => u - v);
    let sum = 0;
    for (let i = 0; i + 1 < pts.length; i++) {
      const ca = sectionAt(stations, pts[i]).chord;
      const cb = sectionAt(stations, pts[i + 1]).chord;
      const cm = sectionAt(stations, (pts[i] + pts[i + 1]) / 2).chord;
      sum += ((pts[i + 1] - pts[i]) * (ca * ca + 4 * cm * cm + cb * cb)) / 6;
    }
    return sum;
  };
  const torsion = y.map((yk) => {
    const a = Math.max(yk, span.yFrom);
    return span.yTo > a ? q * dCm * c2(a, span.yTo) : 0;
  });
  const out = { shear: y.map(() => 0), bending: y.map(() => 0), torsion };
  resolveAboutAxis(out, axis);
  return out;
}

/**
 * Net loads of one side in an unsymmetrical condition: `airloadFactor` × the symmetric case's aerodynamic
 * loads (net + relief), minus the same inertia relief, plus any extra loads (the aileron's moments).
 */
export function sideLoads(
  c: { shear: readonly number[]; bending: readonly number[]; torsion: readonly number[]; relief: StationLoads },
  airloadFactor: number,
  extra?: StationLoads,
): StationLoads {
  const side = (net: readonly number[], relief: readonly number[], add?: readonly number[]) =>
    net.map((v, k) => airloadFactor * (v + relief[k]) - relief[k] + (add?.[k] ?? 0));
  return {
    shear: side(c.shear, c.relief.shear, extra?.shear),
    bending: side(c.bending, c.relief.bending, extra?.bending),
    torsion: side(c.torsion, c.relief.torsion, extra?.torsion),
  };
}
