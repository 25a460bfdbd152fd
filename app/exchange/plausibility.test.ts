import { describe, expect, it } from "vitest";
import { isEngineError } from "../engine/errors";
import { parseCase } from "./parse";
import { runCase } from "./run";

// Plausible-input rules (docs/engine.md, "Plausible input"): impossible input is refused naming the field,
// unusual input runs with a warning, and no documented number is ever NaN, Infinity or null.

const wing = (over: { s?: number; rootChord?: number; tipXLe?: number; a0?: number; clMax?: number; cpMin?: number } = {}) => {
  const s = over.s ?? 8;
  const cr = over.rootChord ?? 2;
  return {
    stations: [
      { y: 0, xLe: 0, chord: cr, twist: 0, a0: over.a0 ?? 6.1, alphaL0: -2, cmAc: -0.05, ...(over.clMax ? { clMax: over.clMax } : {}), ...(over.cpMin ? { cpMin: over.cpMin } : {}) },
      { y: s, xLe: over.tipXLe ?? 0.3 * (s / 8), chord: 0.45 * cr, twist: -2, a0: over.a0 ?? 6.1, alphaL0: -1.5, cmAc: -0.04, ...(over.clMax ? { clMax: over.clMax } : {}), ...(over.cpMin ? { cpMin: over.cpMin } : {}) },
    ],
  };
};
const doc = (w: ReturnType<typeof wing>, cases: Record<string, unknown>[], method: Record<string, unknown> = { stations: 12, strips: 24 }) => ({ schema: "spanwright.case/1", wing: w, method, cases });

function problems(d: unknown) {
  const p = parseCase(d);
  return p.ok ? [] : p.problems;
}

/** Refusal by the schema or by the engine: the field and the message, whichever answers. */
function refusal(d: unknown): { path: string; message: string } | undefined {
  const p = parseCase(d);
  if (!p.ok) return p.problems[0];
  try {
    runCase(p.value);
  } catch (e) {
    if (isEngineError(e)) return { path: e.field ?? "(document)", message: e.message };
    throw e;
  }
  return undefined;
}

const run = (d: unknown) => {
  const p = parseCase(d);
  if (!p.ok) throw new Error(p.problems.map((x) => `${x.path}: ${x.message}`).join("; "));
  return runCase(p.value);
};

