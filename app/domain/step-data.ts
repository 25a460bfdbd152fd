import { z } from "zod";
import { CATEGORIES, COMPRESSIBILITY_RULES, SPANWISE_METHODS } from "./vocabulary";

/**
 * What each step of a case stores, in SI units (m, kg, N, m/s EAS, degrees). These schemas are the
 * one definition of the rules: the browser checks forms with them and every action re-checks.
 */

/** Most rows each step takes: its form refuses a row beyond these before building anything. */
export const MAX_PLANFORM_STATIONS = 60;
export const MAX_SECTION_ROWS = 60;
export const MAX_LOAD_CASES = 100_000;
/**
 * Station rows (load cases × output stations) a stored result may hold with `output: "full"`: about 226
 * bytes of JSON a row, so some 110 MB at most. A whole 100 000-case sweep in full would be 0.9 GB at 40
 * stations, past what one PostgreSQL jsonb value or one JavaScript string can hold; it is stored as a summary.
 */
export const MAX_STORED_STATION_ROWS = 500_000;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be a finite number` });
const positive = (what: string) => finite(what).refine((v) => v > 0, { message: `${what} must be positive` });

export const BasisSchema = z
  .object({
    units: z.enum(["SI", "US"], "Choose SI or US customary units"),
    category: z.enum(CATEGORIES, "Choose the category of the certification basis"),
    regulations: z.string().trim().min(3, "List the applicable regulation references").max(2000, "At most 2000 characters"),
    mtow: positive("Maximum design take-off weight"),
    mzfw: positive("Maximum zero-fuel weight"),
    minWeight: positive("Minimum design weight"),
    vs1: positive("VS1"),
    va: positive("VA"),
    /** Design speed for maximum gust intensity (Part 25, Part 23 commuter): gives the V_B gust points. */
    vb: positive("VB").optional(),
    /** Maximum landing weight and maximum operating altitude (Part 25): with both, the flight-profile alleviation factor of 25.341(a)(6). */
    mlw: positive("Maximum landing weight").optional(),
    zmo: positive("Maximum operating altitude").optional(),
    vc: positive("VC"),
    vd: positive("VD"),
    altitudes: z.array(finite("Altitude")).min(1, "Give at least one altitude").max(12, "At most 12 altitudes"),
    wingArea: positive("Wing reference area"),
    clMax: positive("Aircraft CLmax"),
    clMaxNegative: finite("Negative CLmax").refine((v) => v < 0, { message: "Negative CLmax must be below 0" }),
    /** Design flap speed (EAS) and the aircraft CLmax with the flaps extended: with both, the flaps-extended conditions (23.345 / 25.345). */
    vf: positive("VF").optional(),
    clMaxFlaps: positive("CLmax with flaps").optional(),
  })
  .superRefine((b, ctx) => {
    if (b.mzfw > b.mtow) ctx.addIssue({ code: "custom", path: ["mzfw"], message: "Maximum zero-fuel weight cannot exceed the take-off weight" });
    if (b.minWeight > b.mtow) ctx.addIssue({ code: "custom", path: ["minWeight"], message: "Minimum design weight cannot exceed the take-off weight" });
    if (!(b.vs1 < b.va)) ctx.addIssue({ code: "custom", path: ["va"], message: "VA must be above VS1" });
    if (!(b.va <= b.vc)) ctx.addIssue({ code: "custom", path: ["vc"], message: "VC must be at least VA" });
    if (b.vb !== undefined && !(b.vb > b.vs1 && b.vb <= b.vc)) ctx.addIssue({ code: "custom", path: ["vb"], message: "VB must lie above VS1 and not above VC" });
    if (b.mlw !== undefined && !(b.mlw <= b.mtow && b.mlw >= b.mzfw)) ctx.addIssue({ code: "custom", path: ["mlw"], message: "The maximum landing weight lies between the zero-fuel and the take-off weight" });
    if (!(b.vc < b.vd)) ctx.addIssue({ code: "custom", path: ["vd"], message: "VD must be above VC" });
    if ((b.vf === undefined) !== (b.clMaxFlaps === undefined)) {
      ctx.addIssue({ code: "custom", path: [b.vf === undefined ? "vf" : "clMaxFlaps"], message: "VF and the CLmax with flaps go together: give both for the flaps-extended conditions, or neither" });
    }
    if (b.vf !== undefined && !(b.vf > b.vs1 && b.vf < b.vd)) ctx.addIssue({ code: "custom", path: ["vf"], message: "VF must lie above VS1 and below VD" });
    b.altitudes.forEach((h, i) => {
      if (h < 0 || h > 20000) ctx.addIssue({ code: "custom", path: ["altitudes", i], message: "Altitudes must lie between 0 and 20 000 m (the standard atmosphere range of the engine)" });
    });
  });
export type BasisData = z.output<typeof BasisSchema>;

export const PlanformStationSchema = z.object({
  y: finite("y"),
  xLe: finite("Leading edge x"),
  chord: positive("Chord"),
  twist: finite("Twist").refine((v) => Math.abs(v) <= 20, { message: "Twist must lie within ±20°" }),
});

export const PlanformSchema = z
  .object({
    stations: z.array(PlanformStationSchema).min(2, "Give at least two stations: root and tip").max(MAX_PLANFORM_STATIONS, `At most ${MAX_PLANFORM_STATIONS} stations`),
    axisRoot: finite("Reference axis at the root").refine((v) => v >= 0 && v <= 1, { message: "The reference axis is a chord fraction between 0 and 1" }),
    axisTip: finite("Reference axis at the tip").refine((v) => v >= 0 && v <= 1, { message: "The reference axis is a chord fraction between 0 and 1" }),
  })
  .superRefine((p, ctx) => {
    p.stations.forEach((s, i) => {
      if (i === 0 && s.y !== 0) ctx.addIssue({ code: "custom", path: ["stations", 0, "y"], message: "The first station must be at y = 0 (the root)" });
      if (i > 0 && !(s.y > p.stations[i - 1]!.y)) {
        ctx.addIssue({ code: "custom", path: ["stations", i, "y"], message: `Station ${i + 1}: y must be greater than the station before (y increases from root to tip)` });
      }
    });
  });
export type PlanformData = z.output<typeof PlanformSchema>;

export const SectionRowSchema = z.object({
  y: finite("y").refine((v) => v >= 0, { message: "y must be 0 or more" }),
  a0: positive("Lift-curve slope a0"),
  alphaL0: finite("Zero-lift angle"),
  cmAc: finite("cm about the aerodynamic centre"),
  clMax: positive("clmax").optional(),
  cpMin: finite("Minimum Cp").refine((v) => v < 0, { message: "Minimum Cp must be below 0 (a suction peak)" }).optional(),
  /** The incompressible section cl at which cpMin holds (richer section data, docs/decisions/009). */
  cpMinCl: finite("Lift of Cp,min").refine((v) => Math.abs(v) <= 5, { message: "The lift of Cp,min is a section cl between −5 and 5" }).optional(),
  /** Incompressible minimum Cp against section cl, from a polar with Cp,min per angle (richer section data). */
  cpMinTable: z.array(z.object({ cl: finite("cl"), cpMin: finite("Cp,min") })).optional(),
  /** Incompressible chordwise Cp at two or more angles, for the rule point by point (richer section data). */
  pressures: z.array(z.object({ alpha: finite("Angle"), x: z.array(finite("x/c")), cpUpper: z.array(finite("Cp upper")), cpLower: z.array(finite("Cp lower")) })).optional(),
});

/**
 * The flaps extended: the flapped span (m from the plane of symmetry) and what the flap does to the
 * incompressible section data there — the change of the zero-lift angle (deg; Δcl0 = −a0·Δα0L), of the
 * moment coefficient about the quarter chord, and the flapped section clmax (the exchange format's wing.flaps).
 */
export const FlapsSchema = z
  .object({
    yFrom: finite("Flaps from y").refine((v) => v >= 0, { message: "Flaps from y must be 0 or more" }),
    yTo: finite("Flaps to y"),
    dAlphaL0: finite("Flap Δα0L").refine((v) => Math.abs(v) <= 20, { message: "Flap Δα0L must lie within ±20°" }),
    dCmAc: finite("Flap Δcm,ac").refine((v) => Math.abs(v) <= 0.6, { message: "Flap Δcm,ac must lie within ±0.6" }),
    clMax: positive("Flapped clmax").optional(),
  })
  .refine((f) => f.yTo > f.yFrom, { path: ["yTo"], message: "Flaps to y must be greater than flaps from y" });
export type FlapsData = z.output<typeof FlapsSchema>;

/**
 * The aileron of the rolling conditions (the exchange format's wing.aileron): its span (m from the plane of
 * symmetry), the section lift increment per degree of down-going deflection (strip theory: a0·τ/57.3 for a
 * flap-type aileron of effectiveness τ), the section moment increment per degree (−0.01: 14 CFR 23.349
 * [from memory]) and the full deflection at VA the rolling cases are generated from.
 */
export const AileronSchema = z
  .object({
    yFrom: finite("Aileron from y").refine((v) => v >= 0, { message: "Aileron from y must be 0 or more" }),
    yTo: finite("Aileron to y"),
    dClPerDeg: finite("Aileron Δcl per degree").refine((v) => v >= 0 && v <= 0.2, { message: "Aileron Δcl per degree must lie between 0 and 0.2" }),
    dCmPerDeg: finite("Aileron Δcm per degree").refine((v) => v >= -0.05 && v <= 0, { message: "Aileron Δcm per degree must lie between −0.05 and 0 (nose down for a down-going aileron)" }),
    deltaAtVa: finite("Aileron deflection at VA").refine((v) => v > 0 && v <= 40, { message: "Aileron deflection at VA must be above 0 and at most 40°" }),
  })
  .refine((a) => a.yTo > a.yFrom, { path: ["yTo"], message: "Aileron to y must be greater than aileron from y" });
export type AileronData = z.output<typeof AileronSchema>;

export const SectionsSchema = z
  .object({
    rows: z.array(SectionRowSchema).min(1, "Give section data for at least one station").max(MAX_SECTION_ROWS, `At most ${MAX_SECTION_ROWS} section stations`),
    source: z.object({ kind: z.enum(["typed", "upload", "import"]), uploadId: z.uuid().optional(), filename: z.string().optional(), sha256: z.string().optional() }),
    tables: z
      .array(z.object({ y: z.number(), points: z.array(z.object({ alpha: z.number(), cl: z.number(), cm: z.number() })), linearFrom: z.number(), linearTo: z.number() }))
      .default([]),
    flaps: FlapsSchema.optional(),
    aileron: AileronSchema.optional(),
  })
  .superRefine((s, ctx) => {
    s.rows.forEach((r, i) => {
      if (i > 0 && !(r.y > s.rows[i - 1]!.y)) ctx.addIssue({ code: "custom", path: ["rows", i, "y"], message: `Row ${i + 1}: y must be greater than the row before` });
    });
  });
export type SectionsData = z.output<typeof SectionsSchema>;


const idText = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Give the ${what} an id`)
    .max(40, `A ${what} id has at most 40 characters`)
    .regex(/^[A-Za-z0-9._\-+]+$/, "Use letters, digits and . _ - + only");

