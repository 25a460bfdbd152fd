import { describe, expect, it } from "vitest";
import { joukowski, joukowskiTable } from "../../tests/fixtures/engine/joukowski";
import type { CompressibilityRule } from "./compressibility";
import { evaluateCase } from "./load-case";
import { buildMachGrid, MACH_GRID_DEFAULTS, solutionDifference } from "./mach-grid";
import type { WingStation } from "./planform";
import type { SolveOptions, WingModel } from "./superposition";
import { solveMach } from "./superposition";

// A cranked, swept, twisted wing with section suction peaks (invented data).
const stations: WingStation[] = [
  { y: 0, xLe: 0, chord: 2.4, twist: 0, a0: 6.1, alphaL0: -2.2, cmAc: -0.055, clMax: 1.6, cpMin: -0.5 },
  { y: 3, xLe: 0.4, chord: 2.0, twist: -1, a0: 6.0, alphaL0: -2.0, cmAc: -0.05, clMax: 1.55, cpMin: -0.48 },
  { y: 9, xLe: 2.2, chord: 0.9, twist: -3, a0: 5.8, alphaL0: -1.5, cmAc: -0.035, clMax: 1.4, cpMin: -0.45 },
];
const model: WingModel = { stations, axis: { rootChordFraction: 0.35, tipChordFraction: 0.4 }, massKg: 300 };

// A deterministic scatter of Mach numbers in the range (no Math.random: tests are repeatable).
const sample = (lo: number, hi: number, n: number) => Array.from({ length: n }, (_, k) => lo + (hi - lo) * ((k * 0.6180339887498949) % 1));

// Many solves per test: a generous limit, so a busy machine cannot fail them (no timing in the checks).
describe("Mach grid: many distinct Mach numbers from a few solves, with a checked interpolation error", { timeout: 120_000 }, () => {
  it.each<CompressibilityRule>(["prandtl-glauert", "karman-tsien", "laitone"])("%s: every interpolated solution is within the tolerance of a direct solve", (rule) => {
    const opts: SolveOptions = { spanwise: "vortex-lattice", rule, stations: 30, resolution: 40 };
    const grid = buildMachGrid(model, opts, 0.15, 0.8);
    expect(grid.nodes.length).toBeLessThan(60);
    expect(grid.maxError).toBeLessThanOrEqual(MACH_GRID_DEFAULTS.tolerance / 2);
    for (const m of sample(0.15, 0.8, 12)) {
      const direct = solveMach(model, m, opts);
      const interpolated = grid.solutionAt(m);
      expect(interpolated.mach).toBe(m);
      expect(solutionDifference(direct, interpolated)).toBeLessThan(MACH_GRID_DEFAULTS.tolerance);
      // Exact at any Mach: β, the rule's section scaling and cm.
      expect(interpolated.beta).toBe(direct.beta);
      expect(interpolated.cm).toEqual(direct.cm);
      // A trimmed case's loads then differ by no more than the tolerance times the loads at CL = 1.
      const lc = { id: "c", mach: m, altitude: 0, weightN: 30000, nz: 1.5 };
      const a = evaluateCase(direct, lc);
      const b = evaluateCase(interpolated, lc);
      const scale = Math.max(...a.bending.map(Math.abs)) / Math.max(a.CL, 1);
      expect(Math.abs(a.root.bending - b.root.bending)).toBeLessThan(2 * MACH_GRID_DEFAULTS.tolerance * scale * Math.max(a.CL, 1));
      expect(b.warnings.filter((w) => !/clMax/.test(w))).toEqual(a.warnings.filter((w) => !/clMax/.test(w)));
    }
  });

  it("with chordwise pressures: the point-by-point scaling at each case's own Mach number, the distributions within the tolerance", () => {
    // Exact incompressible pressures of a Joukowski section (closed form, tests/fixtures/engine/joukowski.ts).
    const sec = joukowski(0.1, 0.04);
    const xs = Array.from({ length: 61 }, (_, k) => 0.5 * (1 - Math.cos((Math.PI * k) / 60)));
    const pressures = [-2, 0, 2, 4].map((alphaDeg) => ({ alphaDeg, ...joukowskiTable(sec, alphaDeg, xs) }));
    const withPressures: WingModel = { ...model, stations: stations.map((s, i) => (i < 2 ? { ...s, pressures } : s)) };
    const opts: SolveOptions = { spanwise: "vortex-lattice", rule: "karman-tsien", stations: 20, resolution: 30 };
    const grid = buildMachGrid(withPressures, opts, 0.2, 0.6);
    for (const m of sample(0.2, 0.6, 6)) {
      const direct = solveMach(withPressures, m, opts);
      const interpolated = grid.solutionAt(m);
      expect(interpolated.sectionScaling).toEqual(direct.sectionScaling);
      expect(interpolated.sectionScaling).toContain("point-by-point");
      expect(interpolated.scale).toEqual(direct.scale);
      expect(interpolated.cm).toEqual(direct.cm);
      expect(solutionDifference(direct, interpolated)).toBeLessThan(MACH_GRID_DEFAULTS.tolerance);
    }
  });

  it("solves directly where the rule turns singular at a section (no interpolation across the jump to Prandtl–Glauert scaling)", () => {
    const opts: SolveOptions = { spanwise: "vortex-lattice", rule: "laitone", stations: 12, resolution: 24 };
    const grid = buildMachGrid(model, opts, 0.3, 0.95);
    expect(grid.directRanges.length).toBeGreaterThan(0);
    const [lo] = grid.directRanges[0];
    expect(lo).toBeLessThan(0.95);
    const m = 0.5 * (lo + 0.95);
    expect(grid.solutionAt(m)).toEqual(solveMach(model, m, opts));
  });
});
