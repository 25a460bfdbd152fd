import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { criticalMach } from "./compressibility";
import type { CompressibilityRule } from "./compressibility";
import { trapezoidalWing } from "./planform";
import { schrenkDistribution } from "./schrenk";

// Reference cases kept as JSON in tests/fixtures/engine/ (values and sources inside each file).
const dir = join(__dirname, "..", "..", "tests", "fixtures", "engine");
const load = (f: string) => JSON.parse(readFileSync(join(dir, f), "utf8"));

describe("reference fixtures", () => {
  it("critical-mach.json (REFERENCES 1.4 [C])", () => {
    const fx = load("critical-mach.json");
    for (const row of fx.rows) {
      for (const rule of ["prandtl-glauert", "karman-tsien", "laitone"] as CompressibilityRule[]) {
        expect(Math.abs(criticalMach(rule, row.cp0Min) - row[rule])).toBeLessThan(fx.tolerance);
      }
    }
  });

  it("schrenk-trapezoid-computed.json (Schrenk's method, NACA TM 948, on a wing of our own; values computed, REFERENCES 3 [C])", () => {
    const fx = load("schrenk-trapezoid-computed.json");
    const w = fx.wing;
    const st = trapezoidalWing({ span: w.span, rootChord: w.rootChord, taperRatio: w.tipChord / w.rootChord });
    const S = ((w.rootChord + w.tipChord) / 2) * w.span;
    const d = schrenkDistribution(st, fx.stations.map((s: { eta: number }) => (s.eta * w.span) / 2));
    fx.stations.forEach((s: { cS: number; lift: number }, i: number) => {
      expect(d.cclAdditional[i]).toBeCloseTo(s.cS, 5);
      expect((w.liftN / S) * d.cclAdditional[i]).toBeCloseTo(s.lift, 1);
    });
  });
});