/**
 * A mass one semispan carries: a point mass at (x, y) — engine, gear, store — or a mass spread evenly
 * from yFrom to yTo — fuel in a tank bay; x is the streamwise position of its centre of gravity, m, from
 * the same origin as the planform's leading edges (the exchange format's wing.mass.items).
 */
export const MassItemSchema = z
  .object({
    id: idText("item"),
    label: z.string().trim().max(80, "A description has at most 80 characters").default(""),
    kg: finite("Mass").refine((v) => v >= 0, { message: "Mass must be 0 or more" }),
    x: finite("x of the centre of gravity"),
    y: finite("y").optional(),
    yFrom: finite("y from").optional(),
    yTo: finite("y to").optional(),
  })
  .superRefine((it, ctx) => {
    const spread = it.yFrom !== undefined || it.yTo !== undefined;
    if (it.y !== undefined && spread) ctx.addIssue({ code: "custom", path: ["y"], message: `Item ${it.id}: give y for a point mass or y from–to for a spread mass, not both` });
    else if (it.y === undefined && !spread) ctx.addIssue({ code: "custom", path: ["y"], message: `Item ${it.id}: give y (a point mass) or y from and y to (a spread mass)` });
    else if (spread && (it.yFrom === undefined || it.yTo === undefined)) ctx.addIssue({ code: "custom", path: [it.yFrom === undefined ? "yFrom" : "yTo"], message: `Item ${it.id}: a spread mass needs both y from and y to` });
    else if (spread && !(it.yTo! > it.yFrom!)) ctx.addIssue({ code: "custom", path: ["yTo"], message: `Item ${it.id}: y to must be greater than y from` });
    for (const k of ["y", "yFrom"] as const) if ((it[k] ?? 0) < 0) ctx.addIssue({ code: "custom", path: [k], message: `Item ${it.id}: y must be 0 or more` });
  });
