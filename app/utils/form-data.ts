import type { z } from "zod";
import { NUL_MESSAGE } from "./text";

/** Rows a form may post when its route names no maximum of its own. */
export const DEFAULT_MAX_ROWS = 100;
// "stations.2.chord" has three parts; no form of ours nests deeper than this.
const MAX_KEY_PARTS = 4;

export interface FormShape {
  /** Keys that always become arrays (checkbox groups). */
  arrays?: readonly string[];
  /** Largest number of rows of any list in the form (the step's own maximum), DEFAULT_MAX_ROWS if not named. */
  maxRows?: number;
}

/** A field name or value the form cannot have: refused before any object is built from it. */
export class FormFieldError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/**
 * FormData → plain object. Keys named in `arrays` always become arrays (checkbox groups); dotted
 * keys as react-hook-form names them ("stations.2.chord") become nested arrays and objects. A row
 * index at or beyond `maxRows`, a key nested deeper than any form of ours, and a NUL character are
 * refused with FormFieldError naming the field: a name like "stations.1000000.y" must cost
 * microseconds, never a million-slot array.
 */
export function formDataToObject(form: FormData, shape: FormShape = {}): Record<string, unknown> {
  const arrays = shape.arrays ?? [];
  const maxRows = shape.maxRows ?? DEFAULT_MAX_ROWS;
  const out: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const path = key.split(".");
    // Named in the answer, so kept short and printable.
    const field = key.length > 80 ? `${key.slice(0, 80)}…` : key;
    if (key.includes("\u0000")) throw new FormFieldError(field.replaceAll("\u0000", "\\0"), `The field name ${NUL_MESSAGE}.`);
    if (path.length > MAX_KEY_PARTS) throw new FormFieldError(field, "This form has no field of that name.");
    for (const part of path) {
      // Row numbers beyond the form's rows are refused before any array is made; so are digit runs too long to be one.
      if (/^\d+$/.test(part) && (part.length > 9 || Number(part) >= maxRows)) {
        throw new FormFieldError(field, `Row ${part.length > 9 ? part.slice(0, 9) + "…" : Number(part) + 1} is beyond the ${maxRows} rows this form takes.`);
      }
    }
    const values = form.getAll(key).filter((v): v is string => typeof v === "string");
    if (values.some((v) => v.includes("\u0000"))) throw new FormFieldError(field, `The value ${NUL_MESSAGE}.`);
    setPath(out, path, arrays.includes(key) ? values : values[values.length - 1]);
  }
  for (const key of arrays) out[key] ??= [];
  return out;
}

function setPath(target: Record<string, unknown> | unknown[], path: string[], value: unknown) {
  const [head, ...rest] = path;
  // Field names come from the client: never let one reach an object's prototype.
  if (head === "__proto__" || head === "constructor" || head === "prototype") return;
  const key: string | number = /^\d+$/.test(head!) ? Number(head) : head!;
  const container = target as Record<string | number, unknown>;
  if (rest.length === 0) {
    container[key] = value;
    return;
  }
  if (typeof container[key] !== "object" || container[key] === null) container[key] = /^\d+$/.test(rest[0]!) ? [] : {};
  setPath(container[key] as Record<string, unknown>, rest, value);
}

export type FieldErrors = Record<string, string[] | undefined>;

/**
 * What every page action answers: `ok` with a message for the page (and, on success, whatever the
 * page needs next, e.g. the new revision), or a refusal with messages by field ("form" for the
 * whole form) and nothing written.
 */
export interface ActionAnswer {
  ok: boolean;
  message: string | null;
  fieldErrors: FieldErrors;
  /** Which of several forms on one page the answer is for (its `intent` field), when the page has several. */
  intent?: string;
}

export type ActionRefusal = ActionAnswer & { ok: false };

/** zod issues → messages per top-level field (nested paths joined with dots). */
export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
