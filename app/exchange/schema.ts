import { z } from "zod";
import { ISA_MAX_ALTITUDE, ISA_MIN_ALTITUDE } from "../engine/atmosphere";
import type { EnvelopeRow } from "../engine/envelope";
import { PLAUSIBLE, wingPlausibility } from "../engine/plausibility";
import { VORTEX_LATTICE_MAX_STRIPS } from "../engine/vortex-lattice";

/** Schema identifiers of the exchange contract (docs: /work/shared/CASE-EXCHANGE.md). */
export const CASE_SCHEMA_ID = "spanwright.case/1";
export const RESULT_SCHEMA_ID = "spanwright.result/1";

/** Output station count limits per semispan. */
export const MIN_OUTPUT_STATIONS = 2;
export const MAX_OUTPUT_STATIONS = 400;
/** Fewest vortex-lattice strips per semispan accepted in `method.strips`. */
export const MIN_STRIPS = 8;

const typeError = (what: string) => (iss: { input?: unknown }) =>
  iss.input === undefined ? "is required" : typeof iss.input === "number" && !Number.isFinite(iss.input) ? `must be a finite number (got ${iss.input})` : `must be ${what}`;
const num = () => z.number({ error: typeError("a number") });

export const StationSchema = z.strictObject({
  y: num().min(0, { error: "must be 0 or more (m from the plane of symmetry)" }),
  xLe: num(),
  chord: num().gt(0, { error: "must be greater than 0" }),
  twist: num(),
  a0: num().gt(0, { error: "must be greater than 0 (per radian)" }),
  alphaL0: num(),
  cmAc: num(),
  clMax: num().gt(0, { error: "must be greater than 0" }).optional(),
  cpMin: num().lt(0, { error: "must be below 0 (a suction peak)" }).optional(),
});

const fraction = num().min(0, { error: "must be between 0 and 1 (a chord fraction)" }).max(1, {
  error: "must be between 0 and 1 (a chord fraction)",
});

export const AxisSchema = z.strictObject({
  rootChordFraction: fraction.default(0.25),
  tipChordFraction: fraction.default(0.25),
});

const massRule = `must be at most ${PLAUSIBLE.massKg.max.toExponential(0)} kg (one semispan; the heaviest aeroplane built weighs about 6.4e+5 kg)`;

const itemId = z.string({ error: typeError("a string") }).min(1, { error: "must not be empty" });

/**
 * One mass item of a semispan: a point mass `{ id, kg, x, y }` or a mass spread evenly over a span
 * range `{ id, kg, x, yFrom, yTo }`. One object schema with the position fields optional keeps every
 * refusal naming its field (a union would only say "no match").
 */
export const MassItemSchema = z
  .strictObject({
    id: itemId,
    kg: num().min(0, { error: "must be 0 or more (kg)" }).max(PLAUSIBLE.massKg.max, { error: massRule }),
    x: num(),
    y: num().optional(),
    yFrom: num().optional(),
    yTo: num().optional(),
  })
  .superRefine((it, ctx) => {
    const point = it.y !== undefined;
    const spread = it.yFrom !== undefined || it.yTo !== undefined;
    if (point && spread) {
      ctx.addIssue({ code: "custom", path: ["y"], message: "give either y (a point mass) or yFrom with yTo (a spread mass), not both" });
    } else if (!point && !spread) {
      ctx.addIssue({ code: "custom", path: ["y"], message: "is required: give y (a point mass) or yFrom with yTo (a spread mass)" });
    } else if (spread && (it.yFrom === undefined || it.yTo === undefined)) {
      ctx.addIssue({ code: "custom", path: [it.yFrom === undefined ? "yFrom" : "yTo"], message: "is required with the other of yFrom and yTo" });
    } else if (spread && !(it.yTo! > it.yFrom!)) {
      ctx.addIssue({ code: "custom", path: ["yTo"], message: "must be greater than yFrom" });
    }
  });