export type MassItemData = z.output<typeof MassItemSchema>;

/**
 * A named mass state of the aircraft: its weight (kg, whole aircraft) and centre of gravity (fraction
 * of the MAC aft of its leading edge), and the fill factor (0–1) of each item of the wing; items not named
 * count fully (the exchange format's massCases, with the weight and centre of gravity the app adds).
 */
export const MassCaseSchema = z.object({
  id: idText("mass case"),
  label: z.string().trim().max(80, "A description has at most 80 characters").default(""),
  weight: positive("Weight").optional(),
  cg: finite("Centre of gravity").refine((v) => v >= -0.5 && v <= 1.5, { message: "The centre of gravity is a fraction of the MAC between −0.5 and 1.5 (0.25 = 25 % MAC)" }).optional(),
  fill: z.record(z.string(), finite("Fill factor").refine((v) => v >= 0 && v <= 1, { message: "A fill factor lies between 0 and 1" })).default({}),
});
export type MassCaseData = z.output<typeof MassCaseSchema>;

/**
 * The balance of the aircraft: the wing–body pitching-moment increment at zero lift (fuselage,
 * nacelles, on S and the MAC) and the tail arm from the MAC quarter chord to the tail's aerodynamic centre.
 */
export const BalanceSchema = z.object({
  cmBody: finite("Wing–body Cm increment").refine((v) => Math.abs(v) <= 0.5, { message: "The wing–body Cm increment lies within ±0.5" }),
  tailArm: positive("Tail arm"),
});
export type BalanceData = z.output<typeof BalanceSchema>;