describe("impossible input is refused, naming the field (the audit's examples)", () => {
  it("an 89° sweep (which trimmed to α = 264°)", () => {
    const r = refusal(doc(wing({ tipXLe: 8 * Math.tan((89 * Math.PI) / 180) }), [{ id: "c", mach: 0.3, altitude: 0, weight: 60000, nz: 1 }]));
    expect(r?.path).toBe("wing.stations[1].xLe");
    expect(r?.message).toMatch(/sweep of 89\.0°.*beyond 70°/);
  });

  it("a semispan of 1e-9 m (which trimmed to 9e19°)", () => {
    const r = refusal(doc(wing({ s: 1e-9, rootChord: 1e-10 }), [{ id: "c", mach: 0.3, altitude: 0, weight: 60000, nz: 1 }]));
    expect(r?.path).toBe("wing.stations[1].y");
    expect(r?.message).toMatch(/semispan of 1\.000e-9 m is outside 0\.05 to 150 m/);
  });

  it("a0 = 1e6, a0 given per degree, chord 1e6 m", () => {
    expect(problems(doc(wing({ a0: 1e6 }), [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }]))[0]).toEqual({ path: "wing.stations[0].a0", message: expect.stringMatching(/outside 2 to 4π/) });
    expect(problems(doc(wing({ a0: 0.11 }), [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }]))[0]).toEqual({ path: "wing.stations[0].a0", message: expect.stringMatching(/per-degree value/) });
    const big = problems(doc(wing({ rootChord: 1e6 }), [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }])).map((p) => p.path);
    expect(big).toContain("wing.stations[0].chord");
  });

  it("nz = 1e6 and weight = 1e308 (which overflowed to null loads with exit status 0)", () => {
    expect(problems(doc(wing(), [{ id: "c", mach: 0.3, altitude: 0, weight: 60000, nz: 1e6 }]))).toEqual([{ path: "cases[0].nz", message: expect.stringMatching(/within ±20/) }]);
    expect(problems(doc(wing(), [{ id: "c", mach: 0.3, altitude: 0, weight: 1e308, nz: 1 }]))).toEqual([{ path: "cases[0].weight", message: expect.stringMatching(/at most 2e\+7 N/) }]);
  });

  it("a trimmed case the wing cannot carry below 30° is refused, naming nz and giving the CL it would need", () => {
    const r = refusal(doc(wing(), [{ id: "slow", mach: 0.05, altitude: 0, weight: 2e5, nz: 4 }]));
    expect(r?.path).toBe("cases[0].nz");
    expect(r?.message).toMatch(/would need CL = .* beyond ±30°/);
  });

  it("an aircraft lighter than its own wing", () => {
    const d = { ...doc(wing(), [{ id: "c", mach: 0.3, altitude: 0, weight: 5000, nz: 1 }]), wing: { ...wing(), mass: { kg: 400 } } };
    expect(refusal(d)?.path).toBe("cases[0].weight");
  });

  it("an aspect ratio far outside any wing, and an angle of attack beyond ±30°", () => {
    const stubby = wing({ s: 0.5, rootChord: 20 });
    expect(refusal(doc(stubby, [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }]))).toEqual({ path: "wing.stations", message: expect.stringMatching(/aspect ratio .* outside 0\.5 to 100/) });
    expect(problems(doc(wing(), [{ id: "c", mach: 0.3, altitude: 0, alpha: 45 }]))[0].path).toBe("cases[0].alpha");
  });
});

describe("absurd values in every field are refused naming that field and its rule (an engineer's sweep of 0, −1, 1e-300, 1e6, 1e15, 1e308 and 1e999)", () => {
  const alphaCase = [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }];
  const trimmed = [{ id: "c", mach: 0.3, altitude: 0, weight: 60000, nz: 1 }];
  const withMass = (mass: Record<string, unknown>, cases: Record<string, unknown>[] = trimmed) => ({ ...doc(wing(), cases), wing: { ...wing(), mass } });

  it("a root chord of 1e-300 m (which ran, giving a section cl of 1e298) is refused as smaller than any wing's chord", () => {
    const w = wing();
    w.stations[0] = { ...w.stations[0]!, chord: 1e-300 };
    expect(refusal(doc(w, trimmed))).toEqual({ path: "wing.stations[0].chord", message: expect.stringMatching(/less than 0\.0001 of the largest chord \(0\.9 m\)/) });
  });

  it("a root chord under 5 % of the largest runs with a warning naming it; a pointed tip does not", () => {
    const w = wing();
    w.stations[0] = { ...w.stations[0]!, chord: 0.02 };
    expect(run(doc(w, alphaCase)).cases[0].warnings.join(" ")).toMatch(/root chord 0\.02 m, under 5 % of the largest/);
    const pointed = wing();
    pointed.stations[1] = { ...pointed.stations[1]!, chord: 0.01 };
    expect(run(doc(pointed, alphaCase)).cases[0].warnings.join(" ")).not.toMatch(/chord/);
  });

  it("a structural mass or an item of 1e6, 1e15 or 1e308 kg names its own kg (the refusal named the case's weight, with Infinity N)", () => {
    for (const kg of [2e6, 1e15, 1e308]) {
      expect(problems(withMass({ kg }))).toEqual([{ path: "wing.mass.kg", message: expect.stringMatching(/at most 1e\+6 kg/) }]);
      expect(problems(withMass({ kg: 100, items: [{ id: "e", kg, x: 0.5, y: 2 }] }))).toEqual([{ path: "wing.mass.items[0].kg", message: expect.stringMatching(/at most 1e\+6 kg/) }]);
    }
  });

  it("a mass item 1e6 m or 1e308 m aft of the wing (which ran, or overflowed naming the case) is refused naming its x", () => {
    for (const x of [1e6, -1e6, 1e308]) {
      const p = problems(withMass({ kg: 100, items: [{ id: "e", kg: 50, x, y: 2 }] }));
      expect(p).toEqual([{ path: "wing.mass.items[0].x", message: expect.stringMatching(/must lie within 3 of the largest chords \(2 m\) of the wing, -6 to 8 m/) }]);
    }
    // An engine a chord ahead of the leading edge is a usual place.
    expect(problems(withMass({ kg: 100, items: [{ id: "e", kg: 50, x: -2, y: 2 }] }))).toEqual([]);
  });

  it("a tail load of 1e15 N names the tail load (the refusal named nz)", () => {
    const p = problems(doc(wing(), [{ id: "c", mach: 0.3, altitude: 0, weight: 60000, nz: 1, tailLoad: 1e15 }]));
    expect(p).toEqual([{ path: "cases[0].tailLoad", message: expect.stringMatching(/within ±2e\+7 N/) }]);
  });

  it("a0 = 1e-300 is refused as out of range, not called a per-degree value", () => {
    expect(problems(doc(wing({ a0: 1e-300 }), alphaCase))[0]).toEqual({ path: "wing.stations[0].a0", message: expect.stringMatching(/outside 2 to 4π/) });
  });

  it("a number too large for a double (1e999 in the JSON reads as Infinity) is called not finite", () => {
    const d = JSON.parse(JSON.stringify(doc(wing(), alphaCase)).replace('"altitude":0', '"altitude":1e999'));
    expect(problems(d)).toEqual([{ path: "cases[0].altitude", message: "must be a finite number (got Infinity)" }]);
  });
});

