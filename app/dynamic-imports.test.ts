import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { describe, expect, it } from "vitest";

/*
 * A module that one file imports with `import()` and another imports statically stays in the
 * static chunk: the dynamic import defers nothing, and the build prints an "ineffective dynamic
 * import" warning at every `npm start` that rebuilds. Checked here on the modules the build bundles
 * (everything under app/ but the entries that tsx and esbuild run from source: server/, cli/, the
 * job workers and the demo seed). A static import from a module that is itself only loaded by
 * `import()` (the SVG renderer's chunk importing the chart's) keeps both out of the first chunk.
 */

const APP = __dirname;
const EXTENSIONS = ["", ".ts", ".tsx", "/index.ts", "/index.tsx"];

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name);
    if (statSync(full).isDirectory()) return sources(full);
    return /\.(ts|tsx)$/.test(name) && !/\.test\.tsx?$/.test(name) ? [full] : [];
  });
}

/** The file an import specifier names, or undefined for a package or an unresolvable path. */
function resolveSpecifier(from: string, specifier: string): string | undefined {
  const base = specifier.startsWith("~/") ? join(APP, specifier.slice(2)) : specifier.startsWith(".") ? resolve(dirname(from), specifier) : undefined;
  if (!base) return undefined;
  for (const ext of EXTENSIONS) {
    const candidate = base + ext;
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return undefined;
}

const bundled = sources(APP).filter((file) => !/^(server\/|cli\/|jobs\/workers\.server\.ts$|demo\/seed\.server\.ts$)/.test(relative(APP, file)));

function importsOf(pattern: RegExp): Map<string, string[]> {
  const found = new Map<string, string[]>();
  for (const file of bundled) {
    const text = readFileSync(file, "utf8");
    for (const match of text.matchAll(pattern)) {
      const target = resolveSpecifier(file, match[1]!);
      if (target) found.set(target, [...(found.get(target) ?? []), relative(APP, file)]);
    }
  }
  return found;
}

describe("dynamic imports in the bundled app", () => {
  it("never name a module that is also imported statically", () => {
    // `import type` is erased, so it does not count; `export … from` does.
    const staticImports = importsOf(/^(?:import(?!\s+type\b)|export)\s[^;]*?\sfrom\s+"([^"]+)"/gms);
    const dynamicImports = importsOf(/\bimport\(\s*"([^"]+)"\s*\)/g);
    const both = [...dynamicImports.keys()]
      .filter((target) => (staticImports.get(target) ?? []).some((importer) => !dynamicImports.has(join(APP, importer))))
      .map((target) => `${relative(APP, target)}: import() in ${dynamicImports.get(target)!.join(", ")}; static import in ${staticImports.get(target)!.join(", ")}`);
    expect(both).toEqual([]);
  });
});
