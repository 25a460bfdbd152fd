import type { z } from "zod";
import { CaseFileHeadSchema, CaseFileSchema, caseFileIssues, plainCase } from "./schema";
import type { CaseFile, LoadCaseInput } from "./schema";

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
  const value = validQuickly(json);
  if (value) return { ok: true, value };
  const r = CaseFileSchema.safeParse(json, { error: (iss) => typeMessage(iss) });
  if (r.success) return { ok: true, value: r.data };
  return { ok: false, problems: toProblems(r.error) };
}

/**
 * The document as CaseFileSchema parses it, for the common valid document whose cases are plain
 * (plainCase): the members but the cases through zod, the cases without it, then the rules between
 * them. Undefined at the first doubt, and CaseFileSchema judges the whole document and names every problem.
 */
function validQuickly(json: unknown): CaseFile | undefined {
  if (typeof json !== "object" || json === null || Object.getPrototypeOf(json) !== Object.prototype) return undefined;
  const { cases: input, ...head } = json as Record<string, unknown>;
  if (!Array.isArray(input) || input.length === 0) return undefined;
  const cases = new Array<LoadCaseInput>(input.length);
  for (let i = 0; i < input.length; i++) {
    const c = plainCase(input[i]);
    if (!c) return undefined;
    cases[i] = c;
  }
  const h = CaseFileHeadSchema.safeParse(head);
  if (!h.success) return undefined;
  // The schema's member order: cases come last.
  const file = { ...h.data, cases };
  return caseFileIssues(file).length ? undefined : file;
}