export const MassSchema = z
  .strictObject({
    kg: num().gt(0, { error: "must be greater than 0 (kg, one semispan)" }).max(PLAUSIBLE.massKg.max, { error: massRule }).optional(),
    distribution: z.literal("chord", { error: 'must be "chord" (mass spread in proportion to chord)' }).default("chord"),
    items: z.array(MassItemSchema).optional(),
  })
  .superRefine((m, ctx) => {
    if (m.kg === undefined && !m.items?.length) {
      ctx.addIssue({ code: "custom", path: ["kg"], message: "is required where no items are given" });
    }
    const seen = new Set<string>();
    m.items?.forEach((it, i) => {
      if (seen.has(it.id)) ctx.addIssue({ code: "custom", path: ["items", i, "id"], message: `must be unique ("${it.id}" repeats)` });
      seen.add(it.id);
    });
  });

/** A named mass state: fill factor (0–1) per item id; items not named count fully. */
export const MassCaseSchema = z.strictObject({
  id: itemId,
  fill: z.record(z.string(), num().min(0, { error: "must be between 0 and 1 (a fill factor)" }).max(1, { error: "must be between 0 and 1 (a fill factor)" })),
});

/**
 * The flaps extended: their span range and the increments they give the incompressible section data
 * there (the engine's flappedStations). Only cases with `flaps: true` are solved on the flapped wing.
 */
export const FlapsSchema = z.strictObject({
  yFrom: num().min(0, { error: "must be 0 or more (m from the plane of symmetry)" }),
  yTo: num(),
  dAlphaL0: num()
    .min(-PLAUSIBLE.alphaL0Deg.max, { error: `must be within ±${PLAUSIBLE.alphaL0Deg.max}° (a change of the section zero-lift angle)` })
    .max(PLAUSIBLE.alphaL0Deg.max, { error: `must be within ±${PLAUSIBLE.alphaL0Deg.max}° (a change of the section zero-lift angle)` }),
  dCmAc: num()
    .min(-PLAUSIBLE.cmAc.max, { error: `must be within ±${PLAUSIBLE.cmAc.max} (a change of the section moment coefficient)` })
    .max(PLAUSIBLE.cmAc.max, { error: `must be within ±${PLAUSIBLE.cmAc.max} (a change of the section moment coefficient)` }),
  clMax: num().gt(0, { error: "must be greater than 0" }).optional(),
});

const deflectionRule = "must be between 0 and 40 (deg)";

/**
 * The aileron of the rolling conditions: its span range, the section increments of one degree of
 * down-going deflection (lift by strip theory, moment about the quarter chord) and the full deflection
 * at V_A the application generates the rolling cases from. Only cases with `roll` use it.
 */
export const AileronSchema = z.strictObject({
  yFrom: num().min(0, { error: "must be 0 or more (m from the plane of symmetry)" }),
  yTo: num(),
  dClPerDeg: num()
    .min(0, { error: "must be 0 to 0.2 per degree (a section lift slope of 2π per radian is 0.11 per degree)" })
    .max(0.2, { error: "must be 0 to 0.2 per degree (a section lift slope of 2π per radian is 0.11 per degree)" }),
  dCmPerDeg: num()
    .min(-0.05, { error: "must be between −0.05 and 0 per degree (a down-going aileron pitches the section nose down)" })
    .max(0, { error: "must be between −0.05 and 0 per degree (a down-going aileron pitches the section nose down)" })
    .default(-0.01),
  deltaAtVa: num().gt(0, { error: "must be above 0 and at most 40 (deg)" }).max(40, { error: "must be above 0 and at most 40 (deg)" }),
});

/** A rolling or unsymmetrical case: the airload fraction on the other side and the aileron deflection. */
export const RollSchema = z.strictObject({
  fraction: num().gt(0, { error: "must be above 0 and at most 1 (the other side's share of the symmetric airload)" }).max(1, {
    error: "must be above 0 and at most 1 (the other side's share of the symmetric airload)",
  }),
  aileron: num().min(0, { error: deflectionRule }).max(40, { error: deflectionRule }).default(0),
});

