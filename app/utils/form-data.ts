import type { z } from "zod";

/**
 * FormData → plain object. Keys named in `arrays` always become arrays (checkbox groups); dotted
 * keys as react-hook-form names them ("stations.2.chord") become nested arrays and objects.
 */
export function formDataToObject(form: FormData, arrays: readonly string[] = []): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const values = form.getAll(key).filter((v): v is string => typeof v === "string");
    setPath(out, key.split("."), arrays.includes(key) ? values : values[values.length - 1]);
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
