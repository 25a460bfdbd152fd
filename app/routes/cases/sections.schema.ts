import { z } from "zod";
import { numberInput, optionalNumberInput } from "~/domain/form-inputs";
import { SectionRowSchema, type PlanformData, type SectionsData } from "~/domain/step-data";
import { keepRicherData } from "~/domain/section-csv";
import { fromSI, tidy, toSI, type UnitSystem } from "~/domain/units";

// The stored row's checks of the section coefficients (no unit to convert), said in the form too.
const row = SectionRowSchema.shape;

export const SectionsFormSchema = z.discriminatedUnion("intent", [
  z.strictObject({
    intent: z.literal("save"),
    revision: numberInput("Revision"),
    rows: z
      .array(
        z.strictObject({
          y: numberInput("y", row.y),
          a0: numberInput("a0", row.a0),
          alphaL0: numberInput("αL0"),
          cmAc: numberInput("cm,ac"),
          clMax: optionalNumberInput("clmax", row.clMax.unwrap()),
          cpMin: optionalNumberInput("Cp,min", row.cpMin.unwrap()),
          cpMinCl: optionalNumberInput("cl of Cp,min", row.cpMinCl.unwrap()),
        }),
      )
      .min(1, "Give section data for at least one station"),
    /** The flapped span and its section increments; all empty for a wing without flaps. */
    flaps: z
      .strictObject({ yFrom: optionalNumberInput("Flaps from y"), yTo: optionalNumberInput("Flaps to y"), dAlphaL0: optionalNumberInput("Flap Δα0L"), dCmAc: optionalNumberInput("Flap Δcm,ac"), clMax: optionalNumberInput("Flapped clmax") })
      .optional(),
    /** The aileron of the rolling conditions; all empty for none (its moment per degree defaults to −0.01, 14 CFR 23.349). */
    aileron: z
      .strictObject({
        yFrom: optionalNumberInput("Aileron from y"),
        yTo: optionalNumberInput("Aileron to y"),
        dClPerDeg: optionalNumberInput("Aileron Δcl per degree"),
        dCmPerDeg: optionalNumberInput("Aileron Δcm per degree"),
        deltaAtVa: optionalNumberInput("Aileron deflection at VA"),
      })
      .optional(),
  }),
  z.strictObject({ intent: z.literal("accept-upload"), revision: numberInput("Revision"), uploadId: z.uuid("Upload a file first") }),
  z.strictObject({ intent: z.literal("remove-pressures"), revision: numberInput("Revision") }),
]);

const text = (v: number | undefined) => (v === undefined ? "" : String(tidy(v)));

/** The saved section data as the grid shows it; before any is saved, one empty row at each planform station. */
export function sectionsFormValues(saved: SectionsData | null, planform: PlanformData | null, units: UnitSystem) {
  const rows: { y: number; a0?: number; alphaL0?: number; cmAc?: number; clMax?: number; cpMin?: number; cpMinCl?: number }[] = saved?.rows ?? (planform?.stations ?? [{ y: 0 }]).map((s) => ({ y: s.y }));
  const f = saved?.flaps;
  const a = saved?.aileron;
  return {
    rows: rows.map((r) => ({ y: text(fromSI(units, "length", r.y)), a0: text(r.a0), alphaL0: text(r.alphaL0), cmAc: text(r.cmAc), clMax: text(r.clMax), cpMin: text(r.cpMin), cpMinCl: text(r.cpMinCl) })),
    flaps: {
      yFrom: text(f && fromSI(units, "length", f.yFrom)),
      yTo: text(f && fromSI(units, "length", f.yTo)),
      dAlphaL0: text(f?.dAlphaL0),
      dCmAc: text(f?.dCmAc),
      clMax: text(f?.clMax),
    },
    aileron: {
      yFrom: text(a && fromSI(units, "length", a.yFrom)),
      yTo: text(a && fromSI(units, "length", a.yTo)),
      dClPerDeg: text(a?.dClPerDeg),
      dCmPerDeg: text(a?.dCmPerDeg),
      deltaAtVa: text(a?.deltaAtVa),
    },
  };
}

/**
 * Typed rows in SI, as the sections step stores them (the step's own schema checks them next); each row
 * keeps the richer data (Cp,min table, chordwise pressures) the saved row at the same y has.
 */
export function sectionsToSI(input: Extract<z.output<typeof SectionsFormSchema>, { intent: "save" }>, units: UnitSystem, saved: SectionsData | null) {
  const f = input.flaps;
  // Any flap value typed makes a flap; the step's schema then names what is missing.
  const flaps =
    f && Object.values(f).some((v) => v !== undefined)
      ? { ...f, yFrom: f.yFrom === undefined ? undefined : toSI(units, "length", f.yFrom), yTo: f.yTo === undefined ? undefined : toSI(units, "length", f.yTo) }
      : undefined;
  const a = input.aileron;
  const aileron =
    a && Object.values(a).some((v) => v !== undefined)
      ? { ...a, yFrom: a.yFrom === undefined ? undefined : toSI(units, "length", a.yFrom), yTo: a.yTo === undefined ? undefined : toSI(units, "length", a.yTo), dCmPerDeg: a.dCmPerDeg ?? -0.01 }
      : undefined;
  return {
    rows: keepRicherData(input.rows.map((r) => ({ ...r, y: toSI(units, "length", r.y) })), saved),
    source: { kind: "typed" as const },
    tables: [],
    ...(flaps ? { flaps } : {}),
    ...(aileron ? { aileron } : {}),
  };
}
