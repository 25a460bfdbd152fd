import { describe, expect, it } from "vitest";
import { CASE_CELLS, caseCells, caseRows } from "./envelope.cells";
import { loadCaseRowValues } from "./envelope.schema";

// The page's data carries the grid's rows as arrays of cells (envelope.cells): a cell of the grid's row
// left out of CASE_CELLS would be lost on the way to the form, and saved empty.
describe("a load case row as the page's data carries it", () => {
  const rolling = { id: "R1", kind: "rolling" as const, rule: "14 CFR 23.349", mach: 0.3, altitude: 3000, weight: 58_000, nz: 2.5, massCase: "MTOW", tailLoad: -1200, flaps: true, roll: { fraction: 0.75, aileron: 12 }, excluded: false };
  const row = loadCaseRowValues(rolling, "SI");

  it("names every cell of the grid's row, once", () => {
    expect([...CASE_CELLS].sort()).toEqual(Object.keys(row).sort());
  });

  it("comes back as the same row", () => {
    expect(caseRows(caseCells([row, loadCaseRowValues({ ...rolling, roll: undefined, flaps: undefined, excluded: true }, "US")]))).toEqual([row, loadCaseRowValues({ ...rolling, roll: undefined, flaps: undefined, excluded: true }, "US")]);
  });
});