export const WingSchema = z
  .strictObject({
    stations: z.array(StationSchema).min(2, { error: "needs at least 2 stations (root and tip)" }),
    axis: AxisSchema.default({ rootChordFraction: 0.25, tipChordFraction: 0.25 }),
    mass: MassSchema.optional(),
    flaps: FlapsSchema.optional(),
    aileron: AileronSchema.optional(),
  })
  .superRefine((w, ctx) => {
    w.stations.forEach((s, i) => {
      if (i === 0 && s.y !== 0) {
        ctx.addIssue({ code: "custom", path: ["stations", 0, "y"], message: "the first station must be at y = 0 (the root)" });
      }
      if (i > 0 && !(s.y > w.stations[i - 1].y)) {
        ctx.addIssue({
          code: "custom",
          path: ["stations", i, "y"],
          message: `must be greater than the previous station's y (${w.stations[i - 1].y}); y is strictly increasing`,
        });
      }
    });
    const semispan = w.stations[w.stations.length - 1]?.y ?? 0;
    const inside = `must lie inside the semispan, 0 to ${semispan} m`;
    if (w.flaps && !(w.flaps.yFrom < semispan)) ctx.addIssue({ code: "custom", path: ["flaps", "yFrom"], message: inside });
    if (w.flaps && !(w.flaps.yTo > w.flaps.yFrom && w.flaps.yTo <= semispan)) {
      ctx.addIssue({ code: "custom", path: ["flaps", "yTo"], message: `must be greater than yFrom and at most the semispan ${semispan} m` });
    }
    if (w.aileron && !(w.aileron.yFrom < semispan)) ctx.addIssue({ code: "custom", path: ["aileron", "yFrom"], message: inside });
    if (w.aileron && !(w.aileron.yTo > w.aileron.yFrom && w.aileron.yTo <= semispan)) {
      ctx.addIssue({ code: "custom", path: ["aileron", "yTo"], message: `must be greater than yFrom and at most the semispan ${semispan} m` });
    }
    // Streamwise: within a few of the largest chords of the wing's leading and trailing edges.
    const cMax = Math.max(...w.stations.map((s) => s.chord));
    const xFront = Math.min(...w.stations.map((s) => s.xLe)) - PLAUSIBLE.massItemXChords.max * cMax;
    const xBack = Math.max(...w.stations.map((s) => s.xLe + s.chord)) + PLAUSIBLE.massItemXChords.max * cMax;
    w.mass?.items?.forEach((it, i) => {
      for (const k of ["y", "yFrom", "yTo"] as const) {
        const v = it[k];
        if (v !== undefined && !(v >= 0 && v <= semispan)) ctx.addIssue({ code: "custom", path: ["mass", "items", i, k], message: inside });
      }
      if (w.stations.length && !(it.x >= xFront && it.x <= xBack)) {
        ctx.addIssue({
          code: "custom",
          path: ["mass", "items", i, "x"],
          message: `must lie within ${PLAUSIBLE.massItemXChords.max} of the largest chords (${Number(cMax.toPrecision(4))} m) of the wing, ${Number(xFront.toPrecision(6))} to ${Number(xBack.toPrecision(6))} m (streamwise, same origin as xLe)`,
        });
      }
    });
    // Plausible ranges (docs/engine.md). A malformed station list (chord or a0 not above 0, y out of
    // order) is named by the field rules above already: the range check then has nothing to add.
    for (const r of wingPlausibility(w.stations).refusals) {
      if (r.malformed) return;
      ctx.addIssue({ code: "custom", path: r.field.replace(/^wing\./, "").split(/[.[\]]+/).filter(Boolean).map((k) => (/^\d+$/.test(k) ? Number(k) : k)), message: r.message });
    }
  });

