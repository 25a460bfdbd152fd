import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";

// The engine is pure TypeScript: only relative imports and well-known numeric packages (STYLE.md §2).
const ALLOWED_PACKAGES = new Set(["ml-matrix"]);
// Tests may also use the test runner and node's file system (this scan).
const TEST_ONLY = new Set(["vitest", "node:fs", "node:path"]);
const root = join(__dirname);

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : p.endsWith(".ts") ? [p] : [];
  });
}

const IMPORT = /(?:^|\n)\s*(?:import|export)\s[^;]*?from\s+["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)|require\(\s*["']([^"']+)["']\s*\)/g;

describe("engine boundary", () => {
  const all = files(root);
  it("finds the engine sources", () => {
    expect(all.some((f) => f.endsWith("index.ts"))).toBe(true);
  });

  it.each(all.map((f) => [relative(root, f), f]))("%s imports only relative files or allowed numeric packages", (_name, file) => {
    const src = readFileSync(file, "utf8");
    const isTest = file.endsWith(".test.ts");
    const bad: string[] = [];
    for (const m of src.matchAll(IMPORT)) {
      const spec = m[1] ?? m[2] ?? m[3];
      if (spec.startsWith("./") || spec.startsWith("../")) {
        if (!join(file, "..", spec).startsWith(root)) bad.push(spec);
        continue;
      }
      if (ALLOWED_PACKAGES.has(spec) || (isTest && TEST_ONLY.has(spec))) continue;
      bad.push(spec);
    }
    expect(bad).toEqual([]);
  });

  it("uses no clock or randomness (deterministic)", () => {
    for (const f of all.filter((x) => !x.endsWith(".test.ts"))) {
      const src = readFileSync(f, "utf8");
      expect(src, f).not.toMatch(/Date\.now|Math\.random|new Date\(/);
    }
  });
});
