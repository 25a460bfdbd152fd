import { z } from "zod";
import { plainLine } from "~/utils/text";

export const NewProgrammeSchema = z.strictObject({
  code: z
    .string()
    .trim()
    .min(2, "Enter a programme code of at least 2 characters")
    .max(20, "A programme code has at most 20 characters")
    .regex(/^[A-Za-z0-9][A-Za-z0-9\-]*$/, "Use letters, digits and hyphens only"),
  name: plainLine("A name", 3, 120, { min: "Enter a name of at least 3 characters" }),
  aircraft: plainLine("The aircraft type", 2, 120, { min: "Name the aircraft type" }),
  description: z.string().trim().max(2000, "A description has at most 2000 characters").default(""),
});