export const MethodSchema = z.strictObject({
  compressibility: z
    .enum(["prandtl-glauert", "karman-tsien", "laitone"], {
      error: 'must be "prandtl-glauert", "karman-tsien" or "laitone"',
    })
    .default("prandtl-glauert"),
  spanwise: z
    .enum(["lifting-line", "vortex-lattice"], { error: 'must be "lifting-line" or "vortex-lattice"' })
    .default("vortex-lattice"),
  stations: z
    .int({ error: typeError("a whole number") })
    .min(MIN_OUTPUT_STATIONS, { error: `must be at least ${MIN_OUTPUT_STATIONS}` })
    .max(MAX_OUTPUT_STATIONS, { error: `must be at most ${MAX_OUTPUT_STATIONS}` })
    .default(40),
  output: z.enum(["full", "summary"], { error: 'must be "full" or "summary"' }).default("full"),
  strips: z
    .int({ error: typeError("a whole number") })
    .min(MIN_STRIPS, { error: `must be at least ${MIN_STRIPS} (the convergence estimate compares with half as many)` })
    .max(VORTEX_LATTICE_MAX_STRIPS, { error: `must be at most ${VORTEX_LATTICE_MAX_STRIPS}` })
    .optional(),
});

const alphaRule = `must be within ±${PLAUSIBLE.alphaDeg.max}° (beyond it the linear, attached-flow methods mean nothing)`;
const nzRule = `must be within ±${PLAUSIBLE.nz.max} (more than any aircraft structure is designed for)`;
const tailRule = `must be within ±${PLAUSIBLE.tailLoad.max.toExponential(0)} N (no larger than the heaviest weight accepted)`;
const altitudeRule = `must be between ${ISA_MIN_ALTITUDE} and ${ISA_MAX_ALTITUDE} m (geopotential, standard atmosphere range)`;

export const CaseSchema = z.strictObject({
  id: z.string({ error: typeError("a string") }).min(1, { error: "must not be empty" }),
  mach: num()
    .min(0, { error: "must be 0 or more" })
    .lt(1, { error: "must be below 1 (subsonic rules only)" }),
  altitude: num().min(ISA_MIN_ALTITUDE, { error: altitudeRule }).max(ISA_MAX_ALTITUDE, { error: altitudeRule }),
  alpha: num()
    .min(-PLAUSIBLE.alphaDeg.max, { error: alphaRule })
    .max(PLAUSIBLE.alphaDeg.max, { error: alphaRule })
    .optional(),
  weight: num()
    .gt(0, { error: "must be greater than 0 (N, whole aircraft)" })
    .max(PLAUSIBLE.weight.max, { error: `must be at most ${PLAUSIBLE.weight.max.toExponential(0)} N (about 2000 t, three times the heaviest aeroplane built)` })
    .optional(),
  nz: num()
    .min(-PLAUSIBLE.nz.max, { error: nzRule })
    .max(PLAUSIBLE.nz.max, { error: nzRule })
    .optional(),
  massCase: z.string({ error: typeError("a string") }).optional(),
  tailLoad: num()
    .min(-PLAUSIBLE.tailLoad.max, { error: tailRule })
    .max(PLAUSIBLE.tailLoad.max, { error: tailRule })
    .optional(),
  flaps: z.boolean({ error: "must be true or false" }).optional(),
  roll: RollSchema.optional(),
});

/** The document's members; CaseFileSchema adds the rules between them (caseFileIssues). */
const CaseFileObject = z.strictObject({
  schema: z.literal(CASE_SCHEMA_ID, { error: `must be "${CASE_SCHEMA_ID}"` }),
  title: z.string({ error: typeError("a string") }).optional(),
  wing: WingSchema,
  method: MethodSchema.default({
    compressibility: "prandtl-glauert",
    spanwise: "vortex-lattice",
    stations: 40,
    output: "full",
  }),
  massCases: z.array(MassCaseSchema).optional(),
  cases: z.array(CaseSchema).min(1, { error: "needs at least 1 case" }),
});

export const CaseFileSchema = CaseFileObject.superRefine((file, ctx) => {
  for (const issue of caseFileIssues(file)) ctx.addIssue({ code: "custom", ...issue });
});

/** Every member of the document but its cases, with their own rules (parseCase's fast path checks the cases itself). */
export const CaseFileHeadSchema = CaseFileObject.omit({ cases: true });

