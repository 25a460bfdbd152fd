import { describe, expect, it } from "vitest";
import { parsed, sweepDocument } from "./test-helpers";
import { writeResultJson } from "./result-json";
import { runCase } from "./run";
import type { CaseResult } from "./schema";

// An invented two-station wing and 2 500 trimmed cases: more than two of the writer's batches.
const doc = sweepDocument(2500, 4, 0.05);

function written(result: CaseResult) {
  const parts: string[] = [];
  writeResultJson(result, (text) => parts.push(text));
  return parts;
}

// The command line's output is JSON (RFC 8259) exactly as JSON.stringify writes it: the writer must not change a byte.
describe("writeResultJson: the command line's JSON, written in pieces", () => {
  const result = runCase(parsed(doc));

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
