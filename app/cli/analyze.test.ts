import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const root = join(__dirname, "..", "..");
const tsx = join(root, "node_modules", ".bin", "tsx");
const cli = join(root, "app", "cli", "analyze.ts");
const run = (args: string[], input?: string) => spawnSync(tsx, [cli, ...args], { cwd: root, input, encoding: "utf8" });

const doc = {
  schema: "spanwright.case/1",
  wing: {
    stations: [
      { y: 0, xLe: 0, chord: 2.2, twist: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055 },
      { y: 8.7, xLe: 0.5, chord: 0.95, twist: -2, a0: 5.9, alphaL0: -1.6, cmAc: -0.04 },
    ],
  },
  method: { stations: 8, spanwise: "lifting-line" },
  cases: [{ id: "cruise", mach: 0.45, altitude: 5000, weight: 62000, nz: 1 }],
};
const dir = mkdtempSync(join(tmpdir(), "spanwright-cli-"));
const good = join(dir, "good.json");
writeFileSync(good, JSON.stringify(doc));

// Each check starts node + tsx (seconds on a busy machine): a generous limit, so the tests never depend on timing.
describe("analyze CLI", { timeout: 120_000 }, () => {
  it("stops quietly when the reader of its output stops reading (as `| head` does)", async () => {
    // Output well beyond a pipe's buffer, and a reader that closes the pipe at the first bytes: the
    // command line must not die with a stack trace.
    const example = JSON.parse(readFileSync(join(root, "docs/examples/kf60-tern-wing.json"), "utf8")) as { cases: { id: string }[] };
    const sweep = { ...example, cases: Array.from({ length: 40 }, (_, k) => example.cases.map((c) => ({ ...c, id: `${c.id}-${k}` }))).flat() };
    const file = join(mkdtempSync(join(tmpdir(), "sw-pipe-")), "sweep.json");
    writeFileSync(file, JSON.stringify(sweep));
    const child = spawn(tsx, [cli, file], { cwd: root, stdio: ["ignore", "pipe", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d: Buffer) => (stderr += d.toString()));
    child.stdout.once("data", () => child.stdout.destroy());
    const code = await new Promise<number | null>((resolve) => child.on("close", (c) => resolve(c)));
    expect(stderr).toBe("");
    expect(code).toBe(0);
  });

  it("prints the result JSON for a file", () => {
    const r = run([good]);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.schema).toBe("spanwright.result/1");
    expect(out.cases[0].root.shear).toBeCloseTo(31000, 3);
  });

  it("reads stdin with - and prints CSV with --csv", () => {
    const r = run(["--csv", "-"], JSON.stringify(doc));
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines[0]).toBe("case,y,chord,cl,cm,lift,shear,bending,torsion");
    expect(lines).toHaveLength(9);
  });

  it("exits 2 with one line per problem for a bad case, writing nothing to stdout", () => {
    const bad = structuredClone(doc) as typeof doc & { cases: Record<string, unknown>[] };
    bad.cases[0].mach = 1.2;
    bad.cases[0].colour = "red";
    const r = run(["-"], JSON.stringify(bad));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    const lines = r.stderr.trim().split("\n");
    expect(lines).toContain("cases[0].mach: must be below 1 (subsonic rules only)");
    expect(lines.some((l) => l.startsWith("cases[0].colour: "))).toBe(true);
  });

  it("carries mass items, mass cases and the tail load: root shear = (nz·W − P)/2 − nz·g·m (beam statics)", () => {
    const withMass = structuredClone(doc) as Record<string, unknown> & typeof doc;
    (withMass.wing as Record<string, unknown>).mass = { items: [{ id: "engine", kg: 400, x: 0.6, y: 3 }, { id: "tank", kg: 500, x: 0.8, yFrom: 1, yTo: 5 }] };
    withMass.massCases = [{ id: "reserve", fill: { tank: 0.2 } }];
    Object.assign(withMass.cases[0], { massCase: "reserve", tailLoad: -3000 });
    const r = run(["-"], JSON.stringify(withMass));
    expect(r.status).toBe(0);
    // (1·62 000 + 3000)/2 − 1·9.80665·(400 + 0.2·500) = 32 500 − 4903.325 N.
    expect(JSON.parse(r.stdout).cases[0].root.shear).toBeCloseTo(32500 - 4903.325, 3);
    Object.assign(withMass.cases[0], { massCase: "full" });
    const bad = run(["-"], JSON.stringify(withMass));
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('cases[0].massCase: names no mass case of massCases ("full")');
  });

  it("carries the aileron and rolling cases: root shear of each side by equilibrium plus or minus the aileron's strip lift, the other side in the CSV", () => {
    const rolling: Record<string, unknown> = { ...structuredClone(doc), wing: { ...doc.wing, aileron: { yFrom: 6, yTo: 8, dClPerDeg: 0.04, deltaAtVa: 20 } } };
    rolling.cases = [{ ...doc.cases[0], id: "roll", roll: { fraction: 0.75, aileron: 10 } }];
    const r = run(["-"], JSON.stringify(rolling));
    expect(r.status).toBe(0);
    const c = JSON.parse(r.stdout).cases[0];
    // Chord 2.2 m at the root to 0.95 m at 8.7 m: ∫₆⁸ c dy = 2 m × c(7 m) = 2 × (2.2 − 1.25·7/8.7) = 2.388506 m² (by hand).
    const dL = c.dynamicPressure * 0.04 * 10 * 2 * (2.2 - (1.25 * 7) / 8.7);
    expect(c.root.shear).toBeCloseTo(31000 + dL, 3);
    expect(c.roll.other.root.shear).toBeCloseTo(0.75 * 31000 - dL, 3);
    const csv = run(["--csv", "-"], JSON.stringify(rolling)).stdout.trim().split("\n");
    expect(csv.filter((l) => l.startsWith("roll (other side),"))).toHaveLength(8);
    rolling.cases = [{ id: "roll", mach: 0.45, altitude: 5000, alpha: 4, roll: { fraction: 0.75 } }];
    const bad = run(["-"], JSON.stringify(rolling));
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain("cases[0].roll: is only for a case given by weight and nz");
  });

  it("refuses an overflowing weight (it answered null loads with exit status 0) and an impossible sweep, naming the field", () => {
    const heavy = structuredClone(doc) as typeof doc & { cases: Record<string, unknown>[] };
    heavy.cases[0].weight = 1e308;
    const r = run(["-"], JSON.stringify(heavy));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/^cases\[0\]\.weight: must be at most/m);
    const swept = structuredClone(doc);
    swept.wing.stations[1].xLe = 8.7 * Math.tan((89 * Math.PI) / 180);
    swept.method.spanwise = "vortex-lattice";
    const s = run(["-"], JSON.stringify(swept));
    expect(s.status).toBe(2);
    expect(s.stderr).toMatch(/^wing\.stations\[1\]\.xLe: .*sweep of 89\.0°/m);
  });

  it("names a chord of 0 and a negative a0 in one line each, exit status 2 (a chord of 0 printed a stack trace, exit 1)", () => {
    const bad = structuredClone(doc);
    bad.wing.stations[1].chord = 0;
    bad.wing.stations[0].a0 = -6.05;
    const r = run(["-"], JSON.stringify(bad));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toEqual(["wing.stations[0].a0: must be greater than 0 (per radian)", "wing.stations[1].chord: must be greater than 0"]);
  });

  it("reports progress on stderr for a long sweep (a Mach grid here), and the stated interpolation error", () => {
    const sweep = { ...structuredClone(doc), method: { stations: 8, spanwise: "vortex-lattice", strips: 16 } };
    sweep.cases = Array.from({ length: 100 }, (_, i) => ({ id: `c${i}`, mach: 0.2 + 0.004 * i, altitude: 3000, weight: 62000, nz: 1 }));
    const r = run(["-"], JSON.stringify(sweep));
    expect(r.status).toBe(0);
    const lines = r.stderr.trim().split("\n");
    expect(lines[0]).toBe("analyze: 100 cases, 100 distinct Mach numbers: solving on a Mach grid, interpolating between");
    expect(lines.some((l) => /^analyze: \d+ spanwise solves$/.test(l))).toBe(true);
    expect(lines[lines.length - 1]).toMatch(/^analyze: done: \d+ solves for 100 Mach numbers on a grid of \d+; interpolation error .* \(held under 1e-4\)$/);
    expect(JSON.parse(r.stdout).method.machGrid.machs).toBe(100);
    expect(run(["--quiet", "-"], JSON.stringify(sweep)).stderr).toBe("");
  });

  it("reads and writes text beyond ASCII as UTF-8, from a file and from stdin", () => {
    const named = { ...structuredClone(doc), title: "Flügel — ±", cases: [{ ...doc.cases[0], id: "Vₐ böe \u2028" }] };
    const file = join(dir, "named.json");
    writeFileSync(file, JSON.stringify(named));
    for (const r of [run([file]), run(["-"], JSON.stringify(named))]) {
      expect(r.status).toBe(0);
      expect(JSON.parse(r.stdout).cases[0].id).toBe("Vₐ böe \u2028");
    }
  });

  it("fails clearly for a missing file and for invalid JSON", () => {
    const m = run([join(dir, "nope.json")]);
    expect(m.status).not.toBe(0);
    expect(m.stderr).toMatch(/no such file/);
    const j = run(["-"], "{ not json");
    expect(j.status).not.toBe(0);
    expect(j.stderr).toMatch(/not valid JSON/);
    expect(run([]).status).not.toBe(0);
  });
});
