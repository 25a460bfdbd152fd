import type { ResultCase } from "~/exchange";

/**
 * The critical case of a result: the one whose root bending moment has the largest magnitude. The
 * loads page opens on it, and the report draws its distributions.
 */
export function criticalCase<C extends Pick<ResultCase, "root">>(cases: readonly C[]): C {
  return cases.reduce((a, b) => (Math.abs(b.root.bending) > Math.abs(a.root.bending) ? b : a));
}
