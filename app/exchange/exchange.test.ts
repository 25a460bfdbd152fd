import { describe, expect, it } from "vitest";
import { z } from "zod";
import { isa } from "../engine/atmosphere";
import { ENGINE_VERSION } from "../engine/index";
import { CaseFileSchema, CaseResultSchema } from "./schema";
import { parseCase } from "./parse";
import { runCase } from "./run";
import { resultToCsv } from "./csv";

const base = () => ({
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2.1, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, clMax: 1.55, cpMin: -0.62 },
      { y: 7.5, xLe: 0.35, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, clMax: 1.4, cpMin: -0.55 },
    ],
    axis: { rootChordFraction: 0.35, tipChordFraction: 0.35 },
    mass: { kg: 180, distribution: "chord" },
  },
  method: { compressibility: "karman-tsien", spanwise: "vortex-lattice", stations: 12 },
  cases: [
    { id: "alpha-4", mach: 0.45, altitude: 3000, alpha: 4.0 },
    { id: "A-pos", mach: 0.55, altitude: 4500, weight: 52000, nz: 3.8 },
  ],
});

function problems(doc: unknown) {
  const r = parseCase(doc);
  if (r.ok) throw new Error("expected problems");
  return r.problems;
}

describe("parseCase (spanwright.case/1)", () => {
  it("accepts the contract example and applies defaults", () => {
    const d = base() as Record<string, unknown>;
    delete d.method;
    const w = d.wing as Record<string, unknown>;
    delete w.axis;
    const r = parseCase(d);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.method).toEqual({ compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: 40, output: "full" });
    expect(r.value.wing.axis).toEqual({ rootChordFraction: 0.25, tipChordFraction: 0.25 });
  });

  it("names unknown fields as errors, with their path", () => {
    const d = base();
    (d.cases[1] as Record<string, unknown>).speed = 3;
    (d.wing.stations[0] as Record<string, unknown>).thickness = 0.12;
    const p = problems(d).map((x) => x.path);
    expect(p).toContain("cases[1].speed");
    expect(p).toContain("wing.stations[0].thickness");
  });

  it("applies every rule of the contract with a message naming the rule", () => {
    const d = base();
    d.cases[1].mach = 1.0;
    d.cases[0].altitude = 99999;
    d.wing.stations[1].y = 0;
    d.wing.stations[1].chord = 0;
    d.wing.stations[0].cpMin = 0.1;
    const p = problems(d);
    const by = Object.fromEntries(p.map((x) => [x.path, x.message]));
    expect(by["cases[1].mach"]).toBe("must be below 1 (subsonic rules only)");
    expect(by["cases[0].altitude"]).toMatch(/between 0 and 32000 m/);
    expect(by["wing.stations[1].y"]).toMatch(/strictly increasing/);
    expect(by["wing.stations[1].chord"]).toMatch(/greater than 0/);
    expect(by["wing.stations[0].cpMin"]).toMatch(/below 0/);
  });

  it("requires exactly one of alpha or (weight and nz), and unique ids", () => {
    const d = { ...base(), cases: [] as Record<string, unknown>[] };
    d.cases = [
      { id: "a", mach: 0.3, altitude: 0, alpha: 2, nz: 2 },
      { id: "b", mach: 0.3, altitude: 0, weight: 50000 },
      { id: "c", mach: 0.3, altitude: 0 },
      { id: "c", mach: 0.3, altitude: 0, alpha: 1 },
      { id: "e", mach: 0, altitude: 0, weight: 50000, nz: 1 },
    ];
    const by = Object.fromEntries(problems(d).map((x) => [x.path, x.message]));
    expect(by["cases[0].nz"]).toMatch(/either alpha or weight with nz, not both/);
    expect(by["cases[1].nz"]).toMatch(/required/);
    expect(by["cases[2].alpha"]).toMatch(/either alpha or weight with nz/);
    expect(by["cases[3].id"]).toMatch(/unique/);
    expect(by["cases[4].mach"]).toMatch(/above 0 for a case given by weight and nz/);
  });

  it("reports missing and mistyped fields", () => {
    const d = base() as unknown as { wing: { stations: Record<string, unknown>[] }; schema: string };
    delete d.wing.stations[0].a0;
    d.wing.stations[1].chord = "wide";
    d.schema = "other/2";
    const by = Object.fromEntries(problems(d).map((x) => [x.path, x.message]));
    expect(by["wing.stations[0].a0"]).toBe("is required");
    expect(by["wing.stations[1].chord"]).toBe("must be a number");
    expect(by.schema).toMatch(/spanwright\.case\/1/);
    expect(problems(null)[0].path).toBe("(document)");
  });

  it("the schema exports as JSON Schema (zod 4 toJSONSchema)", () => {
    const js = z.toJSONSchema(CaseFileSchema, { io: "input" }) as { properties: Record<string, unknown> };
    expect(Object.keys(js.properties)).toEqual(expect.arrayContaining(["schema", "wing", "method", "cases"]));
  });

  it("the altitude limit agrees with the engine's ISA range", () => {
    expect(() => isa(32000)).not.toThrow();
    expect(problems({ ...base(), cases: [{ id: "x", mach: 0.3, altitude: 32001, alpha: 1 }] })[0].path).toBe("cases[0].altitude");
  });
});

