import { EngineError } from "./errors";
import type { Part23Category, RuleValue, VnPoint } from "./certification";
import type { StationLoads } from "./mass";
import type { WingStation } from "./planform";
import { sectionAt, validateStations } from "./planform";
import type { ReferenceAxis } from "./superposition";
import { resolveAboutAxis } from "./superposition";

// Rolling and unsymmetrical conditions: one semispan carries the symmetric condition's airload, the
// other a fraction of it, and the aileron adds its lift and moment increments over its span, down-going on
// the loaded side and up-going on the other. The loads of each side follow from a symmetric case's
// aerodynamic loads and inertia relief (no new spanwise solve). Rigid aircraft, strip theory for the
// aileron, no roll acceleration inertia (the rules' simplified method). Paragraph texts marked [M] are from
// memory: confirm them against the applicable regulation.

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
  checkSpan(stations, span);
  const torsion = y.map((yk) => {
    const a = Math.max(yk, span.yFrom);
    return span.yTo > a ? q * dCm * spanIntegral(stations, a, span.yTo, (c) => c * c) : 0;
  });
  const out = { shear: y.map(() => 0), bending: y.map(() => 0), torsion };
  resolveAboutAxis(out, axis);
  return out;
}

/**
 * Shear (N), bending and torsion (N·m) at stations `y` from a section lift increment Δcl over the aileron span
 * [yFrom, yTo] at dynamic pressure q, by strip theory: a running load q·c·Δcl acting at the quarter chord (where
 * the section lift acts; the deflection's moment about it is the separate Δcm of aileronMoments). Cut at
 * streamwise stations, torsion taken about the reference-axis point `xRef[k]` of each station (nose up positive:
 * lift ahead of the axis), then resolved about the swept axis like every other load. Exact for the
 * piecewise-linear chord and leading edge.
 */
export function aileronLift(
  stations: readonly WingStation[],
  y: readonly number[],
  xRef: readonly number[],
  q: number,
  dCl: number,
  span: { yFrom: number; yTo: number },
  axis: Pick<ReferenceAxis, "sin" | "cos">,
): StationLoads {
  checkSpan(stations, span);
  const out: StationLoads = { shear: [], bending: [], torsion: [] };
  y.forEach((yk, k) => {
    const a = Math.max(yk, span.yFrom);
    const w = span.yTo > a ? q * dCl : 0;
    out.shear.push(w * spanIntegral(stations, a, span.yTo, (c) => c));
    out.bending.push(w * spanIntegral(stations, a, span.yTo, (c, eta) => c * (eta - yk)));
    out.torsion.push(w * spanIntegral(stations, a, span.yTo, (c, eta, xLe) => c * (xRef[k] - (xLe + c / 4))));
  });
  resolveAboutAxis(out, axis);
  return out;
}

function checkSpan(stations: readonly WingStation[], span: { yFrom: number; yTo: number }): void {
  validateStations(stations);
  const s = stations[stations.length - 1].y;
  if (!(span.yFrom >= 0 && span.yTo > span.yFrom && span.yTo <= s)) throw new EngineError("invalid-argument", `must satisfy 0 ≤ yFrom < yTo ≤ ${s} m`, "aileron.yTo");
}

/**
 * ∫_a^b g(c(η), η, xLe(η)) dη (b > a) with chord and leading edge linear between the wing's breakpoints:
 * Simpson's rule on each piece, exact for an integrand of at most third degree in η there.
 */
