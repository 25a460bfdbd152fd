import { z } from "zod";
import { numberInput } from "~/domain/form-values";

export const PlanformFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  stations: z
    .array(z.strictObject({ y: numberInput("y"), xLe: numberInput("Leading edge x"), chord: numberInput("Chord"), twist: numberInput("Twist") }))
    .min(2, "Give at least two stations: root and tip"),
  axisRoot: numberInput("Reference axis at the root"),
  axisTip: numberInput("Reference axis at the tip"),
});
