import type { z } from "zod";

/** FormData → plain object; keys named in `arrays` always become arrays (checkbox groups). */
export function formDataToObject(form: FormData, arrays: readonly string[] = []): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const values = form.getAll(key).filter((v): v is string => typeof v === "string");
    out[key] = arrays.includes(key) ? values : values[values.length - 1];
  }
  for (const key of arrays) out[key] ??= [];
  return out;
}

export type FieldErrors = Record<string, string[] | undefined>;

/** zod issues → messages per top-level field (nested paths joined with dots). */
export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
