import type { EnvelopeRow } from "~/engine";
import { STEPS } from "./steps";
import type { StepKey } from "./vocabulary";

/*
 * Two issued versions of a case's report side by side, from their frozen snapshots alone: every
 * input that changed, step by step and field by field, and the change in the root loads and in the
 * envelope's extremes at each station. Pure and plain JSON, so the page shows it, the next report
 * prints it, and a comparison PDF of any two versions is drawn from the same object.
 */

/** What a comparison needs of a report snapshot (ReportSnapshot satisfies it). */
export interface ComparedSnapshot {
  reportNumber: string;
  version: number;
  issuedAt: string;
  inputHash: string;
  engineVersion: string;
  inputs: Record<string, unknown>;
  result: { envelope: EnvelopeRow[]; cases: { id: string; root: { shear: number; bending: number; torsion: number } }[] };
}

/** One changed input: where it is and its value before and after, as stored (SI units). */
export interface InputChange {
  step: StepKey;
  /** Field path in words, e.g. "stations › row 3 › chord", "cases › W7-A › nz". */
  field: string;
  before: string;
  after: string;
}

export const ENVELOPE_EXTREMES = ["shearMax", "shearMin", "bendingMax", "bendingMin", "torsionMax", "torsionMin"] as const;
export type EnvelopeExtreme = (typeof ENVELOPE_EXTREMES)[number];

export const EXTREME_LABELS: Record<EnvelopeExtreme, string> = {
  shearMax: "Shear max",
  shearMin: "Shear min",
  bendingMax: "Bending max",
  bendingMin: "Bending min",
  torsionMax: "Torsion max",
  torsionMin: "Torsion min",
};

/** The envelope's six extremes at one station of the newer version, before and after (N, N·m). */
export interface StationChange {
  y: number;
  before: Record<EnvelopeExtreme, number>;
  after: Record<EnvelopeExtreme, number>;
  /** The cases giving each extreme, before and after. */
  casesBefore: Record<EnvelopeExtreme, string>;
  casesAfter: Record<EnvelopeExtreme, string>;
}

export interface VersionLabel {
  reportNumber: string;
  version: number;
  issuedAt: string;
  inputHash: string;
  engineVersion: string;
}

export interface ReportComparison {
  from: VersionLabel;
  to: VersionLabel;
  inputs: InputChange[];
  /** The envelope at the newer version's stations; the older one's read there by linear interpolation where its stations differ. */
  stations: StationChange[];
  /** True where the two versions' output stations differ (the older envelope was interpolated). */
  interpolated: boolean;
  /** Both envelopes as issued, for an overlay chart. */
  envelopes: { before: EnvelopeRow[]; after: EnvelopeRow[] };
  /** Load cases only in one of the two versions. */
  casesAdded: string[];
  casesRemoved: string[];
}

// Numbers to 12 significant figures: a stored −0.57 computed as −0.59 + 0.02 shows as −0.57, not
// −0.5700000000000001, while any difference a person typed still shows.
const tidy = (v: number) => (Number.isFinite(v) ? Number(v.toPrecision(12)) : v);

/** A value as the comparison shows it. */
function show(v: unknown): string {
  if (v === undefined) return "(none)";
  if (v === null) return "(empty)";
  if (typeof v === "number") return String(tidy(v));
  if (typeof v === "string") return v === "" ? "(empty)" : v;
  if (typeof v === "boolean") return v ? "yes" : "no";
  return JSON.stringify(v, (_k, x: unknown) => (typeof x === "number" ? tidy(x) : x));
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/** Key of an array element: its id where every element has one (rows matched by id), else its position. */
function keyed(list: unknown[]): Map<string, unknown> | null {
  if (!list.every((x) => isObject(x) && typeof x.id === "string")) return null;
  return new Map(list.map((x) => [(x as { id: string }).id, x]));
}

/** Every leaf that differs between a and b, with its path in words. */
function diff(a: unknown, b: unknown, path: string[], out: { field: string; before: string; after: string }[]) {
  if (Array.isArray(a) && Array.isArray(b)) {
    const ka = keyed(a);
    const kb = keyed(b);
    if (ka && kb) {
      for (const [id, x] of ka) diff(x, kb.get(id), [...path, id], out);
      for (const [id, y] of kb) if (!ka.has(id)) diff(undefined, y, [...path, id], out);
      return;
    }
    const n = Math.max(a.length, b.length);
    for (let i = 0; i < n; i++) diff(a[i], b[i], [...path, `row ${i + 1}`], out);
    return;
  }
  if (isObject(a) && isObject(b)) {
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) diff(a[k], b[k], [...path, k], out);
    return;
  }
  // A whole row or object added or removed is one change, not one per field.
  if (a === b || (typeof a === "number" && typeof b === "number" && Object.is(a, b))) return;
  if (JSON.stringify(a) === JSON.stringify(b)) return;
  out.push({ field: path.join(" › "), before: show(a), after: show(b) });
}

