import type { WingStation } from "./planform";
import { sectionAt, wingGeometry } from "./planform";
import { DEG } from "./spanwise";

/** Schrenk's spanwise loading at given stations. */
export interface SchrenkDistribution {
  y: number[];
  /** Additional loading c·cl per unit CL, m: ½[c + (4S/(πb))√(1 − (2y/b)²)]. */
  cclAdditional: number[];
  /** Basic loading from twist and αL0 at CL = 0, m: strip-theory basic load averaged with zero. */
  cclBasic: number[];
}

/**
 * Schrenk's approximation (NACA TM 948, 1940): the additional load is the arithmetic mean of the
 * planform chord and an elliptic chord of the same area and span; the basic load from twist is
 * the strip-theory load a0·c·(α_g − ᾱ) averaged with zero, ᾱ chosen so it carries no net lift
 * (α_g = twist − αL0). Incompressible; the tip keeps its characteristic non-zero load ½c_t.
 */
export function schrenkDistribution(stations: readonly WingStation[], y: readonly number[]): SchrenkDistribution {
  const g = wingGeometry(stations);
  const s = g.semispan;
  const ce = (4 * g.area) / (Math.PI * g.span);
  const cclAdditional = y.map((v) => {
    const e = Math.max(0, 1 - (v / s) ** 2);
    return 0.5 * (sectionAt(stations, v).chord + ce * Math.sqrt(e));
  });
  // ᾱ from ∫a0·c·(α_g − ᾱ)dy = 0, integrated on a fine grid (exact enough for linear data).
  const n = 2000;
  let num = 0;
  let den = 0;
  for (let k = 0; k <= n; k++) {
    const sec = sectionAt(stations, (s * k) / n);
    const w = (k === 0 || k === n ? 0.5 : 1) * sec.a0 * sec.chord;
    num += w * (sec.twist - sec.alphaL0) * DEG;
    den += w;
  }
  const abar = num / den;
  const cclBasic = y.map((v) => {
    const sec = sectionAt(stations, v);
    return 0.5 * sec.a0 * sec.chord * ((sec.twist - sec.alphaL0) * DEG - abar);
  });
  return { y: [...y], cclAdditional, cclBasic };
}
