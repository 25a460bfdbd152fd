import { z } from "zod";
import { numberInput } from "~/domain/form-values";

/** The dispositions form: one row per flagged case, "none" until the engineer decides. */
export const DispositionFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  // Indexed rows, since case ids may hold characters that form field names cannot.
  dispositions: z.array(z.strictObject({ id: z.string(), action: z.enum(["none", "exclude", "justify"]).default("none"), comment: z.string().default("") })).default([]),
});