/** Every input that differs between two snapshots' step data, in step order. */
export function inputChanges(older: Record<string, unknown>, newer: Record<string, unknown>): InputChange[] {
  const out: InputChange[] = [];
  for (const { key } of STEPS) {
    const rows: { field: string; before: string; after: string }[] = [];
    diff(older[key], newer[key], [], rows);
    for (const r of rows) out.push({ step: key, ...r, field: r.field || "(the whole step)" });
  }
  return out;
}

/** Linear interpolation of ys (at xs, increasing) at x; the end values beyond the ends. */
function interp(xs: number[], ys: number[], x: number): number {
  if (x <= xs[0]!) return ys[0]!;
  for (let i = 1; i < xs.length; i++) {
    if (x <= xs[i]!) {
      const t = (x - xs[i - 1]!) / (xs[i]! - xs[i - 1]!);
      return ys[i - 1]! + t * (ys[i]! - ys[i - 1]!);
    }
  }
  return ys[ys.length - 1]!;
}

const extremes = (row: EnvelopeRow) => Object.fromEntries(ENVELOPE_EXTREMES.map((k) => [k, row[k]])) as Record<EnvelopeExtreme, number>;
const givers = (row: EnvelopeRow) => Object.fromEntries(ENVELOPE_EXTREMES.map((k) => [k, row[`${k}Case`]])) as Record<EnvelopeExtreme, string>;

/**
 * The comparison of an older and a newer issued version of one case's report.
 * The envelope change is taken at the newer version's output stations; where the older version's
 * stations differ (a changed span or station count), its envelope is interpolated linearly there and
 * `interpolated` says so.
 */
export function compareReports(older: ComparedSnapshot, newer: ComparedSnapshot): ReportComparison {
  const label = (s: ComparedSnapshot): VersionLabel => ({ reportNumber: s.reportNumber, version: s.version, issuedAt: s.issuedAt, inputHash: s.inputHash, engineVersion: s.engineVersion });
  const ea = older.result.envelope;
  const eb = newer.result.envelope;
  const same = ea.length === eb.length && ea.every((r, i) => Math.abs(r.y - eb[i]!.y) <= 1e-9 * Math.max(1, Math.abs(eb[eb.length - 1]!.y)));
  const ya = ea.map((r) => r.y);
  const stations: StationChange[] = eb.map((row, i) => {
    const before = same
      ? extremes(ea[i]!)
      : (Object.fromEntries(ENVELOPE_EXTREMES.map((k) => [k, ea.length ? interp(ya, ea.map((r) => r[k]), row.y) : Number.NaN])) as Record<EnvelopeExtreme, number>);
    const casesBefore = same ? givers(ea[i]!) : (Object.fromEntries(ENVELOPE_EXTREMES.map((k) => [k, "—"])) as Record<EnvelopeExtreme, string>);
    return { y: row.y, before, after: extremes(row), casesBefore, casesAfter: givers(row) };
  });
  const ids = (s: ComparedSnapshot) => new Set(s.result.cases.map((c) => c.id));
  const ia = ids(older);
  const ib = ids(newer);
  return {
    from: label(older),
    to: label(newer),
    inputs: inputChanges(older.inputs, newer.inputs),
    stations,
    interpolated: !same,
    envelopes: { before: ea, after: eb },
    casesAdded: [...ib].filter((id) => !ia.has(id)),
    casesRemoved: [...ia].filter((id) => !ib.has(id)),
  };
}
