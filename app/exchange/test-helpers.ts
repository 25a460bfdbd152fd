// For the exchange layer's tests only: a document parsed or its refusals, by path.
import { parseCase } from "./parse";

/** The parsed document; throws with the problems where it is refused. */
export function parsed(d: unknown) {
  const r = parseCase(d);
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.value;
}

/** The refusals of a document that must be refused, message by path. */
export function problems(d: unknown): Record<string, string> {
  const r = parseCase(d);
  if (r.ok) throw new Error("expected problems");
  return Object.fromEntries(r.problems.map((p) => [p.path, p.message]));
}
