import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

// `npm run analyze` runs app/cli/launch.mjs: the same command line from a prebuilt bundle. It must
// answer byte for byte as the TypeScript entry does (tsx app/cli/analyze.ts), refusals included.
const root = join(__dirname, "..", "..");
const tsx = join(root, "node_modules", ".bin", "tsx");
const dir = mkdtempSync(join(tmpdir(), "spanwright-launch-"));
const cache = join(dir, "cache");
const env = { ...process.env, SPANWRIGHT_CLI_CACHE: cache };
const viaTsx = (args: string[], input?: string) => spawnSync(tsx, [join(root, "app", "cli", "analyze.ts"), ...args], { cwd: root, input, encoding: "utf8", env });
const viaLauncher = (args: string[], input?: string) => spawnSync(process.execPath, [join(root, "app", "cli", "launch.mjs"), ...args], { cwd: root, input, encoding: "utf8", env });

const wing = {
  stations: [
    { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, clMax: 1.5, cpMin: -0.6 },
    { y: 8.7, xLe: 0.5, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, clMax: 1.4, cpMin: -0.5 },
  ],
  mass: { kg: 250 },
};
const good = {
  schema: "spanwright.case/1",
  wing,
  method: { stations: 12, output: "summary" },
  cases: [
    { id: "cruise", mach: 0.45, altitude: 5000, weight: 62000, nz: 1 },
    { id: "pull-up \"A\" é", mach: 0.3, altitude: 1500, weight: 62000, nz: 3.8 },
    { id: "alpha", mach: 0.3, altitude: 0, alpha: 6 },
  ],
};
// Refusals of every kind at once: wrong type, out of range, unknown field, missing.
const bad = {
  schema: "spanwright.case/1",
  wing: { stations: [{ ...wing.stations[0], chord: "wide", a0: -1 }, { ...wing.stations[1], colour: "red" }] },
  method: { stations: "many" },
  cases: [{ id: "a", mach: 1.2, altitude: 99999, weight: 62000 }, { id: "a", mach: 0.3, altitude: 0, alpha: 3, nz: 1 }, { mach: 0.3 }],
};

describe("the command line's launcher (npm run analyze)", { timeout: 180_000 }, () => {
  it.each([
    ["a good case file, summary output", ["-"], JSON.stringify(good)],
    ["the same with station tables (full output)", ["-"], JSON.stringify({ ...good, method: { stations: 12 } })],
    ["CSV output", ["--csv", "-"], JSON.stringify(good)],
    ["a case file with every kind of refusal", ["-"], JSON.stringify(bad)],
    ["invalid JSON", ["-"], "{ not json"],
    ["an unknown option", ["--fast", "-"], "{}"],
  ])("%s: the same exit status, stdout and stderr as the TypeScript entry", (_name, args, input) => {
    const a = viaTsx(args, input);
    const b = viaLauncher(args, input);
    expect(b.status).toBe(a.status);
    expect(b.stderr).toBe(a.stderr);
    expect(b.stdout).toBe(a.stdout);
  });

  it("names every bad field", () => {
    const r = viaLauncher(["-"], JSON.stringify(bad));
    expect(r.status).toBe(2);
    for (const path of ["wing.stations[0].chord", "wing.stations[0].a0", "wing.stations[1].colour", "method.stations", "cases[0].mach", "cases[0].altitude", "cases[2].id", "cases[2].altitude"]) {
      expect(r.stderr).toMatch(new RegExp(`^${path.replace(/[[\].]/g, "\\$&")}: `, "m"));
    }
  });

  it("builds its bundle once, reuses it, and rebuilds it when a file it was built from has changed", () => {
    const file = join(dir, "good.json");
    writeFileSync(file, JSON.stringify(good));
    expect(viaLauncher([file]).status).toBe(0);
    const bundle = join(cache, "analyze.mjs");
    const manifestFile = join(cache, "manifest.json");
    const built = statSync(bundle).mtimeMs;
    expect(viaLauncher([file]).status).toBe(0);
    expect(statSync(bundle).mtimeMs).toBe(built);
    // As if app/exchange/schema.ts had been edited since the build.
    const manifest = JSON.parse(readFileSync(manifestFile, "utf8"));
    expect(Object.keys(manifest.inputs)).toContain("app/exchange/schema.ts");
    manifest.inputs["app/exchange/schema.ts"] = "0:0";
    writeFileSync(manifestFile, JSON.stringify(manifest));
    const r = viaLauncher([file]);
    expect(r.status).toBe(0);
    expect(statSync(bundle).mtimeMs).not.toBe(built);
    expect(JSON.parse(readFileSync(manifestFile, "utf8")).inputs["app/exchange/schema.ts"]).not.toBe("0:0");
  });
});
