import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseCase } from "./parse";
import { runCase } from "./run";

const dir = join(__dirname, "..", "..", "docs", "examples");
const files = readdirSync(dir).filter((f) => f.endsWith(".json"));

describe("docs/examples", () => {
  it("has the demo cases", () => expect(files.length).toBeGreaterThanOrEqual(3));

  it.each(files)("%s parses and runs, and trimmed cases are in equilibrium", (f) => {
    const p = parseCase(JSON.parse(readFileSync(join(dir, f), "utf8")));
    expect(p.ok ? [] : p.problems).toEqual([]);
    if (!p.ok) return;
    const r = runCase(p.value);
    const mass = p.value.wing.mass;
    p.value.cases.forEach((c, i) => {
      if (c.weight === undefined) return;
      // Beam statics: root shear = (nz·W − P)/2 − nz·g·(m + Σ fill·m_item) per semispan.
      const fill = p.value.massCases?.find((m) => m.id === c.massCase)?.fill ?? {};
      const items = (mass?.items ?? []).reduce((s, it) => s + it.kg * (fill[it.id] ?? 1), 0);
      expect(r.cases[i].root.shear).toBeCloseTo((c.nz! * c.weight - (c.tailLoad ?? 0)) / 2 - c.nz! * 9.80665 * ((mass?.kg ?? 0) + items), 3);
    });
  });
});
