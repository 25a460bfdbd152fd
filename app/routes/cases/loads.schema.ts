import { z } from "zod";
import { numberInput } from "~/domain/form-values";

/** The loads form: the semispan structural mass in the display unit of mass. */
export const LoadsFormSchema = z.strictObject({ revision: numberInput("Revision"), semispanMass: numberInput("Semispan structural mass") });
