import { isEngineError } from "./errors";
import type { WingStation } from "./planform";
import { validateStations, wingGeometry } from "./planform";

/**
 * Plausible ranges of the inputs (docs/engine.md, "Plausible input"). Outside `min`/`max` an input is
 * impossible for a wing in attached subsonic flow, or outside what the linear methods can mean, and is
 * refused naming the field; outside `warnMin`/`warnMax` it is unusual and every case says so.
 * Units: m, deg, per rad, N, N/m². Where each range comes from is in the table of docs/engine.md.
 */
export const PLAUSIBLE = {
  /** Semispan, m: smaller than a hand-launched model, larger than any aeroplane built (117 m span [M]). */
  semispan: { min: 0.05, max: 150, warnMin: 0.5, warnMax: 60 },
  /**
   * Chord at a station, m. Relative to the largest chord: below `minFraction` refused (a pointed tip is
   * given a small chord, as ellipticWing's 1e-4; elsewhere the section cl would grow without bound),
   * a root chord below `warnRootFraction` warned of.
   */
  chord: { max: 100, warnMax: 30, minFraction: 1e-4, warnRootFraction: 0.05 },
  /** Whole-wing aspect ratio b²/S. */
  aspectRatio: { min: 0.5, max: 100, warnMin: 3, warnMax: 40 },
  /** Quarter-chord sweep of any panel, deg (either way). */
  sweepDeg: { max: 70, warnMax: 45 },
  /** Twist at a station, deg (either way). */
  twistDeg: { max: 30, warnMax: 10 },
  /** Section lift-curve slope, per rad (thin-airfoil theory 2π; thickness adds up to about 15 %). */
  a0: { min: 2, max: 4 * Math.PI, warnMin: 5, warnMax: 7.3 },
  /** Section zero-lift angle, deg (either way). */
  alphaL0Deg: { max: 20, warnMax: 8 },
  /** Section moment coefficient about the aerodynamic centre. */
  cmAc: { min: -0.6, max: 0.6, warnMin: -0.2, warnMax: 0.05 },
  /** Section maximum lift coefficient. */
  clMax: { max: 5, warnMin: 0.6, warnMax: 2.5 },
  /** Incompressible minimum pressure coefficient. */
  cpMin: { min: -30, warnMin: -3 },
  /** Root-chord angle of attack, given or trimmed, deg (either way). */
  alphaDeg: { max: 30, warnNoClMax: 15 },
  /** Load factor. */
  nz: { max: 20, warnMin: -5, warnMax: 10 },
  /** Whole-aircraft weight, N. */
  weight: { max: 2e7 },
  /** Any mass of one semispan (structure or item), kg: the heaviest aeroplane built weighs about 6.4·10⁵ kg [M]. */
  massKg: { max: 1e6 },
  /** Balancing tail load, N (either way): no larger than the heaviest weight accepted. */
  tailLoad: { max: 2e7 },
  /**
   * Streamwise position of a mass item, in chords of the largest chord beyond the wing's leading and
   * trailing edges: engines on pylons and tip stores sit within about one chord ahead [M].
   */
  massItemXChords: { max: 3 },
  /** Wing loading nz = 1, W/S, N/m². */
  wingLoading: { warnMin: 20, warnMax: 10000 },
  /** Mach number above which an unchecked critical Mach number is warned of. */
  machUnchecked: 0.5,
} as const;

/** A refused input: the field in the contract's path style and the rule it breaks. */
export interface Refusal {
  field: string;
  message: string;
  /**
   * True where the station list is not well formed (a chord or slope not above 0, y not increasing…):
   * a rule every field schema states itself, so a schema that has already said it leaves this one out.
   */
  malformed?: boolean;
}

/** What the plausibility check of a wing found: refusals (impossible) and warnings (unusual). */
export interface WingPlausibility {
  refusals: Refusal[];
  warnings: string[];
}

const fmt = (v: number) => (Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : String(Number(v.toPrecision(6))));

/**
 * Check a wing's stations against the plausible ranges. A station list that is not well formed
 * (validateStations) gives its first fault as the one refusal, marked `malformed`, and nothing else is
 * checked; it never throws for bad input. Pure; the exchange schema and solveMach both use it.
 */
