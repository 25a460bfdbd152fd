import { z } from "zod";

export const NewProgrammeSchema = z.strictObject({
  code: z
    .string()
    .trim()
    .min(2, "Enter a programme code of at least 2 characters")
    .max(20, "A programme code has at most 20 characters")
    .regex(/^[A-Za-z0-9][A-Za-z0-9\-]*$/, "Use letters, digits and hyphens only"),
  name: z.string().trim().min(3, "Enter a name of at least 3 characters").max(120, "A name has at most 120 characters"),
  aircraft: z.string().trim().min(2, "Name the aircraft type").max(120, "At most 120 characters"),
  description: z.string().trim().max(2000, "A description has at most 2000 characters").default(""),
});
