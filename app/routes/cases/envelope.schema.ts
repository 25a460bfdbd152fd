import { z } from "zod";
import { numberInput, optionalNumberInput } from "~/domain/form-inputs";
import { EnvelopeSchema, LoadCaseSchema, type EnvelopeData } from "~/domain/step-data";
import { COMPRESSIBILITY_RULES, SPANWISE_METHODS } from "~/domain/vocabulary";
import { fromSI, tidy, toSI, type UnitSystem } from "~/domain/units";

const G0 = 9.80665;

// The stored envelope's checks that hold in any unit (Mach, degrees, load factor, signs, counts), said in the form too; the altitude's range is in metres, checked on the SI value.
const rule = { ...EnvelopeSchema.shape, ...LoadCaseSchema.shape };
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true", z.boolean());

const method = {
  revision: numberInput("Revision"),
  compressibility: z.enum(COMPRESSIBILITY_RULES, "Choose a compressibility rule"),
  spanwise: z.enum(SPANWISE_METHODS, "Choose a spanwise solver"),
  stations: numberInput("Output stations", rule.stations),
  /** Vortex-lattice strips per semispan; empty for the engine's default (60). */
  strips: optionalNumberInput("Strips", rule.strips.unwrap()),
};

/** One load case as typed into the grid, in display units (altitude, weight as a mass, tail load as a force). */
const caseRow = z.strictObject({
  id: z.string().trim(),
  kind: z.enum(["manoeuvre", "gust", "rolling", "manual"], "Kind is manoeuvre, gust, rolling or manual"),
  rule: z.string().default(""),
  mach: numberInput("Mach", rule.mach),
  altitude: numberInput("Altitude"),
  alpha: optionalNumberInput("Angle of attack", rule.alpha.unwrap()),
  weight: optionalNumberInput("Weight", rule.weight.unwrap()),
  nz: optionalNumberInput("Load factor", rule.nz.unwrap()),
  massCase: z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(40).optional()),
  tailLoad: optionalNumberInput("Tail load"),
  flaps: checkbox,
  /** A rolling case: the other side's share of the symmetric airload (0–1) and the aileron deflection (deg). */
  rollFraction: optionalNumberInput("Other side's airload fraction", rule.roll.unwrap().shape.fraction),
  rollAileron: optionalNumberInput("Aileron deflection", rule.roll.unwrap().shape.aileron),
  excluded: checkbox,
});

/** Rows one edit of a large case file may carry (changed, removed and added together). */
export const MAX_EDITED_ROWS = 2000;

/**
 * The envelope form in display units (altitude and weight); the action converts to SI. A case file
 * of up to WHOLE_GRID_LOAD_CASES cases is edited whole ("save": every row posted); a larger one
 * row by row ("rows": only the changed, removed and added rows, on the revision they were made on)
 * and its method alone ("method": the stored cases kept).
 */
export const EnvelopeFormSchema = z.discriminatedUnion("intent", [
  z
    .strictObject({ intent: z.literal("save"), ...method, cases: z.array(caseRow).default([]), casesCount: optionalNumberInput("Number of load cases") })
    // The grid shows the rows in view only; its scripts post the others. A post sent before they ran
    // carries only the rows the server drew: refused, so that the case file is not saved short.
    .check((ctx) => {
      const { cases, casesCount } = ctx.value;
      if (casesCount !== undefined && casesCount !== cases.length)
        ctx.issues.push({ code: "custom", input: cases, path: ["cases"], message: `The page sent ${cases.length} of its ${casesCount} load cases (it had not finished loading); nothing was saved: save again.` });
    }),
  // Generating replaces the generated rows, so the grid's rows posted with it are not read.
  z.strictObject({ intent: z.literal("generate"), ...method, cases: z.unknown().optional(), casesCount: z.unknown().optional() }),
  z.strictObject({ intent: z.literal("method"), ...method, cases: z.unknown().optional(), casesCount: z.unknown().optional() }),
  z
    .strictObject({
      intent: z.literal("rows"),
      revision: numberInput("Revision"),
      changed: z.array(z.strictObject({ index: z.number().int().min(0), row: z.unknown() })).default([]),
      removed: z.array(z.number().int().min(0)).default([]),
      added: z.array(caseRow).default([]),
    })
    .refine((r) => r.changed.length + r.removed.length + r.added.length <= MAX_EDITED_ROWS, { message: `At most ${MAX_EDITED_ROWS} rows in one save`, path: ["changed"] })
    // A changed row's refusal names the row as the grid shows it (cases.<index>.<field>), not its place in this post.
    .transform((r, ctx) => {
      const changed: { index: number; row: z.output<typeof caseRow> }[] = [];
      for (const { index, row } of r.changed) {
        const parsed = caseRow.safeParse(row);
        if (parsed.success) changed.push({ index, row: parsed.data });
        else for (const issue of parsed.error.issues) ctx.addIssue({ code: "custom", message: issue.message, path: ["cases", index, ...issue.path] });
      }
      return { ...r, changed };
    }),
]);

/** Above this many load cases the page shows a window on the stored cases and saves edited rows only. */
export const WHOLE_GRID_LOAD_CASES = 500;

/** The method a new envelope starts with. */
export const DEFAULT_METHOD = { compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: 40 } as const;

/** The saved envelope as the form shows it: altitude and weight (mass, not force) in the display units. */
export function envelopeFormValues(env: EnvelopeData | null, units: UnitSystem) {
  const m = env ?? { ...DEFAULT_METHOD, cases: [] };
  return {
    compressibility: m.compressibility,
    spanwise: m.spanwise,
    stations: String(m.stations),
    strips: "strips" in m && m.strips !== undefined ? String(m.strips) : "",
    cases: m.cases.map((c) => loadCaseRowValues(c, units)),
  };
}

/** One stored load case as the grid shows it: text in the display units (altitude, weight as a mass). */
export function loadCaseRowValues(c: EnvelopeData["cases"][number], units: UnitSystem) {
  return {
    id: c.id,
    kind: c.kind,
    rule: c.rule,
    mach: String(tidy(c.mach)),
    altitude: String(tidy(fromSI(units, "altitude", c.altitude))),
    alpha: c.alpha === undefined ? "" : String(c.alpha),
    weight: c.weight === undefined ? "" : String(tidy(fromSI(units, "mass", c.weight / G0))),
    nz: c.nz === undefined ? "" : String(tidy(c.nz)),
    massCase: c.massCase ?? "",
    tailLoad: c.tailLoad === undefined ? "" : String(tidy(fromSI(units, "force", c.tailLoad))),
    flaps: c.flaps ?? false,
    rollFraction: c.roll ? String(c.roll.fraction) : "",
    rollAileron: c.roll ? String(c.roll.aileron) : "",
    excluded: c.excluded,
  };
}

/** Typed load cases in SI (altitude in m, weight as a force in N, tail load in N), as the envelope step stores them. */
export function casesToSI(cases: z.output<typeof caseRow>[], units: UnitSystem) {
  return cases.map(({ rollFraction, rollAileron, ...k }) => ({
    ...k,
    // A deflection alone is a rolling case with the full airload on both sides.
    roll: rollFraction === undefined && rollAileron === undefined ? undefined : { fraction: rollFraction ?? 1, aileron: rollAileron ?? 0 },
    altitude: toSI(units, "altitude", k.altitude),
    weight: k.weight === undefined ? undefined : toSI(units, "mass", k.weight) * G0,
    tailLoad: k.tailLoad === undefined ? undefined : toSI(units, "force", k.tailLoad),
    // Stored only where set, as the exchange format has it.
    flaps: k.flaps || undefined,
  }));
}
