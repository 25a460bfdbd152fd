import { z } from "zod";
import { numberInput } from "~/domain/form-inputs";

/** The loads form: the engineer's notes on the results for the checker (the masses have their own step). */
export const LoadsFormSchema = z.strictObject({ revision: numberInput("Revision"), notes: z.string().max(4000, "At most 4000 characters").default("") });
