import { describe, expect, it } from "vitest";
import { Matrix, solve } from "ml-matrix";
import { luFactor, luSolve } from "./linear-solve";

describe("dense LU solve", () => {
  it.each([1, 2, 3, 4, 5, 9, 37, 38])("n = %d agrees with ml-matrix (a well-known linear-algebra package) on a non-symmetric system needing pivoting", (n) => {
    const rows: number[][] = [];
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) - 0.5;
    for (let i = 0; i < n; i++) rows.push(Array.from({ length: n }, () => rnd()));
    if (n > 1) rows[0][0] = 0; // forces a row swap at the first step
    const b = Array.from({ length: n }, () => rnd());
    const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
    const x = luSolve(luFactor(Float64Array.from(rows.flat()), n), b);
    for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(ref[i], 9);
  });

  it("throws on a singular matrix", () => {
    expect(() => luFactor(Float64Array.from([1, 2, 2, 4]), 2)).toThrow(/singular/);
  });
});
