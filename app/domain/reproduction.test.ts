import { describe, expect, it } from "vitest";
import { compareValues } from "./reproduction";

describe("re-run comparison", () => {
  it("counts every number and finds none differing in equal documents, the ignored engine aside", () => {
    const doc = { engine: "0.7.0", cases: [{ id: "A", root: { shear: 87101.2, bending: 313520.5 } }], envelope: [{ y: 0, shearMax: 87101.2 }] };
    const now = { ...structuredClone(doc), engine: "0.8.0" };
    expect(compareValues({ result: doc }, { result: now }, { ignore: ["result.engine"] })).toEqual({ compared: 4, differing: 0, differences: [] });
  });

  it("reads the recomputed side as it would be stored: −0 is 0, a non-finite number null", () => {
    expect(compareValues({ a: 0, b: null }, { a: -0, b: Number.NaN })).toEqual({ compared: 1, differing: 0, differences: [] });
  });

  it("names each differing value by its path, and a part present in one only", () => {
    const c = compareValues({ cases: [{ root: { bending: 313520.5 } }], envelope: [1, 2] }, { cases: [{ root: { bending: 313520.50000000006 } }], envelope: [1, 2, 3] });
    expect(c.compared).toBe(4);
    expect(c.differing).toBe(2);
    expect(c.differences).toEqual([
      { path: "cases[0].root.bending", issued: "313520.5", now: "313520.50000000006" },
      { path: "envelope[2]", issued: "(absent)", now: "3" },
    ]);
  });
});