describe("runCase → spanwright.result/1", () => {
  const r = parseCase(base());
  if (!r.ok) throw new Error("fixture must parse");
  const out = runCase(r.value);

  it("has exactly the contract's fields", () => {
    expect(Object.keys(out)).toEqual(["schema", "engine", "method", "wing", "cases", "envelope"]);
    expect(Object.keys(out.method)).toEqual(["compressibility", "spanwise", "strips", "terms", "stations", "output", "convergence", "sectionScaling", "criticalMach", "machGrid"]);
    expect(CaseResultSchema.strict().safeParse(out).success).toBe(true);
    expect(out.schema).toBe("spanwright.result/1");
    expect(out.engine).toBe(ENGINE_VERSION);
    expect(Object.keys(out.wing)).toEqual(["area", "span", "aspectRatio", "taperRatio", "mac", "yMac", "xLeMac"]);
    expect(Object.keys(out.cases[0])).toEqual([
      "id", "mach", "altitude", "beta", "dynamicPressure", "alpha", "cl", "clAlpha", "machCritical", "regime", "warnings", "stations", "root",
    ]);
    expect(Object.keys(out.cases[0].stations![0])).toEqual(["y", "chord", "cl", "cm", "lift", "shear", "bending", "torsion"]);
    expect(Object.keys(out.cases[0].root)).toEqual(["shear", "bending", "torsion"]);
    expect(Object.keys(out.envelope[0])).toEqual([
      "y", "shearMax", "shearMaxCase", "shearMin", "shearMinCase", "bendingMax", "bendingMaxCase", "bendingMin", "bendingMinCase",
      "torsionMax", "torsionMaxCase", "torsionMin", "torsionMinCase",
    ]);
    expect(out.cases[0].stations).toHaveLength(12);
    expect(JSON.parse(JSON.stringify(out))).toEqual(out);
  });

  it("geometry of the contract example: S 22.875, b 15, AR 9.836, λ 0.452, MAC 1.597", () => {
    expect(out.wing.area).toBeCloseTo(22.875, 10);
    expect(out.wing.span).toBe(15);
    expect(out.wing.aspectRatio).toBeCloseTo(9.836, 3);
    expect(out.wing.taperRatio).toBeCloseTo(0.452, 3);
    expect(out.wing.mac).toBeCloseTo(1.597, 3);
  });

  it("trimmed case: root shear = nz·W/2 − nz·g·m (equilibrium), PG-style β, q = 0.7·p·M²", () => {
    const c = out.cases[1];
    expect(c.root.shear).toBeCloseTo((3.8 * 52000) / 2 - 3.8 * 9.80665 * 180, 3);
    expect(c.beta).toBeCloseTo(Math.sqrt(1 - 0.55 ** 2), 12);
    expect(c.dynamicPressure).toBeCloseTo(0.7 * isa(4500).pressure * 0.55 ** 2, 6);
    expect(c.regime).toBe("subcritical");
    expect(c.stations![0].y).toBe(0);
    expect(c.root.bending).toBe(c.stations![0].bending);
  });

  it("summary output drops the station tables but keeps root loads and the envelope", () => {
    const d = base();
    (d.method as Record<string, unknown>).output = "summary";
    const p = parseCase(d);
    if (!p.ok) throw new Error("must parse");
    const s = runCase(p.value);
    expect(s.cases[0].stations).toBeUndefined();
    expect(s.cases[1].root).toEqual(out.cases[1].root);
    expect(s.envelope).toEqual(out.envelope);
  });

  it("unchecked regime and null machCritical without cpMin", () => {
    const d = base();
    for (const st of d.wing.stations) delete (st as Record<string, unknown>).cpMin;
    const p = parseCase(d);
    if (!p.ok) throw new Error("must parse");
    const c = runCase(p.value).cases[0];
    expect(c.machCritical).toBeNull();
    expect(c.regime).toBe("unchecked");
  });

  it("CSV has one row per station per case", () => {
    const csv = resultToCsv(out).trim().split("\n");
    expect(csv[0]).toBe("case,y,chord,cl,cm,lift,shear,bending,torsion");
    expect(csv).toHaveLength(1 + 2 * 12);
    expect(csv[1].startsWith("alpha-4,0,2.1,")).toBe(true);
  });
});

