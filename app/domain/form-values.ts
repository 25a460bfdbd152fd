// Plain conversions of what a form holds; the zod field types built on them are in form-inputs.ts,
// so a page that converts units does not load zod.
import { fromSI, tidy, toSI, type Quantity, type UnitSystem } from "./units";

/** Text typed into a number field as a number: empty is "not given" (undefined), commas are decimal separators, text that is not a number stays text. */
export function typedNumber(v: unknown): unknown {
  if (typeof v === "number") return v;
  if (v === undefined || v === null || (typeof v === "string" && v.trim() === "")) return undefined;
  if (typeof v !== "string") return v;
  const n = Number(v.trim().replace(",", "."));
  return Number.isNaN(n) ? v : n;
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

/**
 * Converted to SI, keeping the stored SI value of every number that was shown and not changed: a
 * value shown in other units is rounded to ten figures, and saving it back would otherwise move the
 * stored value in its last digits at every save.
 */
export function toSIKeepingShown<T extends Record<string, unknown>>(typed: T, units: UnitSystem, quantities: Partial<Record<keyof T, Quantity>>, saved: Partial<Record<keyof T, unknown>> | null): T {
  const out: Record<string, unknown> = convertFields(typed, units, quantities, "toSI");
  if (!saved) return out as T;
  const same = (v: unknown, stored: unknown, q: Quantity) => typeof v === "number" && typeof stored === "number" && v === tidy(fromSI(units, q, stored));
  for (const [key, q] of Object.entries(quantities) as [string, Quantity][]) {
    const v = typed[key];
    const stored = saved[key];
    if (same(v, stored, q)) out[key] = stored;
    else if (Array.isArray(v) && Array.isArray(stored) && v.length === stored.length) out[key] = v.map((x, i) => (same(x, stored[i], q) ? stored[i] : (out[key] as unknown[])[i]));
  }
  return out as T;
}

/**
 * A typed value (one number, or a list as "0, 3000") converted between display units, as the form
 * shows it: switching the units shown converts what is typed, it never relabels it. A number still
 * as shown from the stored SI value (`stored`) is converted from that value, so switching back and
 * forth never drifts; text that is not a number is left as typed, for the form's check to name.
 * A number comes back a number, text comes back text, anything else as it was: a field keeps its type.
 */
export function convertTyped<T>(text: T, q: Quantity, from: UnitSystem, to: UnitSystem, stored?: unknown): T;
export function convertTyped(text: unknown, q: Quantity, from: UnitSystem, to: UnitSystem, stored?: unknown): unknown {
  if (from === to || (typeof text !== "string" && typeof text !== "number")) return text;
  const one = (s: string, si: unknown) => {
    const n = Number(s.trim().replace(",", "."));
    if (s.trim() === "" || !Number.isFinite(n)) return s;
    const base = typeof si === "number" && n === tidy(fromSI(from, q, si)) ? si : toSI(from, q, n);
    return String(tidy(fromSI(to, q, base)));
  };
  if (typeof text === "number") return Number(one(String(text), stored));
  if (!/[;\s]|,\s/.test(text.trim())) return one(text, stored);
  const parts = text.split(/[;,\s]+/).filter(Boolean);
  return parts.map((p, i) => one(p, Array.isArray(stored) && stored.length === parts.length ? stored[i] : undefined)).join(", ");
}