export function wingPlausibility(stations: readonly WingStation[]): WingPlausibility {
  try {
    validateStations(stations);
  } catch (error) {
    if (!isEngineError(error) || !error.field) throw error;
    return { refusals: [{ field: error.field, message: error.message.slice(error.field.length + 2), malformed: true }], warnings: [] };
  }
  const refusals: Refusal[] = [];
  const warnings: string[] = [];
  const P = PLAUSIBLE;
  const range = (field: string, v: number, lo: number, hi: number, what: string) => {
    if (v < lo || v > hi) refusals.push({ field, message: `${fmt(v)} is outside ${fmt(lo)} to ${fmt(hi)}${what}` });
  };
  const unusual: string[] = [];
  const maxChord = Math.max(...stations.map((s) => s.chord));
  stations.forEach((s, i) => {
    const f = (k: string) => `wing.stations[${i}].${k}`;
    if (s.chord > P.chord.max) refusals.push({ field: f("chord"), message: `${fmt(s.chord)} m is more than ${P.chord.max} m, larger than any wing` });
    else if (s.chord < P.chord.minFraction * maxChord) {
      refusals.push({
        field: f("chord"),
        message: `${fmt(s.chord)} m is less than ${P.chord.minFraction} of the largest chord (${fmt(maxChord)} m): the section cl there would grow without bound`,
      });
    } else if (s.chord > P.chord.warnMax) unusual.push(`chord ${fmt(s.chord)} m at y = ${fmt(s.y)} m`);
    else if (i === 0 && s.chord < P.chord.warnRootFraction * maxChord) unusual.push(`root chord ${fmt(s.chord)} m, under ${P.chord.warnRootFraction * 100} % of the largest`);
    range(f("twist"), s.twist, -P.twistDeg.max, P.twistDeg.max, " deg: a twist beyond any wing (linear theory)");
    if (Math.abs(s.twist) > P.twistDeg.warnMax && Math.abs(s.twist) <= P.twistDeg.max) unusual.push(`twist ${fmt(s.twist)}° at y = ${fmt(s.y)} m`);
    if (s.a0 < P.a0.min || s.a0 > P.a0.max) {
      refusals.push({
        field: f("a0"),
        message:
          // validateStations has refused a0 ≤ 0; 0.05–0.25 is where a per-degree slope (2π/57.3 = 0.11) would lie.
          s.a0 >= 0.05 && s.a0 < 0.25
            ? `${fmt(s.a0)} is per radian: it looks like a per-degree value (multiply by 57.3); sections have about 2π = 6.28 per radian`
            : `${fmt(s.a0)} per radian is outside ${P.a0.min} to 4π = 12.57: thin-airfoil theory gives 2π, thickness adds a little`,
      });
    } else if (s.a0 < P.a0.warnMin || s.a0 > P.a0.warnMax) unusual.push(`section slope a0 ${fmt(s.a0)} per radian at y = ${fmt(s.y)} m`);
    range(f("alphaL0"), s.alphaL0, -P.alphaL0Deg.max, P.alphaL0Deg.max, " deg: beyond any section, even with a flap down");
    if (Math.abs(s.alphaL0) > P.alphaL0Deg.warnMax && Math.abs(s.alphaL0) <= P.alphaL0Deg.max) unusual.push(`zero-lift angle ${fmt(s.alphaL0)}° at y = ${fmt(s.y)} m`);
    range(f("cmAc"), s.cmAc, P.cmAc.min, P.cmAc.max, ": beyond any section, even with a flap down");
    if ((s.cmAc < P.cmAc.warnMin && s.cmAc >= P.cmAc.min) || (s.cmAc > P.cmAc.warnMax && s.cmAc <= P.cmAc.max)) unusual.push(`cmAc ${fmt(s.cmAc)} at y = ${fmt(s.y)} m`);
    if (s.clMax !== undefined) {
      if (s.clMax > P.clMax.max) refusals.push({ field: f("clMax"), message: `${fmt(s.clMax)} is more than ${P.clMax.max}, beyond any section` });
      else if (s.clMax < P.clMax.warnMin || s.clMax > P.clMax.warnMax) unusual.push(`clMax ${fmt(s.clMax)} at y = ${fmt(s.y)} m`);
    }
    if (s.cpMin !== undefined) {
      if (s.cpMin < P.cpMin.min) refusals.push({ field: f("cpMin"), message: `${fmt(s.cpMin)} is below ${P.cpMin.min}, beyond any attached-flow suction peak` });
      else if (s.cpMin < P.cpMin.warnMin) unusual.push(`cpMin ${fmt(s.cpMin)} at y = ${fmt(s.y)} m (critical Mach number below about 0.4)`);
    }
  });
  const last = stations.length - 1;
  const s = stations[last].y;
  if (s < P.semispan.min || s > P.semispan.max) {
    refusals.push({ field: `wing.stations[${last}].y`, message: `a semispan of ${fmt(s)} m is outside ${P.semispan.min} to ${P.semispan.max} m` });
  } else if (s < P.semispan.warnMin || s > P.semispan.warnMax) unusual.push(`semispan ${fmt(s)} m`);
  if (refusals.length === 0) {
    const g = wingGeometry(stations);
    if (g.aspectRatio < P.aspectRatio.min || g.aspectRatio > P.aspectRatio.max) {
      refusals.push({
        field: "wing.stations",
        message: `the aspect ratio b²/S = ${fmt(g.aspectRatio)} is outside ${P.aspectRatio.min} to ${P.aspectRatio.max}: check the chords against the span`,
      });
    } else if (g.aspectRatio < P.aspectRatio.warnMin || g.aspectRatio > P.aspectRatio.warnMax) {
      unusual.push(`aspect ratio ${fmt(g.aspectRatio)} (the methods are checked from 3 to 40)`);
    }
    g.panels.forEach((p, i) => {
      const sw = Math.abs(p.sweepQuarterChordDeg);
      if (sw > P.sweepDeg.max) {
        refusals.push({
          field: `wing.stations[${i + 1}].xLe`,
          message: `gives panel ${i + 1} a quarter-chord sweep of ${p.sweepQuarterChordDeg.toFixed(1)}°, beyond ${P.sweepDeg.max}°: such a wing lifts by leading-edge vortices, which the linear methods do not model`,
        });
      } else if (sw > P.sweepDeg.warnMax) unusual.push(`quarter-chord sweep ${p.sweepQuarterChordDeg.toFixed(1)}° on panel ${i + 1}`);
    });
  }
  if (unusual.length) warnings.push(`unusual input, check it: ${unusual.join("; ")}`);
  return { refusals, warnings };
}
