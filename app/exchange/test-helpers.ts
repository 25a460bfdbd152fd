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

/** An invented two-station wing with one cpMin per section, and a sweep of `count` trimmed cases at `machs` Mach numbers from M 0.3. */
export function sweepDocument(count: number, machs: number, step: number, method: Record<string, unknown> = {}) {
  return {
    schema: "spanwright.case/1",
    wing: {
      stations: [
        { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, cpMin: -0.5 },
        { y: 8.7, xLe: 0.5, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, cpMin: -0.45 },
      ],
    },
    method: { stations: 10, compressibility: "karman-tsien", output: "summary", ...method },
    cases: Array.from({ length: count }, (_, i) => ({ id: `c${i}`, mach: 0.3 + step * (i % machs), altitude: 3000, weight: 52000, nz: 1 + (i % 7) / 4 })),
  };
}
