import { z } from "zod";
import { numberInput } from "~/domain/form-values";

const optionalNumber = (label: string) => z.preprocess((v) => (v === "" || v === null ? undefined : v), numberInput(label).optional());

export const SectionsFormSchema = z.discriminatedUnion("intent", [
  z.strictObject({
    intent: z.literal("save"),
    revision: numberInput("Revision"),
    rows: z
      .array(z.strictObject({ y: numberInput("y"), a0: numberInput("a0"), alphaL0: numberInput("αL0"), cmAc: numberInput("cm,ac"), clMax: optionalNumber("clmax"), cpMin: optionalNumber("Cp,min") }))
      .min(1, "Give section data for at least one station"),
  }),
  z.strictObject({ intent: z.literal("accept-upload"), revision: numberInput("Revision"), uploadId: z.uuid("Upload a file first") }),
]);
