import type { CaseResult } from "./schema";

const CASES_PER_WRITE = 1000;

/**
 * The result as `JSON.stringify(result) + "\n"` would write it, byte for byte, but member by member
 * and a thousand cases at a time: a sweep's document is tens of megabytes, and holding it whole as
 * one string and then one buffer adds about a hundred megabytes to the command line's peak memory.
 */
export function writeResultJson(result: CaseResult, write: (text: string) => void) {
  let first = true;
  write("{");
  for (const [key, value] of Object.entries(result)) {
    // JSON.stringify leaves out members whose value it cannot write (undefined).
    const text = key === "cases" ? "" : (JSON.stringify(value) as string | undefined);
    if (text === undefined) continue;
    write(`${first ? "" : ","}${JSON.stringify(key)}:`);
    first = false;
    if (key !== "cases") {
      write(text);
      continue;
    }
    write("[");
    for (let i = 0; i < result.cases.length; i += CASES_PER_WRITE) {
      write((i ? "," : "") + result.cases.slice(i, i + CASES_PER_WRITE).map((c) => JSON.stringify(c)).join(","));
    }
    write("]");
  }
  write("}\n");
}