export const MassesSchema = z
  .object({
    /** Structural mass of one semispan, kg, spread in proportion to chord on the reference axis. */
    structureKg: finite("Semispan structural mass").refine((v) => v >= 0, { message: "Semispan structural mass must be 0 or more (kg)" }),
    items: z.array(MassItemSchema).max(100, "At most 100 mass items"),
    massCases: z.array(MassCaseSchema).max(24, "At most 24 mass cases"),
    balance: BalanceSchema.optional(),
    /** Where the item table came from: typed, or a CSV file (its name). */
    source: z.object({ kind: z.enum(["typed", "csv", "import"]), filename: z.string().max(200).optional() }).default({ kind: "typed" }),
  })
  .superRefine((m, ctx) => {
    const ids = new Set<string>();
    m.items.forEach((it, i) => {
      if (ids.has(it.id)) ctx.addIssue({ code: "custom", path: ["items", i, "id"], message: `Item id ${it.id} is used twice` });
      ids.add(it.id);
    });
    const cases = new Set<string>();
    m.massCases.forEach((mc, i) => {
      if (cases.has(mc.id)) ctx.addIssue({ code: "custom", path: ["massCases", i, "id"], message: `Mass case id ${mc.id} is used twice` });
      cases.add(mc.id);
      for (const id of Object.keys(mc.fill)) {
        if (!ids.has(id)) ctx.addIssue({ code: "custom", path: ["massCases", i, "fill", id], message: `Mass case ${mc.id}: no item ${id}` });
      }
    });
  });
export type MassesData = z.output<typeof MassesSchema>;

/**
 * One flight condition of the envelope, as the exchange format has it: Mach, altitude and either
 * the root-chord angle of attack or the whole-aircraft weight (N) with the load factor; a trimmed case
 * names its mass case and may carry a typed tail load (N, up positive) — without one, the tail load
 * comes from the balance of the masses step (0 where no balance is given).
 */
export const LoadCaseSchema = z
  .object({
    id: z.string().trim().min(1, "Give the case an id").max(40, "A case id has at most 40 characters").regex(/^[A-Za-z0-9._\-+]+$/, "Use letters, digits and . _ - + only"),
    kind: z.enum(["manoeuvre", "gust", "rolling", "manual"]),
    rule: z.string().max(200).default(""),
    mach: finite("Mach").refine((v) => v >= 0 && v < 1, { message: "Mach must be at least 0 and below 1 (subsonic rules only)" }),
    altitude: finite("Altitude").refine((v) => v >= 0 && v <= 20000, { message: "Altitude must lie between 0 and 20 000 m" }),
    alpha: finite("Angle of attack").refine((v) => Math.abs(v) <= 30, { message: "Angle of attack must lie within ±30°" }).optional(),
    weight: positive("Weight").optional(),
    nz: finite("Load factor").refine((v) => Math.abs(v) <= 15, { message: "Load factor must lie within ±15" }).optional(),
    massCase: z.string().trim().max(40).optional(),
    tailLoad: finite("Tail load").optional(),
    /** Flaps extended: the case is solved on the flapped wing (the sections step's flaps). */
    flaps: z.boolean().optional(),
    /** A rolling or unsymmetrical case: the other side's share of the airload and the aileron deflection, deg (the exchange format's cases[].roll). */
    roll: z
      .object({
        fraction: finite("Other side's airload fraction").refine((v) => v > 0 && v <= 1, { message: "The other side's airload fraction must be above 0 and at most 1" }),
        aileron: finite("Aileron deflection").refine((v) => v >= 0 && v <= 40, { message: "The aileron deflection must lie between 0 and 40°" }),
      })
      .optional(),
    excluded: z.boolean().default(false),
  })
  .superRefine((c, ctx) => {
    const trimmed = c.weight !== undefined && c.nz !== undefined;
    if (c.alpha !== undefined && (c.tailLoad !== undefined || c.massCase)) ctx.addIssue({ code: "custom", path: [c.tailLoad !== undefined ? "tailLoad" : "massCase"], message: `Case ${c.id}: a tail load and a mass case belong to a case given by weight and load factor` });
    if (c.alpha === undefined && !trimmed) ctx.addIssue({ code: "custom", path: [c.weight === undefined ? "weight" : "nz"], message: `Case ${c.id}: give the weight and load factor, or an angle of attack` });
    if (c.roll && c.alpha !== undefined) ctx.addIssue({ code: "custom", path: ["roll"], message: `Case ${c.id}: a rolling case is given by weight and load factor (each side keeps the inertia relief)` });
    if (c.alpha !== undefined && (c.weight !== undefined || c.nz !== undefined)) ctx.addIssue({ code: "custom", path: ["alpha"], message: `Case ${c.id}: give an angle of attack or weight and load factor, not both` });
  });
