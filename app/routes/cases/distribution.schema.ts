import { z } from "zod";
import { numberInput } from "~/domain/form-inputs";
import { FLAG_REASONS } from "~/domain/results";
import { MAX_LOAD_CASES } from "~/domain/step-data";

const revision = numberInput("Revision");

/**
 * The dispositions form, posted as JSON: the rows changed since the page was opened ("none" takes a
 * disposition away), merged by the server into the stored step; or one disposition for every case
 * flagged for a reason.
 */
export const DispositionFormSchema = z.discriminatedUnion("intent", [
  z.strictObject({
    intent: z.literal("rows"),
    revision,
    changed: z
      .array(z.strictObject({ id: z.string().min(1, "Case id is required"), action: z.enum(["none", "exclude", "justify"], "Disposition must be none, exclude or justify"), comment: z.string().default("") }))
      .min(1, "Change at least one disposition before saving")
      .max(MAX_LOAD_CASES, `At most ${MAX_LOAD_CASES} dispositions at once`),
  }),
  z.strictObject({
    intent: z.literal("bulk"),
    revision,
    reason: z.enum(FLAG_REASONS, "Reason must be one of the reasons cases are flagged for"),
    action: z.enum(["exclude", "justify"], "Disposition must be exclude or justify"),
    comment: z.string().default(""),
  }),
]);