describe("malformed stations are named, never thrown (a chord of 0 crashed the parser)", () => {
  const at = (i: number, over: Record<string, number>) => {
    const w = wing();
    w.stations[i] = { ...w.stations[i], ...over };
    return doc(w, [{ id: "c", mach: 0.3, altitude: 0, alpha: 2 }]);
  };

  it.each([0, -1])("a chord of %s at the root or the tip is a refusal naming that station's chord", (chord) => {
    for (const i of [0, 1]) {
      const p = problems(at(i, { chord }));
      expect(p).toEqual([{ path: `wing.stations[${i}].chord`, message: "must be greater than 0" }]);
    }
  });

  it("a negative or zero a0 is refused as such, not called a per-degree value", () => {
    for (const a0 of [-6.1, 0]) {
      const p = problems(at(0, { a0 }));
      expect(p).toEqual([{ path: "wing.stations[0].a0", message: "must be greater than 0 (per radian)" }]);
    }
    // A small positive slope is the per-degree mistake, and is called so.
    expect(problems(at(0, { a0: 0.105 }))[0]!.message).toMatch(/per-degree value/);
  });

  it("the engine's own check names a non-positive a0 the same way (for callers that bypass the schema)", async () => {
    const { wingPlausibility } = await import("../engine/plausibility");
    const w = wing();
    const r = wingPlausibility([{ ...w.stations[0]!, a0: -6.1 }, w.stations[1]!]);
    expect(r.refusals).toEqual([{ field: "wing.stations[0].a0", message: "must be greater than 0 (per radian)", malformed: true }]);
  });
});

