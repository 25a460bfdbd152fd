import { z } from "zod";
import { plainLine } from "~/utils/text";

export const NewCaseSchema = z.strictObject({
  programmeId: z.uuid("Choose a programme"),
  reference: z
    .string()
    .trim()
    .min(1, "Enter a case reference")
    .max(40, "A reference has at most 40 characters")
    .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, "Use letters, digits and . _ - / only, starting with a letter or digit"),
  title: plainLine("A title", 3, 160, { min: "Enter a title of at least 3 characters" }),
  description: z.string().trim().max(4000, "A description has at most 4000 characters").default(""),
});
