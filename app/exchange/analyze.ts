import { isEngineError } from "../engine/errors";
import type { CaseProblem } from "./parse";
import { parseCase } from "./parse";
import type { RunOptions } from "./run";
import { runCase } from "./run";
import type { CaseResult } from "./schema";
import { parseSections } from "./sections";

/**
 * Analyse a request body as the API takes it: the bare `spanwright.case/1` document, or
 * `{ "case": …, "sections": … }` with the richer section data beside it (`spanwright.sections/1`,
 * docs/decisions/009). A bare document is recognised by its `schema` field; the pair has none.
 * Never throws for bad input: every problem comes back with its path.
 */
export function analyzeDocument(body: unknown, options: Omit<RunOptions, "sections"> = {}): { ok: true; result: CaseResult } | { ok: false; problems: CaseProblem[] } {
  const pair = typeof body === "object" && body !== null && !Array.isArray(body) && !("schema" in body);
  let caseDoc = body;
  let sectionsDoc: unknown;
  if (pair) {
    const { case: c, sections, ...rest } = body as Record<string, unknown>;
    const extra = Object.keys(rest).map((k) => ({ path: k, message: "is not a field of an analysis request (case, sections)" }));
    if (c === undefined) extra.push({ path: "case", message: "is required (the spanwright.case/1 document)" });
    if (extra.length) return { ok: false, problems: extra };
    caseDoc = c;
    sectionsDoc = sections;
  }
  const parsed = parseCase(caseDoc);
  if (!parsed.ok) return { ok: false, problems: parsed.problems };
  let sections;
  if (sectionsDoc !== undefined) {
    const s = parseSections(sectionsDoc, parsed.value);
    if (!s.ok) return { ok: false, problems: s.problems };
    sections = s.value;
  }
  try {
    return { ok: true, result: runCase(parsed.value, { ...options, sections }) };
  } catch (error) {
    if (isEngineError(error)) return { ok: false, problems: [{ path: error.field ?? "(document)", message: error.message.replace(`${error.field}: `, "") }] };
    throw error;
  }
}