/** The rules between the members of a document whose members are each valid: references, uniqueness, combinations. */
export function caseFileIssues(file: z.output<typeof CaseFileObject>): { path: (string | number)[]; message: string }[] {
  const out: { path: (string | number)[]; message: string }[] = [];
  if (file.method.strips !== undefined && file.method.spanwise === "lifting-line") {
    out.push({ path: ["method", "strips"], message: 'applies to the vortex lattice only; leave it out with "spanwise": "lifting-line"' });
  }
  const items = new Set((file.wing.mass?.items ?? []).map((it) => it.id));
  const massCases = new Set<string>();
  file.massCases?.forEach((mc, i) => {
    if (massCases.has(mc.id)) out.push({ path: ["massCases", i, "id"], message: `must be unique ("${mc.id}" repeats)` });
    massCases.add(mc.id);
    for (const id of Object.keys(mc.fill)) {
      if (!items.has(id)) out.push({ path: ["massCases", i, "fill", id], message: `names no item of wing.mass.items ("${id}")` });
    }
  });
  const seen = new Set<string>();
  file.cases.forEach((c, i) => {
    if (c.flaps && !file.wing.flaps) out.push({ path: ["cases", i, "flaps"], message: "needs wing.flaps (the flapped span and its section increments)" });
    if (c.roll && c.alpha !== undefined) {
      out.push({ path: ["cases", i, "roll"], message: "is only for a case given by weight and nz (each side keeps the inertia relief of the load factor)" });
    }
    if (c.roll && c.roll.aileron > 0 && !file.wing.aileron) {
      out.push({ path: ["cases", i, "roll", "aileron"], message: "needs wing.aileron (its span and increments) for a deflection above 0" });
    }
    if (c.massCase !== undefined && !massCases.has(c.massCase)) {
      out.push({ path: ["cases", i, "massCase"], message: `names no mass case of massCases ("${c.massCase}")` });
    }
    if (c.tailLoad !== undefined && c.alpha !== undefined) {
      out.push({ path: ["cases", i, "tailLoad"], message: "is only for a case given by weight and nz (a trimmed case)" });
    }
    const hasAlpha = c.alpha !== undefined;
    const hasW = c.weight !== undefined;
    const hasN = c.nz !== undefined;
    if (hasAlpha && (hasW || hasN)) {
      out.push({
        path: ["cases", i, hasW ? "weight" : "nz"],
        message: "give either alpha or weight with nz, not both",
      });
    } else if (!hasAlpha && !(hasW && hasN)) {
      out.push({
        path: ["cases", i, hasW ? "nz" : hasN ? "weight" : "alpha"],
        message: hasW || hasN ? "is required with the other of weight and nz" : "is required: give either alpha or weight with nz",
      });
    }
    if (hasW && hasN && !hasAlpha && !(c.mach > 0)) {
      out.push({ path: ["cases", i, "mach"], message: "must be above 0 for a case given by weight and nz (no dynamic pressure to trim)" });
    }
    if (seen.has(c.id)) out.push({ path: ["cases", i, "id"], message: `must be unique ("${c.id}" repeats)` });
    seen.add(c.id);
  });
  return out;
}

/**
 * A case as CaseSchema parses it, checked without zod: the same object (members in the schema's order)
 * where the case is a plain object holding only valid members and no `roll`; undefined for anything
 * else, which CaseSchema then judges and names. 100 000 cases take tens of milliseconds this way
 * instead of hundreds; every rule is CaseSchema's (schema-fast-path.test.ts holds the two together).
 */
