import { describe, expect, it } from "vitest";
import { parseCase } from "./parse";
import { runCase, runCaseAsync, type RunProgress } from "./run";

// An invented wing and a sweep of 40 distinct Mach numbers (a Mach grid) with 2 500 cases.
const doc = {
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, cpMin: -0.5 },
      { y: 8.7, xLe: 0.5, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, cpMin: -0.45 },
    ],
  },
  method: { stations: 10, strips: 16, compressibility: "karman-tsien", output: "summary" },
  cases: Array.from({ length: 2500 }, (_, i) => ({ id: `c${i}`, mach: 0.3 + 0.01 * (i % 40), altitude: 3000, weight: 52000, nz: 1 + (i % 7) / 4 })),
};

describe("runCaseAsync: the same run, pausing between steps for a job that reports its progress", { timeout: 120_000 }, () => {
  it("gives exactly runCase's result, with the solves and the cases counted upwards", async () => {
    const parsed = parseCase(doc);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    const seen: RunProgress[] = [];
    const result = await runCaseAsync(parsed.value, { onProgress: (p) => void seen.push(p) });
    const sync: RunProgress[] = [];
    expect(result).toEqual(runCase(parsed.value, { onProgress: (p) => sync.push(p) }));
    // The same progress as the command line reports, in the same order.
    expect(seen).toEqual(sync);
    const solves = seen.filter((p) => p.phase === "solves").map((p) => p.done);
    expect(solves.length).toBeGreaterThan(5);
    expect(solves).toEqual([...solves].sort((a, b) => a - b));
    expect(solves[solves.length - 1]).toBe(result.method.machGrid!.solves);
    expect(seen.filter((p) => p.phase === "cases")).toEqual([1000, 2000].map((done) => ({ phase: "cases", done, total: 2500 })));
  });

  it("lets other work of the process run between two steps (a timer set in one report has fired by the next)", async () => {
    const parsed = parseCase(doc);
    if (!parsed.ok) throw new Error("must parse");
    let reports = 0;
    let fired = 0;
    await runCaseAsync(parsed.value, {
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
