import { z } from "zod";

/**
 * Rules for the text people type, shared by every form and API schema. PostgreSQL refuses the NUL
 * character in text, so it is refused everywhere with the field named (never a 500). Names and
 * titles end up in lists, e-mails, PDFs and the audit trail, where a control character or a
 * bidirectional override (which reorders how the text around it is displayed) could disguise what a
 * record says: they are refused there too.
 */

/** Bidirectional embeddings, overrides and isolates (U+202A–U+202E, U+2066–U+2069). */
const BIDI_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/;
/** C0 and C1 control characters and DEL: none belongs in a one-line name or title. */
const CONTROL_CHARACTERS = /[\u0000-\u001F\u007F-\u009F]/;

export const NUL_MESSAGE = "must not contain the NUL character (U+0000)";

/**
 * The path of the first string (value or key) in a parsed body that holds a NUL, or null. Paths are
 * written as the forms name fields: `stations.2.chord`.
 */
export function findNul(value: unknown, path: string[] = [], depth = 0): string | null {
  if (typeof value === "string") return value.includes("\u0000") ? path.join(".") || "(body)" : null;
  if (value === null || typeof value !== "object" || depth > 64) return null;
  for (const [key, item] of Object.entries(value)) {
    if (key.includes("\u0000")) return [...path, key.replaceAll("\u0000", "\\0")].join(".");
    const found = findNul(item, [...path, key], depth + 1);
    if (found) return found;
  }
  return null;
}

/** Why a one-line name or title is refused, or null when it is plain text. */
export function lineProblem(value: string): string | null {
  if (CONTROL_CHARACTERS.test(value)) return "must not contain control characters (tabs, line breaks and the like)";
  if (BIDI_CONTROLS.test(value)) return "must not contain bidirectional override characters, which change how the text around them is shown";
  return null;
}

/**
 * A one-line name or title: trimmed, between `min` and `max` characters, with no control or
 * bidirectional override characters. `label` starts the messages ("A title has at most…").
 */
export function plainLine(label: string, min: number, max: number, messages: { min?: string; max?: string } = {}) {
  return z
    .string()
    .trim()
    .min(min, messages.min ?? `${label} has at least ${min} character${min === 1 ? "" : "s"}`)
    .max(max, messages.max ?? `${label} has at most ${max} characters`)
    .superRefine((v, ctx) => {
      const problem = lineProblem(v);
      if (problem) ctx.addIssue({ code: "custom", message: `${label} ${problem}` });
    });
}
