import { describe, expect, it } from "vitest";
import { parsed, sweepDocument } from "./test-helpers";
import { runCase, runCaseAsync, type RunProgress } from "./run";

// An invented wing and a sweep of 40 distinct Mach numbers (a Mach grid) with 2 500 cases.
const doc = sweepDocument(2500, 40, 0.01, { strips: 16 });

describe("runCaseAsync: the same run, pausing between steps for a job that reports its progress", { timeout: 120_000 }, () => {
  it("gives exactly runCase's result, with the solves and the cases counted upwards", async () => {
    const file = parsed(doc);
    const seen: RunProgress[] = [];
    const result = await runCaseAsync(file, { onProgress: (p) => void seen.push(p) });
    const sync: RunProgress[] = [];
    expect(result).toEqual(runCase(file, { onProgress: (p) => sync.push(p) }));
    // The same progress as the command line reports, in the same order.
    expect(seen).toEqual(sync);
    const solves = seen.filter((p) => p.phase === "solves").map((p) => p.done);
    expect(solves.length).toBeGreaterThan(5);
    expect(solves).toEqual([...solves].sort((a, b) => a - b));
    expect(solves[solves.length - 1]).toBe(result.method.machGrid!.solves);
    expect(seen.filter((p) => p.phase === "cases")).toEqual([1000, 2000].map((done) => ({ phase: "cases", done, total: 2500 })));
  });

  it("lets other work of the process run between two steps (a timer set in one report has fired by the next)", async () => {
    const file = parsed(doc);
    let reports = 0;
    let fired = 0;
    await runCaseAsync(file, {
      onProgress: async () => {
        // Timers of equal delay fire in order: ours, set now, before the one the run waits on next.
        expect(fired).toBe(reports);
        reports++;
        setTimeout(() => fired++, 0);
      },
    });
    expect(reports).toBeGreaterThan(5);
  });
});