function spanIntegral(stations: readonly WingStation[], a: number, b: number, g: (chord: number, eta: number, xLe: number) => number): number {
  const pts = [...new Set([a, b, ...stations.map((x) => x.y).filter((v) => v > a && v < b)])].sort((u, v) => u - v);
  const at = (eta: number) => {
    const sec = sectionAt(stations, eta);
    return g(sec.chord, eta, sec.xLe);
  };
  let sum = 0;
  for (let i = 0; i + 1 < pts.length; i++) sum += ((pts[i + 1] - pts[i]) * (at(pts[i]) + 4 * at((pts[i] + pts[i + 1]) / 2) + at(pts[i + 1]))) / 6;
  return sum;
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

/** An aileron: its span and the section increments of one degree of down-going deflection. */
export interface AileronSpan {
  /** Inner and outer end of the aileron, m (0 ≤ yFrom < yTo ≤ semispan). */
  yFrom: number;
  yTo: number;
  /** Section lift increment per degree of down-going deflection (strip theory), per deg. */
  dClPerDeg: number;
  /** Section moment increment about the quarter chord per degree of down-going deflection (−0.01: 14 CFR 23.349 [M]). */
  dCmPerDeg: number;
}

/** The two sides of a rolling or unsymmetrical case. */
export interface RollingSides {
  /** Full airload and the down-going aileron (more lift, nose-down moment). */
  loaded: StationLoads;
  /** `fraction` of the airload and the up-going aileron (less lift, nose-up moment). */
  other: StationLoads;
}

/**
 * Net loads of both sides of a rolling case from its symmetric condition `c` (aerodynamic loads at dynamic
 * pressure `c.dynamicPressure` and the inertia relief at its load factor): the loaded side carries the full
 * airload plus the down-going aileron's increments (Δcl = dClPerDeg·δ, Δcm = dCmPerDeg·δ over its span), the
 * other side `fraction` of it plus the up-going aileron's (the same increments, opposite sign). Both sides keep
 * the same inertia relief (a rigid aircraft without roll acceleration).
 * @throws EngineError for a deflection without an aileron, or a fraction outside (0, 1]
 */
export function rollingSides(
  c: { y: readonly number[]; dynamicPressure: number; shear: readonly number[]; bending: readonly number[]; torsion: readonly number[]; relief: StationLoads },
  wing: { stations: readonly WingStation[]; xRef: readonly number[]; axis: Pick<ReferenceAxis, "sin" | "cos"> },
  roll: { fraction: number; aileronDeg: number },
  aileron: AileronSpan | undefined,
  field = "roll",
): RollingSides {
  if (!(roll.fraction > 0 && roll.fraction <= 1)) throw new EngineError("invalid-argument", "must be above 0 and at most 1", `${field}.fraction`);
  if (!(roll.aileronDeg >= 0 && roll.aileronDeg <= 40)) throw new EngineError("invalid-argument", "must be between 0 and 40 (deg)", `${field}.aileron`);
  if (roll.aileronDeg === 0) return { loaded: sideLoads(c, 1), other: sideLoads(c, roll.fraction) };
  if (!aileron) throw new EngineError("invalid-argument", "a deflection needs the aileron (its span and increments)", `${field}.aileron`);
  const q = c.dynamicPressure;
  const lift = aileronLift(wing.stations, c.y, wing.xRef, q, aileron.dClPerDeg * roll.aileronDeg, aileron, wing.axis);
  const moment = aileronMoments(wing.stations, c.y, q, aileron.dCmPerDeg * roll.aileronDeg, aileron, wing.axis);
  const down: StationLoads = {
    shear: lift.shear.map((v, k) => v + moment.shear[k]),
    bending: lift.bending.map((v, k) => v + moment.bending[k]),
    torsion: lift.torsion.map((v, k) => v + moment.torsion[k]),
  };
  const up: StationLoads = { shear: down.shear.map((v) => -v), bending: down.bending.map((v) => -v), torsion: down.torsion.map((v) => -v) };
  return { loaded: sideLoads(c, 1, down), other: sideLoads(c, roll.fraction, up) };
}

/**
 * The rolling and unsymmetrical conditions of a V–n diagram, from its manoeuvre points A (V_A, n1) and F:
 * Part 25 `roll-VA`, `roll-VC`, `roll-VD` at 2/3·n1 with the aileron deflections of 25.349(a) (both sides at the
 * full airload, the aileron making the difference); Part 23 `unsym-A` (and `unsym-F` for acrobatic) at the
 * point's own load factor with the other side's share of 23.349(a) and no deflection, and `roll-VA`, `roll-VC`,
 * `roll-VD` at 2/3·n1 with the deflections of 23.455 (the aileron's increments; Δcm of 23.349(b)). Without
 * `deltaAtVa` (no aileron given) only the unsymmetrical points. Paragraphs from memory [M].
 */
export function rollingVnPoints(p: {
  part: "23" | "25";
  category?: Part23Category;
  a: VnPoint;
  f?: VnPoint;
  vcEas: number;
  vdEas: number;
  deltaAtVa?: number;
}): VnPoint[] {
  const out: VnPoint[] = [];
  if (p.part === "23") {
    const u = unsymmetricalFraction("23", p.category);
    const pct = `${(u.value * 100).toFixed(0)} % of the semispan airload on the other side`;
    for (const pt of [p.a, ...(u.conditions.includes("F") && p.f ? [p.f] : [])]) {
      out.push({ name: `unsym-${pt.name}`, veas: pt.veas, nz: pt.nz, rule: `${u.rule}: condition ${pt.name}, ${pct}`, roll: { fraction: u.value, aileron: 0 } });
    }
  }
  if (p.deltaAtVa === undefined) return out;
  const n = rollingLoadFactor(p.part, p.a.nz);
  const d = aileronDeflections({ vaEas: p.a.veas, vcEas: p.vcEas, vdEas: p.vdEas, deltaAtVa: p.deltaAtVa }, p.part);
  for (const [speed, veas, delta] of [["VA", p.a.veas, d.va], ["VC", p.vcEas, d.vc], ["VD", p.vdEas, d.vd]] as const) {
    out.push({
      name: `roll-${speed}`,
      veas,
      nz: n.value,
      rule: `${n.rule}: 2/3·n1 = ${n.value.toFixed(3)}; ${delta.rule}, aileron ${delta.value.toFixed(2)}°${p.part === "23" ? "; Δcm of 14 CFR 23.349(b)" : ""}`,
      roll: { fraction: 1, aileron: delta.value },
    });
  }
  return out;
}
