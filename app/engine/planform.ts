import { EngineError } from "./errors";
import type { ChordwisePressure, CpMinPoint } from "./section-data";
import { validateSectionData } from "./section-data";

/**
 * One spanwise breakpoint of a piecewise-linear wing: planform plus incompressible section data.
 * Lengths m, angles deg, a0 per rad.
 */
export interface WingStation {
  /** Distance from the plane of symmetry, m. */
  y: number;
  /** Streamwise leading-edge position, m, aft positive. */
  xLe: number;
  /** Chord, m (> 0). */
  chord: number;
  /** Incidence relative to the root chord, deg, nose up positive. */
  twist: number;
  /** Incompressible section lift-curve slope, per rad. */
  a0: number;
  /** Incompressible zero-lift angle, deg. */
  alphaL0: number;
  /** Incompressible moment coefficient about the aerodynamic centre (quarter chord). */
  cmAc: number;
  /** Section maximum lift coefficient (optional). */
  clMax?: number;
  /** Incompressible minimum pressure coefficient at the working condition, < 0 (optional). */
  cpMin?: number;
  /** The incompressible section cl at which `cpMin` holds (optional, richer section data). */
  cpMinCl?: number;
  /** Incompressible minimum Cp against section cl (optional, richer section data; replaces cpMin for the critical Mach number). */
  cpMinTable?: CpMinPoint[];
  /** Incompressible chordwise pressures at two or more angles, for the rule point by point (optional, richer section data). */
  pressures?: ChordwisePressure[];
}

/** Section values at one spanwise position, linearly interpolated between breakpoints. */
export interface SectionAt {
  y: number;
  xLe: number;
  chord: number;
  twist: number;
  a0: number;
  alphaL0: number;
  cmAc: number;
  clMax: number | undefined;
  cpMin: number | undefined;
}

/** One trapezoidal panel between two breakpoints. */
export interface PanelGeometry {
  yInner: number;
  yOuter: number;
  /** Area of this panel on one side, m². */
  area: number;
  sweepLeDeg: number;
  sweepQuarterChordDeg: number;
  sweepHalfChordDeg: number;
  sweepTrailingEdgeDeg: number;
}

/** Whole-wing geometry (both sides) of a piecewise-linear planform. */
export interface WingGeometry {
  /** Total area, both sides, m². */
  area: number;
  /** Total span, m. */
  span: number;
  semispan: number;
  aspectRatio: number;
  /** Tip chord / root chord. */
  taperRatio: number;
  /** Mean aerodynamic chord (2/S)∫c²dy over both sides, m. */
  mac: number;
  /** Spanwise position of the MAC, m from the plane of symmetry. */
  yMac: number;
  /** Leading-edge position of the MAC, m. */
  xLeMac: number;
  /** Mean geometric chord S/b, m. */
  meanGeometricChord: number;
  panels: PanelGeometry[];
}

/**
 * Check a station list: at least two, y strictly increasing from 0, chord > 0, finite numbers, cpMin < 0.
 * @throws EngineError invalid-planform naming the field (e.g. "wing.stations[2].y").
 */
export function validateStations(stations: readonly WingStation[]): void {
  if (!Array.isArray(stations) || stations.length < 2) {
    throw new EngineError("invalid-planform", "needs at least 2 stations (root and tip)", "wing.stations");
  }
  stations.forEach((s, i) => {
    const f = (k: string) => `wing.stations[${i}].${k}`;
    for (const k of ["y", "xLe", "chord", "twist", "a0", "alphaL0", "cmAc"] as const) {
      if (!Number.isFinite(s[k])) throw new EngineError("invalid-planform", "must be a finite number", f(k));
    }
    if (i === 0 && s.y !== 0) throw new EngineError("invalid-planform", "the first station must be at y = 0", f("y"));
    if (i > 0 && !(s.y > stations[i - 1].y)) {
      throw new EngineError("invalid-planform", "must be greater than the previous station's y (strictly increasing)", f("y"));
    }
    if (!(s.chord > 0)) throw new EngineError("invalid-planform", "must be greater than 0", f("chord"));
    if (!(s.a0 > 0)) throw new EngineError("invalid-section", "must be greater than 0 (per radian)", f("a0"));
    if (s.cpMin !== undefined && !(s.cpMin < 0)) throw new EngineError("invalid-section", "must be below 0", f("cpMin"));
    if (s.clMax !== undefined && !(s.clMax > 0)) throw new EngineError("invalid-section", "must be greater than 0", f("clMax"));
    validateSectionData(s, `wing.stations[${i}]`);
  });
}

function sweepDeg(a: WingStation, b: WingStation, fraction: number): number {
  const dx = b.xLe + fraction * b.chord - (a.xLe + fraction * a.chord);
  return (Math.atan2(dx, b.y - a.y) * 180) / Math.PI;
}

/** Sweep (deg, aft positive) of the chord line at `fraction` of the chord on panel `panel` (0 = innermost). */
export function panelSweepDeg(stations: readonly WingStation[], panel: number, fraction: number): number {
  if (panel < 0 || panel >= stations.length - 1) throw new EngineError("invalid-argument", "no such panel", "panel");
  return sweepDeg(stations[panel], stations[panel + 1], fraction);
}

