import { EngineError } from "./errors";
import type { RuleValue, VnPoint } from "./certification";
import { UNITS, gustLoadFactorSI, gustMassRatio, gustAlleviationFactor, stallSpeed } from "./certification";
import { plungeGustResponse, sharpEdgedIncrement } from "./gust-response";
import type { WingStation } from "./planform";
import { sectionAt, validateStations } from "./planform";

// Flaps-extended conditions: the wing with its flapped sections, the load-factor and gust limits at
// the design flap speed V_F, and the flaps' own V–n points. Paragraph texts marked [M] are from
// memory (REFERENCES §10 style): confirm them against the applicable regulation.

const G0 = 9.80665;

/** A flap over a span range and the increments it gives the incompressible section data there. */
export interface FlapSpan {
  /** Inner and outer end of the flapped span, m (0 ≤ yFrom < yTo ≤ semispan). */
  yFrom: number;
  yTo: number;
  /** Change of the section zero-lift angle, deg (negative: the flap adds camber). */
  dAlphaL0: number;
  /** Change of the section moment coefficient about the quarter chord (negative: nose down). */
  dCmAc: number;
  /** Section maximum lift coefficient with the flap extended (optional). */
  clMax?: number;
}

/**
 * The wing with flaps extended: the section increments applied inside [yFrom, yTo], with breakpoints
 * added at the flap's ends. The wing data are linear between breakpoints, so an interior flap end is
 * represented by a short blend (1 % of the flap span, at most 0.5 % of the semispan) from the clean
 * to the flapped section; the lifting theories smooth such a step anyway.
 * @throws EngineError for a flap outside the wing, naming the field.
 */
export function flappedStations(stations: readonly WingStation[], flap: FlapSpan, field = "flaps"): WingStation[] {
  validateStations(stations);
  const s = stations[stations.length - 1].y;
  if (!(flap.yFrom >= 0 && flap.yFrom < s)) throw new EngineError("invalid-argument", `must lie inside the semispan, 0 to ${s} m`, `${field}.yFrom`);
  if (!(flap.yTo > flap.yFrom && flap.yTo <= s)) throw new EngineError("invalid-argument", `must be greater than yFrom and at most the semispan ${s} m`, `${field}.yTo`);
  if (!Number.isFinite(flap.dAlphaL0)) throw new EngineError("invalid-argument", "must be a finite number (deg)", `${field}.dAlphaL0`);
  if (!Number.isFinite(flap.dCmAc)) throw new EngineError("invalid-argument", "must be a finite number", `${field}.dCmAc`);
  if (flap.clMax !== undefined && !(flap.clMax > 0)) throw new EngineError("invalid-argument", "must be greater than 0", `${field}.clMax`);
  const eps = Math.min(0.01 * (flap.yTo - flap.yFrom), 0.005 * s);
  const innerBlend = flap.yFrom > 0;
  const outerBlend = flap.yTo < s;
  const lo = innerBlend ? flap.yFrom + eps : flap.yFrom;
  const hi = outerBlend ? flap.yTo - eps : flap.yTo;
  const ys = [...new Set([...stations.map((x) => x.y), flap.yFrom, flap.yTo, lo, hi])].sort((a, b) => a - b);
  return ys.map((y) => {
    const sec = sectionAt(stations, y);
    const inside = y >= lo - 1e-12 && y <= hi + 1e-12;
    const st: WingStation = {
      y,
      xLe: sec.xLe,
      chord: sec.chord,
      twist: sec.twist,
      a0: sec.a0,
      alphaL0: sec.alphaL0 + (inside ? flap.dAlphaL0 : 0),
      cmAc: sec.cmAc + (inside ? flap.dCmAc : 0),
    };
    const clMax = inside && flap.clMax !== undefined ? flap.clMax : sec.clMax;
    if (clMax !== undefined) st.clMax = clMax;
    if (sec.cpMin !== undefined) st.cpMin = sec.cpMin;
    return st;
  });
}

/**
 * Limits of the flaps-extended conditions: positive manoeuvring load factor 2.0 and gusts of 25 ft/s EAS
 * normal to the flight path in level flight, at V_F (14 CFR 25.345(a) [M]; 14 CFR 23.345(a) [M]). For Part
 * 25 the gust is the one-minus-cosine gust with U_ds = 25 ft/s and H = 12.5 c̄, analysed dynamically.
 */
