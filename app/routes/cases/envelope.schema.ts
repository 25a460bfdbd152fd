import { z } from "zod";
import { numberInput } from "~/domain/form-values";
import { COMPRESSIBILITY_RULES, SPANWISE_METHODS } from "~/domain/step-data";

const optionalNumber = (label: string) => z.preprocess((v) => (v === "" || v === null ? undefined : v), numberInput(label).optional());
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true", z.boolean());

const method = {
  revision: numberInput("Revision"),
  compressibility: z.enum(COMPRESSIBILITY_RULES, "Choose a compressibility rule"),
  spanwise: z.enum(SPANWISE_METHODS, "Choose a spanwise solver"),
  stations: numberInput("Output stations"),
};

/** The envelope form in display units (altitude and weight); the action converts to SI. */
export const EnvelopeFormSchema = z.discriminatedUnion("intent", [
  z.strictObject({
    intent: z.literal("save"),
    ...method,
    cases: z
      .array(
        z.strictObject({
          id: z.string().trim(),
          kind: z.enum(["manoeuvre", "gust", "manual"], "Kind is manoeuvre, gust or manual"),
          rule: z.string().default(""),
          mach: numberInput("Mach"),
          altitude: numberInput("Altitude"),
          alpha: optionalNumber("Angle of attack"),
          weight: optionalNumber("Weight"),
          nz: optionalNumber("Load factor"),
          excluded: checkbox,
        }),
      )
      .default([]),
  }),
  // Generating replaces the generated rows, so the grid's rows posted with it are not read.
  z.strictObject({ intent: z.literal("generate"), ...method, cases: z.unknown().optional() }),
]);
