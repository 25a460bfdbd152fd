import { z } from "zod";
import { numberInput, numberListInput, optionalNumberInput } from "~/domain/form-inputs";
import { convertFields } from "~/domain/form-values";
import { BasisSchema, type BasisData } from "~/domain/step-data";
import { CATEGORIES, DEFAULT_REGULATIONS } from "~/domain/vocabulary";
import { tidy, type UnitSystem } from "~/domain/units";
import { BASIS_QUANTITIES } from "./basis.quantities";

// The stored basis's checks of signs and ratios hold in any unit, so the form says them too.
const rule = BasisSchema.shape;

/** The basis form as typed, in the person's display units; the action converts it to SI (and checks the SI ranges). */
export const BasisFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  units: z.enum(["SI", "US"], "Choose SI or US customary units"),
  category: z.enum(CATEGORIES, "Choose the category of the certification basis"),
  regulations: z.string().trim().min(3, "List the applicable regulation references").max(2000, "At most 2000 characters"),
  mtow: numberInput("Maximum design take-off weight", rule.mtow),
  mzfw: numberInput("Maximum zero-fuel weight", rule.mzfw),
  minWeight: numberInput("Minimum design weight", rule.minWeight),
  vs1: numberInput("VS1", rule.vs1),
  va: numberInput("VA", rule.va),
  vb: optionalNumberInput("VB", rule.vb.unwrap()),
  mlw: optionalNumberInput("Maximum landing weight", rule.mlw.unwrap()),
  zmo: optionalNumberInput("Maximum operating altitude", rule.zmo.unwrap()),
  vc: numberInput("VC", rule.vc),
  vd: numberInput("VD", rule.vd),
  altitudes: numberListInput("Altitudes"),
  wingArea: numberInput("Wing reference area", rule.wingArea),
  clMax: numberInput("Aircraft CLmax", rule.clMax),
  clMaxNegative: numberInput("Negative CLmax", rule.clMaxNegative),
  vf: optionalNumberInput("VF", rule.vf.unwrap()),
  clMaxFlaps: optionalNumberInput("CLmax with flaps", rule.clMaxFlaps.unwrap()),
});


/** The saved basis as the form shows it, in its display units; a blank basis starts from the transport category's references and no numbers. */
export function basisFormValues(saved: BasisData | null) {
  if (!saved) return { units: "SI" as UnitSystem, category: "part25" as const, regulations: DEFAULT_REGULATIONS.part25 };
  const shown = convertFields(saved, saved.units, BASIS_QUANTITIES, "fromSI");
  const out: Record<string, unknown> = { ...shown };
  for (const key of Object.keys(BASIS_QUANTITIES)) {
    const v = out[key];
    out[key] = Array.isArray(v) ? v.map((x: number) => tidy(x)).join(", ") : typeof v === "number" ? tidy(v) : v;
  }
  return out;
}
