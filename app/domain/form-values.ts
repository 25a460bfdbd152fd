import { z } from "zod";
import { fromSI, toSI, type Quantity, type UnitSystem } from "./units";

/**
 * A number typed in a form: empty is "missing" (not zero), text that is not a number is refused
 * with the field's name, and commas are accepted as decimal separators.
 */
export function numberInput(label: string) {
  return z.preprocess(
    (v) => {
      if (typeof v === "number") return v;
      if (typeof v !== "string" || v.trim() === "") return undefined;
      const n = Number(v.trim().replace(",", "."));
      return Number.isNaN(n) ? v : n;
    },
    z.number({ error: (issue) => (issue.input === undefined ? `${label} is required` : `${label} must be a number`) }).refine(Number.isFinite, { message: `${label} must be a finite number` }),
  );
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

/** Converts the named fields of a record between display units and SI. */
export function convertFields<T extends Record<string, unknown>>(values: T, units: UnitSystem, quantities: Partial<Record<keyof T, Quantity>>, direction: "toSI" | "fromSI"): T {
  const out: Record<string, unknown> = { ...values };
  const f = direction === "toSI" ? toSI : fromSI;
  for (const [key, q] of Object.entries(quantities) as [string, Quantity][]) {
    const v = out[key];
    if (typeof v === "number") out[key] = f(units, q, v);
    else if (Array.isArray(v)) out[key] = v.map((x) => (typeof x === "number" ? f(units, q, x) : x));
  }
  return out as T;
}

/** Rounds a converted value for display in an input, so 1 ft shows as 0.3048, not 0.30480000000000002. */
export function tidy(value: number): number {
  return Number.parseFloat(value.toPrecision(10));
}
