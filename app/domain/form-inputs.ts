import { z } from "zod";
import { typedNumber } from "./form-values";

/**
 * A number typed in a form: empty is "missing" (not zero), text that is not a number is refused
 * with the field's name, and commas are accepted as decimal separators. `rule` is the step's own
 * check of the value (`BasisSchema.shape.mtow`, …), so the form says the rule ("must be positive")
 * in the browser as the server does; give it only where the form shows the stored unit or the rule
 * does not depend on the unit (a sign, a plain ratio, a count).
 */
export function numberInput(label: string, rule?: z.ZodType<number, number>) {
  const n = z.number({ error: (issue) => (issue.input === undefined ? `${label} is required` : `${label} must be a number`) }).refine(Number.isFinite, { message: `${label} must be a finite number` });
  return z.preprocess(typedNumber, rule ? n.pipe(rule) : n);
}

/** A number that may be left empty: empty is "not given" (undefined), text that is not a number is refused; `rule` as for numberInput. */
export function optionalNumberInput(label: string, rule?: z.ZodType<number, number>) {
  const n = z.number({ error: `${label} must be a number` }).refine(Number.isFinite, { message: `${label} must be a finite number` });
  return z.preprocess(typedNumber, (rule ? n.pipe(rule) : n).optional());
}

/** A list of numbers typed as "0, 3000, 6000". */
export function numberListInput(label: string) {
  return z.preprocess(
    (v) => {
      if (Array.isArray(v)) return v;
      if (typeof v !== "string") return v;
      return v
        .split(/[;,\s]+/)
        .filter(Boolean)
        .map((s) => (Number.isNaN(Number(s)) ? s : Number(s)));
    },
    z.array(z.number({ error: `${label}: every entry must be a number` }), { error: `${label} must be a list of numbers` }),
  );
}
