import { describe, expect, it } from "vitest";
import { keepRicherData, parseSectionCsv, sectionsWithUpload } from "./section-csv";
import type { SectionsData } from "./step-data";

const bytes = (text: string) => new TextEncoder().encode(text);

// A polar with a linear range of slope 0.1 per degree (5.73 per rad) and Cp,min growing with lift (invented data).
const polar = (y: number, cpMin: (a: number) => number) =>
  [-4, -2, 0, 2, 4, 6, 8, 10, 12, 14].map((a) => `${y},${a},${(0.1 * (a + 2)).toFixed(4)},-0.05,${cpMin(a).toFixed(4)}`).join("\n");

describe("section polar files with Cp,min per angle (they were refused)", () => {
  it("give a Cp,min table against lift up to the largest cl, and a single Cp,min quoted at cl 0.4", () => {
    const csv = `y,alpha,cl,cm,cpMin\n${polar(0, (a) => -0.4 - 0.12 * (a + 2))}\n${polar(5, (a) => -0.35 - 0.1 * (a + 2))}\n`;
    const r = parseSectionCsv(bytes(csv));
    if (!r.ok || r.kind === "pressures") throw new Error(JSON.stringify(r));
    const root = r.rows[0]!;
    expect(root.cpMinTable).toHaveLength(10);
    expect(root.cpMinTable![0]).toEqual({ cl: -0.2, cpMin: -0.16 });
    // cl = 0.4 is α = 2°: Cp,min = −0.4 − 0.12·4.
    expect(root.cpMinCl).toBe(0.4);
    expect(root.cpMin).toBeCloseTo(-0.88, 10);
  });

  it("a station with one Cp,min keeps the single value, as before", () => {
    const r = parseSectionCsv(bytes(`y,alpha,cl,cm,cpMin\n${polar(0, () => -0.5)}\n`));
    if (!r.ok || r.kind === "pressures") throw new Error("must parse");
    expect(r.rows[0]!.cpMin).toBe(-0.5);
    expect(r.rows[0]!.cpMinTable).toBeUndefined();
  });
});

describe("chordwise pressure files", () => {
  const x = [0, 0.02, 0.1, 0.3, 0.6, 1];
  const lines = (y: number, alpha: number) => x.map((v) => `${y},${alpha},${v},${(-0.5 * (1 - v) - 0.05 * alpha).toFixed(3)},${(0.2 * (1 - v)).toFixed(3)}`);
  const csv = ["y,alpha,x,cpUpper,cpLower", ...lines(0, 0), ...lines(0, 4), ...lines(5, 0), ...lines(5, 4)].join("\n");

  it("give pressures by station and angle, which join the saved rows at the same y and survive a typed edit", () => {
    const r = parseSectionCsv(bytes(csv));
    if (!r.ok || r.kind !== "pressures") throw new Error(JSON.stringify(r));
    expect(r.pressures.map((p) => p.y)).toEqual([0, 5]);
    expect(r.pressures[0]!.sets.map((s) => s.alpha)).toEqual([0, 4]);
    const saved: SectionsData = {
      rows: [
        { y: 0, a0: 6, alphaL0: -2, cmAc: -0.05 },
        { y: 5, a0: 6, alphaL0: -2, cmAc: -0.05 },
      ],
      source: { kind: "typed" },
      tables: [],
    };
    const merged = sectionsWithUpload(saved, r, { kind: "upload" });
    if (!("data" in merged)) throw new Error(merged.problem);
    const rows = (merged.data as SectionsData).rows;
    expect(rows[1]!.pressures![1]!.cpUpper[0]).toBeCloseTo(-0.7, 12);
    const edited = keepRicherData([{ y: 0, a0: 6.2, alphaL0: -2, cmAc: -0.05 }], { ...saved, rows });
    expect(edited[0]!.pressures).toEqual(rows[0]!.pressures);
    expect(sectionsWithUpload({ ...saved, rows: [saved.rows[0]!] }, r, { kind: "upload" })).toEqual({ problem: expect.stringMatching(/stations at y = 5 m, which the section data do not have/) });
  });

  it("refuse a station with a single angle or too few chord points, naming it", () => {
    const one = ["y,alpha,x,cpUpper,cpLower", ...lines(0, 0)].join("\n");
    const r = parseSectionCsv(bytes(one));
    expect(r.ok ? [] : r.problems.map((p) => p.message)).toEqual(["station y = 0 m: needs the distribution at 2 or more angles of attack"]);
  });
});

describe("a pressure file's problems name the station and angle", () => {
  it("too few chord points at one angle", () => {
    const csv = ["y,alpha,x,cpUpper,cpLower", "0,0,0,1,1", "0,0,0.5,-0.3,0.1", "0,0,1,0.1,0.1", ...[0, 0.02, 0.1, 0.3, 0.6, 1].map((v) => `0,4,${v},-0.4,0.1`)].join("\n");
    const r = parseSectionCsv(bytes(csv));
    expect(r.ok ? [] : r.problems.map((p) => p.message)).toEqual(["station y = 0 m, angle 0°, x: needs at least 5 chordwise points"]);
  });
});