export function plainCase(c: unknown): LoadCaseInput | undefined {
  if (typeof c !== "object" || c === null || Object.getPrototypeOf(c) !== Object.prototype) return undefined;
  const { id, mach, altitude, alpha, weight, nz, massCase, tailLoad, flaps, roll } = c as Record<string, unknown>;
  const P = PLAUSIBLE;
  if (typeof id !== "string" || id.length < 1) return undefined;
  if (typeof mach !== "number" || !(mach >= 0 && mach < 1)) return undefined;
  if (typeof altitude !== "number" || !(altitude >= ISA_MIN_ALTITUDE && altitude <= ISA_MAX_ALTITUDE)) return undefined;
  if (roll !== undefined) return undefined;
  const out: LoadCaseInput = { id, mach, altitude };
  let members = 3;
  if (alpha !== undefined) {
    if (typeof alpha !== "number" || !(alpha >= -P.alphaDeg.max && alpha <= P.alphaDeg.max)) return undefined;
    out.alpha = alpha;
    members++;
  }
  if (weight !== undefined) {
    if (typeof weight !== "number" || !(weight > 0 && weight <= P.weight.max)) return undefined;
    out.weight = weight;
    members++;
  }
  if (nz !== undefined) {
    if (typeof nz !== "number" || !(nz >= -P.nz.max && nz <= P.nz.max)) return undefined;
    out.nz = nz;
    members++;
  }
  if (massCase !== undefined) {
    if (typeof massCase !== "string") return undefined;
    out.massCase = massCase;
    members++;
  }
  if (tailLoad !== undefined) {
    if (typeof tailLoad !== "number" || !(tailLoad >= -P.tailLoad.max && tailLoad <= P.tailLoad.max)) return undefined;
    out.tailLoad = tailLoad;
    members++;
  }
  if (flaps !== undefined) {
    if (typeof flaps !== "boolean") return undefined;
    out.flaps = flaps;
    members++;
  }
  // Any other member (unknown, or one present as undefined) is for CaseSchema to name.
  let keys = 0;
  for (const _key in c) keys++;
  return keys === members ? out : undefined;
}

/** A parsed, defaulted `spanwright.case/1` document. */
export type CaseFile = z.output<typeof CaseFileSchema>;
/** The input as written (defaults optional). */
export type CaseFileInput = z.input<typeof CaseFileSchema>;
export type LoadCaseInput = z.output<typeof CaseSchema>;

/** One station row of a result case. */
export interface ResultStation {
  y: number;
  chord: number;
  cl: number;
  cm: number;
  lift: number;
  shear: number;
  bending: number;
  torsion: number;
}

export interface ResultRootLoads {
  shear: number;
  bending: number;
  torsion: number;
}

export interface ResultCase {
  id: string;
  mach: number;
  altitude: number;
  beta: number;
  dynamicPressure: number;
  alpha: number;
  cl: number;
  clAlpha: number;
  machCritical: number | null;
  regime: "subcritical" | "supercritical" | "unchecked";
  warnings: string[];
  /** Absent when `method.output` is `summary`. */
  stations?: ResultStation[];
  root: ResultRootLoads;
  /**
   * A rolling case (`cases[].roll`): `stations` and `root` above are the loaded side's (full airload, down-going
   * aileron; `cl`, `cm` and `lift` those of the symmetric condition), `other` the other side's net loads.
   */
  roll?: ResultRoll;
}

/** The other side of a rolling case: its airload fraction and aileron deflection, and its net loads. */
export interface ResultRoll {
  fraction: number;
  aileron: number;
  other: { stations?: { y: number; shear: number; bending: number; torsion: number }[]; root: ResultRootLoads };
}

/** One envelope station of the result: the engine's envelope rows are exactly the contract's. */
export type ResultEnvelopeStation = EnvelopeRow;

/** What the engine used, as the result states it. */
export interface ResultMethod {
  compressibility: CaseFile["method"]["compressibility"];
  spanwise: CaseFile["method"]["spanwise"];
  /** Vortex-lattice strips per semispan used (null for the lifting line). */
  strips: number | null;
  /** Lifting-line Fourier terms used (null for the vortex lattice). */
  terms: number | null;
  stations: number;
  output: CaseFile["method"]["output"];
  /**
   * Convergence estimate: the relative change of CLα, of the root bending moment per unit CL and of
   * the additional loading when the solve is repeated with half the strips (terms), the largest over
   * the lowest and highest Mach numbers solved.
   */
  convergence: { halfResolution: number; clAlpha: number; rootBending: number; loading: number };
  /**
   * How the section data were made compressible at the stations: Prandtl–Glauert's 1/β; the
   * Kármán–Tsien or Laitone ratio at each section's single cpMin; the rule point by point over the
   * section's chordwise pressures (richer section data); or a mix over the span.
   */
  sectionScaling: "prandtl-glauert" | "at-cp-min" | "point-by-point" | "mixed";
  /**
   * What the critical Mach numbers rest on: one cpMin per section whose lift is not stated, one at a
   * stated lift, Cp,min against lift (each case at its own lift), none, or a mix over the span.
   */
  criticalMach: "single-cp-min" | "single-cp-min-at-stated-lift" | "cp-min-against-lift" | "unchecked" | "mixed";
  /**
   * Null where every distinct Mach number got its own solve; for sweeps of more distinct Mach numbers,
   * the grid they were interpolated on: distinct Mach numbers of the file, grid nodes, solves made,
   * the largest interpolation error found against direct solves in the middle of every interval (as a
   * fraction of the loads at CL = 1), the tolerance it is held under, and the Mach ranges solved directly.
   */
  machGrid: { machs: number; nodes: number; solves: number; maxError: number; tolerance: number; directRanges: [number, number][] } | null;
}

