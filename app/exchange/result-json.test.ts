import { describe, expect, it } from "vitest";
import { parsed, sweepDocument } from "./test-helpers";
import { PIECE_BYTES, ResultJson } from "./result-json";
import type { ResultRest } from "./run";
import { runCase, runCaseEach } from "./run";
import type { ResultCase } from "./schema";

// An invented two-station wing and 3 000 trimmed cases: about 1.2 MB of JSON, more than one of the writer's pieces.
const doc = sweepDocument(3000, 4, 0.05);

function written(rest: ResultRest, cases: ResultCase[]) {
  const json = new ResultJson();
  for (const c of cases) json.addCase(c);
  const parts: Uint8Array[] = [];
  json.writeTo(rest, (bytes) => parts.push(bytes));
  return parts;
}

// The command line's output is JSON (RFC 8259) exactly as JSON.stringify writes it: the writer must not change a byte.
describe("ResultJson: the command line's JSON, built case by case", () => {
  const result = runCase(parsed(doc));
  const text = `${JSON.stringify(result)}\n`;

  it("writes JSON.stringify's text of runCase's result byte for byte from runCaseEach, ending in a newline, never as one piece", () => {
    const cases: ResultCase[] = [];
    const rest = runCaseEach(parsed(doc), {}, (c) => cases.push(c));
    const parts = written(rest, cases);
    expect(Buffer.concat(parts).toString("utf8")).toBe(text);
    expect(text.length).toBeGreaterThan(PIECE_BYTES);
    expect(Math.max(...parts.map((p) => p.length))).toBeLessThanOrEqual(PIECE_BYTES);
  });

  it("writes text beyond ASCII as UTF-8", () => {
    const named = { ...result, cases: result.cases.slice(0, 3).map((c, i) => ({ ...c, id: ["Vₐ ±", "Böe \"1\"", "\u2028"][i] })) };
    const { cases, ...rest } = named;
    expect(Buffer.concat(written(rest, cases)).toString("utf8")).toBe(`${JSON.stringify(named)}\n`);
  });

  it("leaves out members JSON.stringify leaves out, and writes an empty case list", () => {
    const odd = { ...result, cases: [], envelope: undefined } as unknown as ResultRest;
    expect(Buffer.concat(written(odd, [])).toString("utf8")).toBe(`${JSON.stringify({ ...odd, cases: [] })}\n`);
  });
});
