import { describe, expect, it } from "vitest";
import type { EnvelopeRow } from "~/engine";
import { compareReports, inputChanges, type ComparedSnapshot } from "./report-comparison";

const row = (y: number, v: number, c = "A"): EnvelopeRow => ({
  y,
  shearMax: v,
  shearMaxCase: c,
  shearMin: -v,
  shearMinCase: c,
  bendingMax: 10 * v,
  bendingMaxCase: c,
  bendingMin: -10 * v,
  bendingMinCase: c,
  torsionMax: v / 10,
  torsionMaxCase: c,
  torsionMin: -v / 10,
  torsionMinCase: c,
});

const snap = (version: number, inputs: Record<string, unknown>, envelope: EnvelopeRow[], cases: string[]): ComparedSnapshot => ({
  reportNumber: `R${version}`,
  version,
  issuedAt: "2026-01-01T00:00:00.000Z",
  inputHash: "0".repeat(64),
  engineVersion: "1",
  inputs,
  result: { envelope, cases: cases.map((id) => ({ id, root: { shear: 0, bending: 0, torsion: 0 } })) },
});

describe("inputs compared field by field", () => {
  it("names each changed field by step, matches load cases by id and other rows by position", () => {
    const before = {
      basis: { mtow: 1000, altitudes: [0, 3000] },
      planform: { stations: [{ y: 0, chord: 2 }, { y: 5, chord: 1 }] },
      envelope: { cases: [{ id: "A", nz: 3.8 }, { id: "B", nz: -1.5 }] },
      loads: { semispanMass: 120 },
    };
    const after = {
      basis: { mtow: 1100, altitudes: [0, 3000, 6000] },
      planform: { stations: [{ y: 0, chord: 2 }, { y: 5, chord: 1.1 }] },
      envelope: { cases: [{ id: "B", nz: -1.5 }, { id: "A", nz: 4.4 }, { id: "C", nz: 2 }] },
      loads: { semispanMass: 120 },
    };
    expect(inputChanges(before, after)).toEqual([
      { step: "basis", field: "mtow", before: "1000", after: "1100" },
      { step: "basis", field: "altitudes › row 3", before: "(none)", after: "6000" },
      { step: "planform", field: "stations › row 2 › chord", before: "1", after: "1.1" },
      // Reordered cases are no change; a new case is one change, not one per field.
      { step: "envelope", field: "cases › A › nz", before: "3.8", after: "4.4" },
      { step: "envelope", field: "cases › C", before: "(none)", after: '{"id":"C","nz":2}' },
    ]);
    expect(inputChanges(before, before)).toEqual([]);
  });
});

describe("envelopes compared per station", () => {
  it("pairs stations one to one when both versions have the same ones", () => {
    const c = compareReports(snap(1, {}, [row(0, 100), row(5, 40)], ["A", "B"]), snap(2, {}, [row(0, 110, "B"), row(5, 40, "B")], ["B", "C"]));
    expect(c.interpolated).toBe(false);
    expect(c.stations[0]!.before.bendingMax).toBe(1000);
    expect(c.stations[0]!.after.bendingMax).toBe(1100);
    expect(c.stations[0]!.casesBefore.bendingMax).toBe("A");
    expect(c.stations[0]!.casesAfter.bendingMax).toBe("B");
    expect(c.casesAdded).toEqual(["C"]);
    expect(c.casesRemoved).toEqual(["A"]);
    expect(c.from.version).toBe(1);
    expect(c.to.version).toBe(2);
  });

  it("reads the earlier envelope at the later stations by linear interpolation when they differ", () => {
    const c = compareReports(snap(1, {}, [row(0, 100), row(4, 20)], ["A"]), snap(2, {}, [row(0, 100), row(1, 80), row(5, 0)], ["A"]));
    expect(c.interpolated).toBe(true);
    // At y = 1: 100 + (20 − 100)·(1/4) = 80; beyond the earlier tip (y = 5 > 4) its tip value, 20.
    expect(c.stations[1]!.before.shearMax).toBeCloseTo(80, 12);
    expect(c.stations[2]!.before.shearMax).toBe(20);
    expect(c.stations[1]!.before.bendingMin).toBeCloseTo(-800, 12);
  });
});