export function flapsLimits(part: "23" | "25"): { nPositive: RuleValue; gust: RuleValue; gradientChords?: number } {
  const p = part === "25" ? "14 CFR 25.345(a)" : "14 CFR 23.345(a)";
  return {
    nPositive: { value: 2.0, rule: `${p}(1)` },
    gust: { value: 25 * UNITS.ftToM, rule: `${p}(2)` },
    ...(part === "25" ? { gradientChords: 12.5 } : {}),
  };
}

/**
 * Minimum design flap speed, m/s EAS. Part 23 (23.345(b) [M]): the greater of 1.4·V_S (flaps retracted, design
 * weight) and 1.8·V_SF (flaps extended). Part 25 (25.335(e)(3) [M], landing position at the maximum landing
 * weight): 1.8·V_S0, with V_S0 here the flaps-extended stall speed given.
 */
export function minimumFlapSpeed(part: "23" | "25", vsClean: number, vsFlaps: number): RuleValue {
  if (part === "25") return { value: 1.8 * vsFlaps, rule: "14 CFR 25.335(e)(3)" };
  return { value: Math.max(1.4 * vsClean, 1.8 * vsFlaps), rule: "14 CFR 23.345(b)" };
}

/** Input of the flaps-extended V–n points (SI; speeds m/s EAS). */
export interface FlapsVnInput {
  part: "23" | "25";
  weightN: number;
  areaM2: number;
  /** Aircraft maximum lift coefficient with flaps extended. */
  clMaxFlaps: number;
  vfEas: number;
  /** Actual air density, kg/m³; mean geometric chord, m; lift slope of the flapped aircraft at the V_F Mach number, per rad. */
  density: number;
  meanChord: number;
  liftSlope: number;
}

/** The flaps' V–n points and, for Part 25, the dynamic gust factor beside Pratt's. */
export interface FlapsVn {
  points: VnPoint[];
  /** Flaps-extended 1-g stall speed, m/s EAS. */
  vsf: number;
  /** Peak factor K of the plunge response (Part 25) or Pratt's K_g (Part 23), and Pratt's K_g for comparison. */
  gustFactor: number;
  prattKg: number;
  massRatio: number;
}

/**
 * V–n points with flaps extended: "flaps-A" where the flapped stall line meets n = 2.0, "flaps-VF" at V_F and
 * n = 2.0, and the gust points at V_F (Part 23: Pratt's formula of 23.341(c); Part 25: the rigid aircraft in
 * plunge through the 25.345(a)(2) gust, H = 12.5 c̄).
 */
export function flapsVnPoints(p: FlapsVnInput): FlapsVn {
  if (!(p.vfEas > 0)) throw new EngineError("invalid-argument", "must be greater than 0", "vfEas");
  const lim = flapsLimits(p.part);
  const n = lim.nPositive.value;
  const vsf = stallSpeed(p.weightN, p.areaM2, p.clMaxFlaps);
  const ws = p.weightN / p.areaM2;
  const u = lim.gust.value;
  const mu = gustMassRatio(ws, p.density, p.meanChord, p.liftSlope, G0);
  const prattKg = gustAlleviationFactor(mu);
  let dn: number;
  let factor: number;
  let rule: string;
  if (p.part === "25") {
    factor = plungeGustResponse({ massRatio: mu, gradientSemichords: 2 * lim.gradientChords! }).peak;
    dn = factor * sharpEdgedIncrement(p.vfEas, p.liftSlope, u, ws);
    rule = `${lim.gust.rule}: U_ds = 25 ft/s, H = 12.5 c̄, rigid aircraft in plunge with unsteady lift`;
  } else {
    const g = gustLoadFactorSI({ wingLoading: ws, density: p.density, meanChord: p.meanChord, liftSlope: p.liftSlope, veas: p.vfEas, ude: u });
    factor = g.kg;
    dn = g.deltaN;
    rule = `${lim.gust.rule}; 14 CFR 23.341(c)`;
  }
  return {
    vsf,
    gustFactor: factor,
    prattKg,
    massRatio: mu,
    points: [
      { name: "flaps-A", veas: Math.min(vsf * Math.sqrt(n), p.vfEas), nz: n, rule: `${lim.nPositive.rule}; flaps-extended stall line` },
      { name: "flaps-VF", veas: p.vfEas, nz: n, rule: lim.nPositive.rule },
      { name: "flaps-gust+VF", veas: p.vfEas, nz: 1 + dn, rule },
      { name: "flaps-gust-VF", veas: p.vfEas, nz: 1 - dn, rule },
    ],
  };
}