/** The `spanwright.result/1` document. */
export interface CaseResult {
  schema: typeof RESULT_SCHEMA_ID;
  engine: string;
  method: ResultMethod;
  wing: {
    area: number;
    span: number;
    aspectRatio: number;
    taperRatio: number;
    mac: number;
    yMac: number;
    xLeMac: number;
  };
  cases: ResultCase[];
  envelope: ResultEnvelopeStation[];
}

const n = () => z.number();

/**
 * The `spanwright.result/1` document as a zod schema (for the published JSON Schema), kept in step
 * with the TypeScript type by `satisfies`.
 */
export const CaseResultSchema = z.object({
  schema: z.literal(RESULT_SCHEMA_ID),
  engine: z.string(),
  method: z.object({
    compressibility: MethodSchema.shape.compressibility.unwrap(),
    spanwise: MethodSchema.shape.spanwise.unwrap(),
    strips: n().nullable(),
    terms: n().nullable(),
    stations: n(),
    output: MethodSchema.shape.output.unwrap(),
    convergence: z.object({ halfResolution: n(), clAlpha: n(), rootBending: n(), loading: n() }),
    sectionScaling: z.enum(["prandtl-glauert", "at-cp-min", "point-by-point", "mixed"]),
    criticalMach: z.enum(["single-cp-min", "single-cp-min-at-stated-lift", "cp-min-against-lift", "unchecked", "mixed"]),
    machGrid: z
      .object({ machs: n(), nodes: n(), solves: n(), maxError: n(), tolerance: n(), directRanges: z.array(z.tuple([n(), n()])) })
      .nullable(),
  }),
  wing: z.object({ area: n(), span: n(), aspectRatio: n(), taperRatio: n(), mac: n(), yMac: n(), xLeMac: n() }),
  cases: z.array(
    z.object({
      id: z.string(),
      mach: n(),
      altitude: n(),
      beta: n(),
      dynamicPressure: n(),
      alpha: n(),
      cl: n(),
      clAlpha: n(),
      machCritical: n().nullable(),
      regime: z.enum(["subcritical", "supercritical", "unchecked"]),
      warnings: z.array(z.string()),
      stations: z.array(z.object({ y: n(), chord: n(), cl: n(), cm: n(), lift: n(), shear: n(), bending: n(), torsion: n() })).optional(),
      root: z.object({ shear: n(), bending: n(), torsion: n() }),
      roll: z
        .object({
          fraction: n(),
          aileron: n(),
          other: z.object({
            stations: z.array(z.object({ y: n(), shear: n(), bending: n(), torsion: n() })).optional(),
            root: z.object({ shear: n(), bending: n(), torsion: n() }),
          }),
        })
        .optional(),
    }),
  ),
  envelope: z.array(
    z.object({
      y: n(),
      shearMax: n(), shearMaxCase: z.string(), shearMin: n(), shearMinCase: z.string(),
      bendingMax: n(), bendingMaxCase: z.string(), bendingMin: n(), bendingMinCase: z.string(),
      torsionMax: n(), torsionMaxCase: z.string(), torsionMin: n(), torsionMinCase: z.string(),
    }),
  ),
}) satisfies z.ZodType<CaseResult>;