describe("unusual input runs, with a warning", () => {
  it("Mach 0.99 without cpMin warns that the critical Mach number is not checked (it ran silently)", () => {
    const r = run(doc(wing(), [{ id: "fast", mach: 0.99, altitude: 11000, alpha: 0.5 }]));
    expect(r.cases[0].regime).toBe("unchecked");
    expect(r.cases[0].warnings.join(" ")).toMatch(/no section gives cpMin: the critical Mach number is not checked/);
    // Below Mach 0.5 it does not matter and nothing is said.
    expect(run(doc(wing(), [{ id: "slow", mach: 0.3, altitude: 0, alpha: 2 }])).cases[0].warnings).toEqual([]);
  });

  it("a trimmed angle of attack beyond the sections' stall is flagged with the angle at which the first station stalls", () => {
    const r = run(doc(wing({ clMax: 1.4 }), [{ id: "A", mach: 0.25, altitude: 0, weight: 52000, nz: 3.8 }]));
    const c = r.cases[0];
    expect(c.warnings.join(" ")).toMatch(/trimmed angle of attack .* is beyond the sections' stall: the first station reaches its clMax at/);
    const m = /trimmed angle of attack ([\d.]+)° .* clMax at ([\d.]+)°/.exec(c.warnings.join(" "))!;
    expect(Number(m[1])).toBeGreaterThan(Number(m[2]));
    // The stall angle is where the first station's cl reaches clMax: at that angle exactly one station is at its clMax.
    const at = run(doc(wing({ clMax: 1.4 }), [{ id: "s", mach: 0.25, altitude: 0, alpha: Number(m[2]) }]));
    const worst = Math.max(...at.cases[0].stations!.map((s) => s.cl));
    expect(worst).toBeCloseTo(1.4, 2);
  });

  it("an unusual section slope, sweep and load factor are named in a warning", () => {
    const r = run(doc(wing({ a0: 7.8, tipXLe: 8 * Math.tan((55 * Math.PI) / 180) }), [{ id: "c", mach: 0.3, altitude: 0, weight: 20000, nz: 12 }]));
    const w = r.cases[0].warnings.join(" ");
    expect(w).toMatch(/unusual input.*section slope a0 7\.8/);
    expect(w).toMatch(/quarter-chord sweep 5\d\.\d° on panel 1/);
    expect(w).toMatch(/load factor 12 is unusual/);
  });
});

describe("no NaN, Infinity or null where a number is documented", { timeout: 60_000 }, () => {
  const extremes: [string, unknown][] = [
    ["smallest semispan and strips", doc(wing({ s: 0.05, rootChord: 0.01 }), [{ id: "c", mach: 0.2, altitude: 0, weight: 0.5, nz: 1 }], { stations: 2, strips: 8 })],
    ["largest nz and weight", doc(wing({ s: 60, rootChord: 12 }), [
      { id: "w", mach: 0.85, altitude: 0, weight: 2e7, nz: 2 },
      { id: "n", mach: 0.85, altitude: 0, weight: 2e6, nz: 20 },
    ])],
    ["Mach 0 by alpha, Mach 0.999 at 32 km", doc(wing({ cpMin: -0.4 }), [
      { id: "m0", mach: 0, altitude: 0, alpha: 30 },
      { id: "m999", mach: 0.999, altitude: 32000, alpha: -30 },
    ])],
    ["steepest accepted sweep and slope", doc(wing({ a0: 4 * Math.PI, tipXLe: 8 * Math.tan((69.9 * Math.PI) / 180) }), [{ id: "c", mach: 0.6, altitude: 5000, alpha: 29.9 }])],
  ];
  it.each(extremes)("%s", (_name, d) => {
    const r = run(d);
    const text = JSON.stringify(r);
    const numbers: unknown[] = [];
    JSON.parse(text, (key, value) => {
      if (!["machCritical", "strips", "terms", "machGrid"].includes(key)) numbers.push(value);
      return value;
    });
    expect(numbers).not.toContain(null);
    for (const c of r.cases) {
      for (const v of [c.beta, c.dynamicPressure, c.alpha, c.cl, c.clAlpha, c.root.shear, c.root.bending, c.root.torsion]) expect(Number.isFinite(v)).toBe(true);
      for (const s of c.stations ?? []) for (const v of Object.values(s)) expect(Number.isFinite(v)).toBe(true);
    }
  });
});