describe("method.strips: the vortex-lattice resolution the user sets, and what the output says was used", { timeout: 120_000 }, () => {
  const run = (method: Record<string, unknown>) => {
    const p = parseCase({ ...base(), method: { ...base().method, ...method } });
    if (!p.ok) throw new Error(p.problems.map((x) => `${x.path}: ${x.message}`).join("; "));
    return runCase(p.value);
  };

  it("is honoured and reported, with the engine's default (60) where absent", () => {
    const coarse = run({ strips: 16 });
    const fine = run({ strips: 120 });
    const dflt = run({});
    expect(coarse.method.strips).toBe(16);
    expect(fine.method.strips).toBe(120);
    expect(dflt.method.strips).toBe(60);
    expect(dflt.method.terms).toBeNull();
    // A different resolution gives a (slightly) different solve.
    expect(coarse.cases[0].clAlpha).not.toBe(fine.cases[0].clAlpha);
    expect(dflt.method.convergence.halfResolution).toBe(30);
    expect(coarse.method.convergence.halfResolution).toBe(8);
  });

  it("the convergence estimate (change on halving the strips) is at least the remaining change to 16× the strips, and shrinks as strips grow", () => {
    // The lattice converges at first order in the strip count (each doubling halves the change), so the change on
    // halving bounds the distance to the converged solve: Richardson's argument with p = 1 (a geometric series).
    const at = (n: number) => run({ strips: n, compressibility: "prandtl-glauert" });
    const r40 = at(40);
    const r640 = at(640);
    const trueClAlpha = Math.abs(r40.cases[0].clAlpha / r640.cases[0].clAlpha - 1);
    expect(r40.method.convergence.clAlpha).toBeGreaterThanOrEqual(trueClAlpha);
    expect(r40.method.convergence.clAlpha).toBeLessThan(3 * trueClAlpha);
    expect(at(160).method.convergence.clAlpha).toBeLessThan(r40.method.convergence.clAlpha / 2);
    expect(r40.method.convergence.rootBending).toBeGreaterThan(0);
    expect(r40.method.convergence.loading).toBeGreaterThan(0);
  });

  it("is refused out of range, and with the lifting line (which has no strips)", () => {
    for (const [strips, rule] of [
      [4, /at least 8/],
      [5000, /at most 2000/],
      [12.5, /whole number/],
    ] as const) {
      const p = parseCase({ ...base(), method: { ...base().method, strips } });
      expect(p.ok ? [] : p.problems).toEqual([{ path: "method.strips", message: expect.stringMatching(rule) }]);
    }
    const p = parseCase({ ...base(), method: { ...base().method, spanwise: "lifting-line", strips: 40 } });
    expect(p.ok ? [] : p.problems).toEqual([{ path: "method.strips", message: expect.stringMatching(/vortex lattice only/) }]);
    const ll = run({ spanwise: "lifting-line" });
    expect(ll.method.strips).toBeNull();
    expect(ll.method.terms).toBe(80);
  });
});

describe("sweeps of many distinct Mach numbers share a Mach grid (it was one solve per Mach number)", { timeout: 120_000 }, () => {
  const sweep = (n: number) => ({
    ...base(),
    method: { compressibility: "karman-tsien", spanwise: "vortex-lattice", stations: 12, strips: 30, output: "summary" },
    cases: Array.from({ length: n }, (_, i) => ({ id: `c${i}`, mach: 0.3 + (0.4 * i) / n, altitude: 2000, weight: 52000, nz: 1 + (i % 3) / 2 })),
  });

  it("solves a few dozen times for 3000 distinct Mach numbers, states the grid and its error, and agrees with direct solves within it", () => {
    const p = parseCase(sweep(3000));
    if (!p.ok) throw new Error("must parse");
    const progress: string[] = [];
    const r = runCase(p.value, { onProgress: (x) => progress.push(x.phase) });
    const g = r.method.machGrid!;
    expect(g.machs).toBe(3000);
    expect(g.solves).toBeLessThan(100);
    expect(g.maxError).toBeLessThanOrEqual(g.tolerance);
    expect(progress).toContain("solves");
    expect(progress).toContain("cases");
    for (const i of [7, 1500, 2999]) {
      const one = parseCase({ ...sweep(3000), cases: [sweep(3000).cases[i]] });
      if (!one.ok) throw new Error("must parse");
      const direct = runCase(one.value);
      expect(direct.method.machGrid).toBeNull();
      const a = direct.cases[0].root;
      const b = r.cases[i].root;
      // Tolerance is a fraction of the loads at CL = 1; these cases fly at CL below 2.
      const atCl1 = Math.abs(a.bending) / Math.max(1, direct.cases[0].cl);
      expect(Math.abs(a.bending - b.bending)).toBeLessThan(2 * g.tolerance * atCl1 * 2);
      expect(Math.abs(a.shear - b.shear)).toBeLessThan(1e-6 * Math.abs(a.shear));
    }
  });

  it("up to 24 distinct Mach numbers each gets its own solve (no grid)", () => {
    const p = parseCase(sweep(24));
    if (!p.ok) throw new Error("must parse");
    expect(runCase(p.value).method.machGrid).toBeNull();
  });
});
