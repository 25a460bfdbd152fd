import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { joukowski, joukowskiTable } from "../../tests/fixtures/engine/joukowski";
import { parseCase } from "./parse";
import { runCase } from "./run";
import { parseSections } from "./sections";

// A straight, untwisted wing (invented data) with one single cpMin per station.
const doc = (cases: Record<string, unknown>[], rule = "prandtl-glauert") => ({
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 1.5, twist: 0, a0: 6.2, alphaL0: -2, cmAc: -0.05, cpMin: -0.35 },
      { y: 6, xLe: 0, chord: 1.5, twist: 0, a0: 6.2, alphaL0: -2, cmAc: -0.05, cpMin: -0.35 },
    ],
  },
  method: { compressibility: rule, spanwise: "vortex-lattice", stations: 16, strips: 24 },
  cases,
});
const parsed = (d: unknown) => {
  const p = parseCase(d);
  if (!p.ok) throw new Error(JSON.stringify(p.problems));
  return p.value;
};
// Cp,min against lift: −0.35 up to cl 0.5, −0.60 from cl 0.6 (a step, so each case's value is known exactly).
const step = [
  { cl: -1, cpMin: -0.35 },
  { cl: 0.5, cpMin: -0.35 },
  { cl: 0.6, cpMin: -0.6 },
  { cl: 3, cpMin: -0.6 },
];
const sections = (extra: Record<string, unknown> = {}) => ({
  schema: "spanwright.sections/1",
  sections: [
    { y: 0, cpMinTable: step, ...extra },
    { y: 6, cpMinTable: step, ...extra },
  ],
});

