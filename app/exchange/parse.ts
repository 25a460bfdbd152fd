import type { z } from "zod";
import { CaseFileSchema } from "./schema";
import type { CaseFile } from "./schema";

/** One problem with an input document: where (contract path) and which rule it breaks. */
export interface CaseProblem {
  path: string;
  message: string;
}

export type ParseCaseResult = { ok: true; value: CaseFile } | { ok: false; problems: CaseProblem[] };

/** Format a zod path as the contract writes it: `cases[3].mach`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const p of path) {
    if (typeof p === "number") out += `[${p}]`;
    else out += out ? `.${String(p)}` : String(p);
  }
  return out || "(document)";
}

function typeMessage(iss: { code: string; input?: unknown; expected?: unknown }): string | undefined {
  if (iss.code !== "invalid_type") return undefined;
  if (iss.input === undefined) return "is required";
  return `must be ${iss.expected === "object" ? "an object" : iss.expected === "array" ? "an array" : `a ${String(iss.expected)}`}`;
}

function toProblems(error: z.ZodError): CaseProblem[] {
  const out: CaseProblem[] = [];
  for (const iss of error.issues) {
    if (iss.code === "unrecognized_keys") {
      for (const k of iss.keys) {
        out.push({ path: formatPath([...iss.path, k]), message: "is not a field of spanwright.case/1 (unknown fields are an error)" });
      }
    } else {
      out.push({ path: formatPath(iss.path), message: iss.message });
    }
  }
  return out;
}

/**
 * Validate an unknown JSON value as a `spanwright.case/1` document and apply its defaults.
 * Never throws for bad input: returns every problem with its path and rule.
 */
export function parseCase(json: unknown): ParseCaseResult {
  const r = CaseFileSchema.safeParse(json, { error: (iss) => typeMessage(iss) });
  if (r.success) return { ok: true, value: r.data };
  return { ok: false, problems: toProblems(r.error) };
}