export type LoadCase = z.output<typeof LoadCaseSchema>;

export const EnvelopeSchema = z
  .object({
    compressibility: z.enum(COMPRESSIBILITY_RULES, "Choose a compressibility rule"),
    spanwise: z.enum(SPANWISE_METHODS, "Choose a spanwise solver"),
    stations: z.number().int("Stations must be a whole number").min(8, "At least 8 stations").max(200, "At most 200 stations"),
    /** Vortex-lattice strips per semispan (the exchange format's method.strips); the engine's default where absent. */
    strips: z.number().int("Strips must be a whole number").min(8, "At least 8 strips").max(2000, "At most 2000 strips").optional(),
    /** "summary" leaves the station tables out of stored results (large sweeps); the exchange format's method.output. */
    output: z.enum(["full", "summary"]).default("full"),
    cases: z.array(LoadCaseSchema).min(1, "Give at least one load case").max(MAX_LOAD_CASES, `At most ${MAX_LOAD_CASES} load cases`),
  })
  .superRefine((e, ctx) => {
    if (e.strips !== undefined && e.spanwise === "lifting-line") ctx.addIssue({ code: "custom", path: ["strips"], message: "Strips apply to the vortex lattice only" });
    const rows = e.cases.length * e.stations;
    if (e.output === "full" && rows > MAX_STORED_STATION_ROWS) {
      ctx.addIssue({
        code: "custom",
        path: ["output"],
        message: `Full output of ${e.cases.length} load cases at ${e.stations} stations is ${rows} station rows, more than the ${MAX_STORED_STATION_ROWS} a stored result holds: choose summary output (root loads of every case and the envelope at every station), fewer stations or fewer cases`,
      });
    }
    const seen = new Set<string>();
    e.cases.forEach((c, i) => {
      if (seen.has(c.id)) ctx.addIssue({ code: "custom", path: ["cases", i, "id"], message: `Case id ${c.id} is used twice` });
      seen.add(c.id);
    });
  });
export type EnvelopeData = z.output<typeof EnvelopeSchema>;

export const DistributionSchema = z.object({
  dispositions: z.record(
    z.string(),
    z.object({ action: z.enum(["exclude", "justify"]), comment: z.string().trim().max(2000, "At most 2000 characters") }).refine((d) => d.action === "exclude" || d.comment.length >= 10, {
      message: "A justification needs a comment of at least 10 characters",
      path: ["comment"],
    }),
  ),
});
export type DistributionData = z.output<typeof DistributionSchema>;

/**
 * The loads step records the engineer's notes on the results for the checker. `semispanMass` is what
 * the step held before the masses step existed: read only where a case has no masses step saved.
 */
export const LoadsSchema = z.object({
  notes: z.string().trim().max(4000, "At most 4000 characters").default(""),
  semispanMass: finite("Semispan structural mass").refine((v) => v >= 0, { message: "Semispan structural mass must be 0 or more (kg)" }).optional(),
});
export type LoadsData = z.output<typeof LoadsSchema>;

export const STEP_SCHEMAS = {
  basis: BasisSchema,
  planform: PlanformSchema,
  sections: SectionsSchema,
  masses: MassesSchema,
  envelope: EnvelopeSchema,
  distribution: DistributionSchema,
  loads: LoadsSchema,
} as const;