describe("the critical Mach number at each case's own lift (Cp,min against lift, richer section data)", () => {
  const file = parsed(doc([
    { id: "low", mach: 0.72, altitude: 9000, alpha: -1 },
    { id: "high", mach: 0.72, altitude: 9000, alpha: 6 },
  ]));

  it("a low-lift case reads −0.35 and is subcritical at Mach 0.72; a high-lift case reads −0.60 and is not (Mcr 0.76450 and 0.68857, PG, REFERENCES 1.4 [C])", () => {
    const s = parseSections(sections(), file);
    if (!s.ok) throw new Error(JSON.stringify(s.problems));
    const r = runCase(file, { sections: s.value });
    expect(r.cases[0].machCritical).toBeCloseTo(0.7645, 5);
    expect(r.cases[0].regime).toBe("subcritical");
    expect(r.cases[1].machCritical).toBeCloseTo(0.68857, 5);
    expect(r.cases[1].regime).toBe("supercritical");
    expect(r.cases[1].warnings.join(" ")).toMatch(/critical Mach number 0\.6886 .*at this case's lift/);
    expect(r.method.criticalMach).toBe("cp-min-against-lift");
    // Without the table both cases share the single value's critical Mach number (what the engine did before).
    const plain = runCase(file);
    expect(plain.cases[0].machCritical).toBe(plain.cases[1].machCritical);
    expect(plain.method.criticalMach).toBe("single-cp-min");
  });

  it("a single cpMin belongs to a lift: unstated, a cruise-like 0.4 is assumed and a case with much more lift (or negative lift) is warned of; stated, the warning follows the stated lift", () => {
    const three = parsed(doc([
      { id: "low", mach: 0.72, altitude: 9000, alpha: -1 },
      { id: "high", mach: 0.72, altitude: 9000, alpha: 8 },
      { id: "negative", mach: 0.72, altitude: 9000, alpha: -6 },
    ]));
    const plain = runCase(three);
    expect(plain.cases[1].warnings.join(" ")).toMatch(/one cpMin per section, which belongs to a section cl of 0\.4 \(not stated.*reaches 0\.\d+ at y = 0\.000 m, far from it/);
    expect(plain.cases[0].warnings.join(" ")).not.toMatch(/one cpMin per section/);
    expect(plain.cases[2].warnings.join(" ")).toMatch(/reaches -0\.\d+ .* far from it/);
    const stated = parseSections({ schema: "spanwright.sections/1", sections: [{ y: 0, cpMinCl: 0.9 }, { y: 6, cpMinCl: 0.9 }] }, three);
    if (!stated.ok) throw new Error(JSON.stringify(stated.problems));
    const r = runCase(three, { sections: stated.value });
    expect(r.method.criticalMach).toBe("single-cp-min-at-stated-lift");
    expect(r.cases[1].warnings.join(" ")).not.toMatch(/one cpMin per section/);
    expect(r.cases[2].warnings.join(" ")).toMatch(/belongs to a section cl of 0\.9; this case's/);
  });

  it("a case beyond the table's lift range says the end value was used", () => {
    const short = parseSections({ schema: "spanwright.sections/1", sections: [0, 6].map((y) => ({ y, cpMinTable: [{ cl: 0, cpMin: -0.35 }, { cl: 0.3, cpMin: -0.4 }] })) }, file);
    if (!short.ok) throw new Error("must parse");
    expect(runCase(file, { sections: short.value }).cases[1].warnings.join(" ")).toMatch(/outside the lift range of its Cp,min table \(0 to 0\.3\): the end value was used/);
  });
});

describe("spanwright.sections/1 is checked against its case, naming every problem", () => {
  const file = parsed(doc([{ id: "c", mach: 0.5, altitude: 0, alpha: 2 }]));
  const problems = (d: unknown) => {
    const r = parseSections(d, file);
    return r.ok ? [] : r.problems;
  };
  it("refuses unknown fields, stations the case does not have, and badly ordered tables", () => {
    expect(problems({ ...sections(), extra: 1 })).toEqual([{ path: "sections:extra", message: expect.stringMatching(/not a field/) }]);
    expect(problems({ schema: "spanwright.sections/1", sections: [{ y: 3, cpMinCl: 0.5 }] })[0]).toEqual({ path: "sections:sections[0].y", message: expect.stringMatching(/y of a station of the case \(0, 6\)/) });
    const p = problems({ schema: "spanwright.sections/1", sections: [{ y: 0, cpMinTable: [{ cl: 0.5, cpMin: -0.4 }, { cl: 0.2, cpMin: -0.5 }] }] });
    expect(p[0]).toEqual({ path: "sections:sections[0].cpMinTable[1].cl", message: expect.stringMatching(/greater than the previous/) });
    const few = problems({ schema: "spanwright.sections/1", sections: [{ y: 0, pressures: [{ alpha: 0, x: [0, 1], cpUpper: [1, 0], cpLower: [1, 0] }] }] });
    expect(few[0].path).toBe("sections:sections[0].pressures");
  });
});

describe("point by point over chordwise pressures, through the exchange", { timeout: 120_000 }, () => {
  it("states point-by-point in the result and moves an angle-given case's lift against the single-cpMin default", () => {
    const sec = joukowski(0.1, 0.04);
    const xs = Array.from({ length: 61 }, (_, k) => 0.5 * (1 - Math.cos((Math.PI * k) / 60)));
    const pressures = [-2, 0, 2, 4].map((alpha) => ({ alpha, ...joukowskiTable(sec, alpha, xs) }));
    const file = parsed(doc([{ id: "c", mach: 0.6, altitude: 5000, alpha: 3 }], "karman-tsien"));
    const s = parseSections({ schema: "spanwright.sections/1", sections: [{ y: 0, pressures }, { y: 6, pressures }] }, file);
    if (!s.ok) throw new Error(JSON.stringify(s.problems));
    const pbp = runCase(file, { sections: s.value });
    const dflt = runCase(file);
    expect(pbp.method.sectionScaling).toBe("point-by-point");
    expect(dflt.method.sectionScaling).toBe("at-cp-min");
    expect(Math.abs(pbp.cases[0].cl / dflt.cases[0].cl - 1)).toBeGreaterThan(0.01);
  });

  it("the command line takes the sections document with --sections", () => {
    const dir = mkdtempSync(join(tmpdir(), "spanwright-sections-"));
    const c = join(dir, "case.json");
    const s = join(dir, "sections.json");
    writeFileSync(c, JSON.stringify(doc([{ id: "high", mach: 0.72, altitude: 9000, alpha: 6 }])));
    writeFileSync(s, JSON.stringify(sections()));
    const root = join(__dirname, "..", "..");
    const r = spawnSync(join(root, "node_modules", ".bin", "tsx"), [join(root, "app", "cli", "analyze.ts"), "--sections", s, c], { cwd: root, encoding: "utf8" });
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.cases[0].machCritical).toBeCloseTo(0.68857, 5);
    writeFileSync(s, JSON.stringify({ ...sections(), sections: [{ y: 2, cpMinCl: 0.3 }] }));
    const bad = spawnSync(join(root, "node_modules", ".bin", "tsx"), [join(root, "app", "cli", "analyze.ts"), "--sections", s, c], { cwd: root, encoding: "utf8" });
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/^sections:sections\[0\]\.y: must be the y of a station/m);
  }, 120_000);
});
