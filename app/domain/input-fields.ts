import type { InputChange } from "./report-comparison";
import { formatNumber, fromSI, unitSymbol, type Quantity, type UnitSystem } from "./units";
import type { StepKey } from "./vocabulary";

/*
 * The stored inputs of each step in words: every key of the step data (app/domain/step-data.ts) with
 * its label and the quantity its numbers are (stored in SI), so a changed input reads "Load cases ›
 * W7-A › Altitude [ft]: 5 000 → 6 000", in the units shown, rather than "cases › W7-A › altitude".
 */

type Field = readonly [label: string, quantity: Quantity];

const FIELDS: Record<StepKey, Record<string, Field>> = {
  basis: {
    units: ["Units shown", "none"],
    category: ["Category", "none"],
    regulations: ["Regulation references", "none"],
    mtow: ["Max take-off weight", "mass"],
    mzfw: ["Max zero-fuel weight", "mass"],
    minWeight: ["Minimum design weight", "mass"],
    mlw: ["Max landing weight", "mass"],
    zmo: ["Max operating altitude Zmo", "altitude"],
    vs1: ["VS1", "speed"],
    va: ["VA", "speed"],
    vb: ["VB", "speed"],
    vc: ["VC", "speed"],
    vd: ["VD", "speed"],
    vf: ["VF", "speed"],
    clMaxFlaps: ["Aircraft CLmax with flaps", "none"],
    altitudes: ["Altitudes", "altitude"],
    wingArea: ["Wing reference area", "area"],
    clMax: ["Aircraft CLmax", "none"],
    clMaxNegative: ["Negative CLmax", "none"],
  },
  planform: {
    stations: ["Stations", "none"],
    y: ["y", "length"],
    xLe: ["Leading edge x", "length"],
    chord: ["Chord", "length"],
    twist: ["Twist", "angle"],
    axisRoot: ["Reference axis at the root (fraction of chord)", "none"],
    axisTip: ["Reference axis at the tip (fraction of chord)", "none"],
  },
  sections: {
    rows: ["Sections", "none"],
    y: ["y", "length"],
    a0: ["a0 [/rad]", "none"],
    alphaL0: ["αL0", "angle"],
    cmAc: ["cm,ac", "none"],
    clMax: ["clmax", "none"],
    cpMin: ["Cp,min", "none"],
    cpMinCl: ["cl of Cp,min", "none"],
    cpMinTable: ["Cp,min against lift", "none"],
    pressures: ["Chordwise pressures", "none"],
    tables: ["Polar tables", "none"],
    source: ["Source", "none"],
    flaps: ["Flaps", "none"],
    yFrom: ["Flaps from y", "length"],
    yTo: ["Flaps to y", "length"],
    dAlphaL0: ["Flap Δα0L", "angle"],
    dCmAc: ["Flap Δcm,ac", "none"],
  },
  masses: {
    structureKg: ["Semispan structural mass", "mass"],
    items: ["Mass items", "none"],
    massCases: ["Mass cases", "none"],
    label: ["Description", "none"],
    kg: ["Mass", "mass"],
    x: ["x of CG", "length"],
    y: ["y", "length"],
    yFrom: ["y from", "length"],
    yTo: ["y to", "length"],
    weight: ["Weight", "mass"],
    cg: ["CG (fraction of MAC)", "none"],
    fill: ["Fill factors", "none"],
    balance: ["Balance", "none"],
    cmBody: ["Wing–body Cm increment", "none"],
    tailArm: ["Tail arm", "length"],
    source: ["Source", "none"],
  },
  envelope: {
    compressibility: ["Compressibility rule", "none"],
    spanwise: ["Spanwise solver", "none"],
    stations: ["Output stations", "none"],
    strips: ["Strips", "none"],
    output: ["Output", "none"],
    cases: ["Load cases", "none"],
    kind: ["Kind", "none"],
    rule: ["From rule", "none"],
    mach: ["Mach", "none"],
    altitude: ["Altitude", "altitude"],
    alpha: ["α", "angle"],
    weight: ["Weight", "mass"],
    nz: ["nz", "none"],
    massCase: ["Mass case", "none"],
    tailLoad: ["Tail load", "force"],
    excluded: ["Excluded", "none"],
    flaps: ["Flaps extended", "none"],
  },
  distribution: {
    dispositions: ["Dispositions", "none"],
    action: ["Action", "none"],
    comment: ["Comment", "none"],
  },
  loads: {
    notes: ["Notes", "none"],
    semispanMass: ["Semispan structural mass", "mass"],
  },
};

const withUnit = (label: string, units: UnitSystem, q: Quantity) => (q === "none" ? label : `${label} [${unitSymbol(units, q)}]`);

/** A stored number (SI) in the unit shown, to six significant figures. */
const number = (units: UnitSystem, q: Quantity, si: number) => formatNumber(fromSI(units, q, si), 6);

/** A value of the comparison (a number, a list, a whole row as JSON, or words) in the units shown. */
function shownValue(text: string, step: StepKey, units: UnitSystem, q: Quantity): string {
  if (/^-?\d/.test(text) && Number.isFinite(Number(text))) return q === "none" ? text : number(units, q, Number(text));
  if (!text.startsWith("[") && !text.startsWith("{")) return text;
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    return text;
  }
  const value = (v: unknown, vq: Quantity): string =>
    typeof v === "number" ? (vq === "none" ? formatNumber(v, 6) : number(units, vq, v)) : Array.isArray(v) ? v.map((x) => value(x, vq)).join(", ") : typeof v === "object" && v !== null ? JSON.stringify(v) : String(v);
  if (Array.isArray(parsed)) return value(parsed, q);
  if (typeof parsed !== "object" || parsed === null) return text;
  // A whole row added or removed: each of its fields in words, with its unit.
  return Object.entries(parsed)
    .map(([k, v]) => {
      const [label, fq] = FIELDS[step][k] ?? [k, "none" as const];
      return `${withUnit(label, units, fq)}: ${value(v, fq)}`;
    })
    .join("; ");
}

/**
 * One changed input as a person reads it: the field path in words with the unit of its value, and
 * the values before and after in the units shown (the comparison stores them as stored, in SI).
 */
export function shownChange(change: InputChange, units: UnitSystem): { field: string; before: string; after: string } {
  const fields = FIELDS[change.step];
  const parts = change.field.split(" › ");
  // The quantity is the innermost named field's (a list's "row 2" or a case's id are not fields).
  const inner = [...parts].reverse().find((p) => Object.hasOwn(fields, p));
  const q: Quantity = inner ? fields[inner]![1] : "none";
  const field = parts.map((p) => (Object.hasOwn(fields, p) ? (p === inner ? withUnit(fields[p]![0], units, q) : fields[p]![0]) : p)).join(" › ");
  return { field, before: shownValue(change.before, change.step, units, q), after: shownValue(change.after, change.step, units, q) };
}