/** Whole-wing area, span, AR, taper, MAC and its position; exact for linear chord and leading edge per panel. */
export function wingGeometry(stations: readonly WingStation[]): WingGeometry {
  validateStations(stations);
  let half = 0;
  let c2 = 0;
  let cy = 0;
  let xc = 0;
  const panels: PanelGeometry[] = [];
  for (let i = 0; i + 1 < stations.length; i++) {
    const a = stations[i];
    const b = stations[i + 1];
    const h = b.y - a.y;
    const area = (h * (a.chord + b.chord)) / 2;
    half += area;
    c2 += (h * (a.chord * a.chord + a.chord * b.chord + b.chord * b.chord)) / 3;
    cy += (h * (a.chord * (2 * a.y + b.y) + b.chord * (a.y + 2 * b.y))) / 6;
    xc += (h * (a.xLe * (2 * a.chord + b.chord) + b.xLe * (a.chord + 2 * b.chord))) / 6;
    panels.push({
      yInner: a.y,
      yOuter: b.y,
      area,
      sweepLeDeg: sweepDeg(a, b, 0),
      sweepQuarterChordDeg: sweepDeg(a, b, 0.25),
      sweepHalfChordDeg: sweepDeg(a, b, 0.5),
      sweepTrailingEdgeDeg: sweepDeg(a, b, 1),
    });
  }
  const semispan = stations[stations.length - 1].y;
  const area = 2 * half;
  const span = 2 * semispan;
  return {
    area,
    span,
    semispan,
    aspectRatio: (span * span) / area,
    taperRatio: stations[stations.length - 1].chord / stations[0].chord,
    mac: c2 / half,
    yMac: cy / half,
    xLeMac: xc / half,
    meanGeometricChord: area / span,
    panels,
  };
}

/**
 * Section data at spanwise position y (m), linear between breakpoints. clMax and cpMin are
 * interpolated only inside panels whose both ends give them (otherwise undefined).
 */
export function sectionAt(stations: readonly WingStation[], y: number): SectionAt {
  const n = stations.length;
  let i = 0;
  if (y >= stations[n - 1].y) i = n - 2;
  else while (i < n - 2 && y > stations[i + 1].y) i++;
  const a = stations[i];
  const b = stations[i + 1];
  const t = Math.min(1, Math.max(0, (y - a.y) / (b.y - a.y)));
  const lerp = (u: number, v: number) => u + t * (v - u);
  const opt = (u: number | undefined, v: number | undefined) => {
    if (u !== undefined && v !== undefined) return lerp(u, v);
    if (t === 0) return u;
    if (t === 1) return v;
    return undefined;
  };
  return {
    y,
    xLe: lerp(a.xLe, b.xLe),
    chord: lerp(a.chord, b.chord),
    twist: lerp(a.twist, b.twist),
    a0: lerp(a.a0, b.a0),
    alphaL0: lerp(a.alphaL0, b.alphaL0),
    cmAc: lerp(a.cmAc, b.cmAc),
    clMax: opt(a.clMax, b.clMax),
    cpMin: opt(a.cpMin, b.cpMin),
  };
}

/** Stations of a straight-tapered, untwisted wing: handy for checks and examples. */
export function trapezoidalWing(opts: {
  span: number;
  rootChord: number;
  taperRatio: number;
  /** Quarter-chord sweep, deg. */
  sweepQuarterChordDeg?: number;
  a0?: number;
  alphaL0?: number;
  cmAc?: number;
  tipTwist?: number;
}): WingStation[] {
  const s = opts.span / 2;
  const cr = opts.rootChord;
  const ct = cr * opts.taperRatio;
  const tanQc = Math.tan(((opts.sweepQuarterChordDeg ?? 0) * Math.PI) / 180);
  const common = { a0: opts.a0 ?? 2 * Math.PI, alphaL0: opts.alphaL0 ?? 0, cmAc: opts.cmAc ?? 0 };
  return [
    { y: 0, xLe: 0, chord: cr, twist: 0, ...common },
    { y: s, xLe: 0.25 * cr + s * tanQc - 0.25 * ct, chord: ct, twist: opts.tipTwist ?? 0, ...common },
  ];
}

/** Stations approximating an elliptic planform with a straight quarter-chord line (n panels, cosine-spaced). */
export function ellipticWing(opts: { span: number; rootChord: number; panels?: number; a0?: number }): WingStation[] {
  const n = opts.panels ?? 64;
  const s = opts.span / 2;
  const out: WingStation[] = [];
  for (let k = 0; k <= n; k++) {
    const th = (k * Math.PI) / (2 * n);
    const y = s * Math.sin(th);
    // A small tip chord keeps every chord > 0; its area share is negligible at n ≥ 32.
    const chord = Math.max(opts.rootChord * Math.cos(th), opts.rootChord * 1e-4);
    out.push({ y, xLe: 0.25 * (opts.rootChord - chord), chord, twist: 0, a0: opts.a0 ?? 2 * Math.PI, alphaL0: 0, cmAc: 0 });
  }
  return out;
}
