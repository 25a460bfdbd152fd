import { describe, expect, it } from "vitest";
import { parseCase } from "./parse";
import { writeResultJson } from "./result-json";
import { runCase } from "./run";
import type { CaseResult } from "./schema";

// An invented two-station wing and 2 500 trimmed cases: more than two of the writer's batches.
const doc = {
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, cpMin: -0.5 },
      { y: 8.7, xLe: 0.5, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, cpMin: -0.45 },
    ],
  },
  method: { stations: 10, compressibility: "karman-tsien", output: "summary" },
  cases: Array.from({ length: 2500 }, (_, i) => ({ id: `c${i}`, mach: 0.3 + 0.05 * (i % 4), altitude: 3000, weight: 52000, nz: 1 + (i % 7) / 4 })),
};

function written(result: CaseResult) {
  const parts: string[] = [];
  writeResultJson(result, (text) => parts.push(text));
  return parts;
}

// The command line's output is JSON (RFC 8259) exactly as JSON.stringify writes it: the writer must not change a byte.
describe("writeResultJson: the command line's JSON, written in pieces", () => {
  const parsed = parseCase(doc);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  const result = runCase(parsed.value);

  it("writes JSON.stringify's text byte for byte, ending in a newline, never as one piece", () => {
    const parts = written(result);
    expect(parts.join("")).toBe(`${JSON.stringify(result)}\n`);
    expect(Math.max(...parts.map((p) => p.length))).toBeLessThan(JSON.stringify(result).length / 2);
  });

  it("leaves out members JSON.stringify leaves out, and writes an empty case list", () => {
    const odd = { ...result, cases: [], envelope: undefined } as unknown as CaseResult;
    expect(written(odd).join("")).toBe(`${JSON.stringify(odd)}\n`);
  });
});
