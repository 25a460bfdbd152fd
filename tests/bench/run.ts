// Benchmarks of the engine (not timed tests): writes docs/benchmarks.md. Run with `npm run bench`.
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import { join } from "node:path";
import { performance } from "node:perf_hooks";
import { LuDecomposition, Matrix } from "ml-matrix";
import { luFactor } from "../../app/engine/linear-solve";
import { buildLiftingLine } from "../../app/engine/lifting-line";
import { buildVortexLattice } from "../../app/engine/vortex-lattice";
import { addToEnvelope, createEnvelope, envelopeRows } from "../../app/engine/envelope";
import { evaluateCase } from "../../app/engine/load-case";
import type { LoadCase } from "../../app/engine/load-case";
import { solveMach } from "../../app/engine/superposition";
import { parseCase } from "../../app/exchange/parse";
import { runCase } from "../../app/exchange/run";
import type { MachSolution, SolveOptions, WingModel } from "../../app/engine/superposition";

const root = join(import.meta.dirname, "..", "..");
const example = JSON.parse(readFileSync(join(root, "docs", "examples", "kf60-tern-wing.json"), "utf8"));
const model: WingModel = { stations: example.wing.stations, axis: example.wing.axis, massKg: example.wing.mass?.kg };

function time(fn: () => void, repeat: number): number {
  fn(); // warm-up (JIT)
  const t: number[] = [];
  for (let i = 0; i < repeat; i++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)];
}

const lines: string[] = [];
const out = (s = "") => {
  lines.push(s);
  console.log(s);
};
const cpu = os.cpus();
out("# Engine benchmarks");
out();
out("Written by `npm run bench` (tests/bench/run.ts). Medians of repeated runs after one warm-up run.");
out("Wing: the KF-60 Tern example (`docs/examples/kf60-tern-wing.json`, cranked, 3 stations).");
out();
out("## Machine");
out();
out(`- CPU: ${cpu[0]?.model ?? "unknown"} × ${cpu.length} logical cores`);
out(`- Memory: ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB; OS: ${os.type()} ${os.release()} (${os.arch()})`);
out(`- Node ${process.version}`);
out(`- Load average when the run started: ${os.loadavg().map((v) => v.toFixed(2)).join(" / ")} (1/5/15 min; the machine is shared, so other jobs can slow these numbers)`);
out();
out("## Spanwise solves (build + factorise + two right-hand sides)");
out();
out("| solver | resolution | unknowns | time (ms) |");
out("|---|---|---|---|");
for (const N of [20, 40, 80, 160, 320]) {
  const ms = time(() => buildLiftingLine(model.stations, { mach: 0.5, rule: "prandtl-glauert", resolution: N }).solveMany([() => 1, () => 0.01]), 5);
  out(`| lifting line | ${N} odd terms | ${N} | ${ms.toFixed(2)} |`);
}
let ms1200 = 0;
for (const m of [20, 60, 120, 400, 1200]) {
  const ms = time(() => buildVortexLattice(model.stations, { mach: 0.5, rule: "prandtl-glauert", resolution: m }).solveMany([() => 1, () => 0.01]), m >= 1000 ? 3 : 5);
  if (m === 1200) ms1200 = ms;
  out(`| vortex lattice | ${m} strips | ${m} | ${ms.toFixed(1)} |`);
}
out();
out(`Target: a 1 200-panel vortex-lattice solve well under a second → **${ms1200.toFixed(0)} ms** (${ms1200 < 1000 ? "met" : "missed"}).`);
{
  const n = 1200;
  const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? n : Math.sin(i * 7.1 + j * 3.3))));
  const tMl = time(() => new LuDecomposition(new Matrix(rows)), 2);
  const tOwn = time(() => luFactor(Float64Array.from(rows.flat()), n), 2);
  out(`Dense LU of 1 200 unknowns alone: engine blocked (rank-4) LU ${tOwn.toFixed(0)} ms, ml-matrix LuDecomposition ${tMl.toFixed(0)} ms.`);
}
out();

// Envelope: 10 000 load cases over 10 Mach numbers at 41 stations.
const opts: SolveOptions = { spanwise: "vortex-lattice", rule: "karman-tsien", stations: 41 };
// Realistic sweep of the demo aircraft: Mach 0.35–0.575, 0–4 000 m, nz from −1.24 to 3.1 (below stall).
const machs = Array.from({ length: 10 }, (_, i) => 0.35 + 0.025 * i);
const nzOf = (i: number) => -1.24 + ((i * 7) % 44) / 10;
const cases: LoadCase[] = [];
for (let i = 0; i < 10000; i++) {
  const mach = machs[i % 10];
  cases.push({ id: `c${i}`, mach, altitude: (i * 37) % 4000, weightN: 50000 + ((i * 13) % 12272), nz: nzOf(i) });
}
const superposed = () => {
  const sols = new Map<number, MachSolution>();
  for (const m of machs) sols.set(m, solveMach(model, m, opts));
  const env = createEnvelope(sols.get(machs[0])!.y);
  for (const c of cases) {
    const r = evaluateCase(sols.get(c.mach)!, c);
    addToEnvelope(env, r.id, r);
  }
  return envelopeRows(env);
};
const tSup = time(superposed, 5);
const subset = cases.slice(0, 50);
const tSub = time(() => {
  const env = createEnvelope(solveMach(model, machs[0], opts).y);
  for (const c of subset) {
    const r = evaluateCase(solveMach(model, c.mach, opts), c);
    addToEnvelope(env, r.id, r);
  }
}, 3);
const tRe = (tSub * cases.length) / subset.length;
out("## Envelope of 10 000 load cases over 10 Mach numbers at 41 stations (vortex lattice, Kármán–Tsien)");
out();
out(`- With superposition (10 solves, then every case combined from basic + additional loads): **${tSup.toFixed(0)} ms** (target < 500 ms: ${tSup < 500 ? "met" : "missed"}).`);
out(`- Re-solving every case: measured on ${subset.length} cases (${tSub.toFixed(0)} ms) and scaled to 10 000: **≈ ${(tRe / 1000).toFixed(1)} s**.`);
out(`- Speed-up: **≈ ${(tRe / tSup).toFixed(0)}×** (target ≥ 50×: ${tRe / tSup >= 50 ? "met" : "missed"}).`);
out();

// CLI on 100 000 trimmed cases, summary output, including start-up and JSON.
const dir = mkdtempSync(join(os.tmpdir(), "spanwright-bench-"));
try {
  const big = structuredClone(example);
  big.method = { ...big.method, output: "summary", stations: 40 };
  big.cases = Array.from({ length: 100000 }, (_, i) => ({
    id: `case-${i}`,
    mach: machs[i % 10],
    altitude: (i * 37) % 4000,
    weight: 50000 + ((i * 13) % 12272),
    nz: nzOf(i),
  }));
  const file = join(dir, "sweep.json");
  writeFileSync(file, JSON.stringify(big));
  const size = readFileSync(file).length;
  const tsx = join(root, "node_modules", ".bin", "tsx");
  const cli = join(root, "app", "cli", "analyze.ts");
  let outBytes = 0;
  const tCli = time(() => {
    outBytes = execFileSync(tsx, [cli, file], { maxBuffer: 1 << 30 }).length;
  }, 3);
  const tNpm = time(() => {
    execFileSync("npm", ["run", "-s", "analyze", "--", file], { cwd: root, maxBuffer: 1 << 30 });
  }, 3);
  const tStart = time(() => {
    execFileSync(tsx, [join(root, "tests", "bench", "noop.ts")]);
  }, 3);
  // In-process phases of the same work, to show where the time goes.
  const text = readFileSync(file, "utf8");
  const ph = { parse: 0, validate: 0, run: 0, stringify: 0 };
  {
    let t0 = performance.now();
    const json = JSON.parse(text);
    ph.parse = performance.now() - t0;
    t0 = performance.now();
    const p = parseCase(json);
    ph.validate = performance.now() - t0;
    if (!p.ok) throw new Error("benchmark case file must be valid");
    t0 = performance.now();
    const r = runCase(p.value);
    ph.run = performance.now() - t0;
    t0 = performance.now();
    JSON.stringify(r);
    ph.stringify = performance.now() - t0;
  }
  out("## Command line: 100 000 trimmed cases over 10 Mach numbers, `method.output: \"summary\"`");
  out();
  out(`- Input ${(size / 1e6).toFixed(1)} MB, output ${(outBytes / 1e6).toFixed(1)} MB of JSON.`);
  out(`- Wall time of \`tsx app/cli/analyze.ts sweep.json\`, start-up, parse, validation, 10 solves, 100 000 cases, envelope and JSON output included: **${(tCli / 1000).toFixed(2)} s** (target about a second).`);
  out(`- The same through \`npm run -s analyze -- sweep.json\` (adds npm's own start-up): **${(tNpm / 1000).toFixed(2)} s**.`);
  out(`- Start-up of node + tsx alone (an empty script): ${(tStart / 1000).toFixed(2)} s.`);
  out(
    `- In-process phases of the same work (one run inside this benchmark process, JIT already warm): JSON.parse ${ph.parse.toFixed(0)} ms, validation ${ph.validate.toFixed(0)} ms, ` +
      `10 solves + 100 000 cases + envelope ${ph.run.toFixed(0)} ms, JSON.stringify ${ph.stringify.toFixed(0)} ms.`,
  );
  out(
    `- Verdict: ${tCli <= 1100 ? "met (about a second)" : `about ${(tCli / 1000).toFixed(1)} s here, over the target; on this shared machine the result varies with the other jobs' load, and start-up plus JSON handling take most of it`}.`,
  );
  // The same sweep with a distinct Mach number for every case: a Mach grid instead of 100 000 solves.
  const distinct = structuredClone(big);
  distinct.cases = big.cases.map((c: { mach: number }, i: number) => ({ ...c, mach: 0.35 + (0.225 * i) / 100000 }));
  const distinctFile = join(dir, "distinct.json");
  writeFileSync(distinctFile, JSON.stringify(distinct));
  let grid = { machs: 0, nodes: 0, solves: 0, maxError: 0, tolerance: 0 };
  const tDistinct = time(() => {
    grid = JSON.parse(execFileSync(tsx, [cli, "--quiet", distinctFile], { maxBuffer: 1 << 30 }).toString()).method.machGrid;
  }, 3);
  const tOneSolve = time(() => solveMach(model, 0.4, opts), 5);
  out();
  out("## Command line: the same 100 000 cases, every one at its own Mach number (0.35–0.575)");
  out();
  out(`- Wall time, all included: **${(tDistinct / 1000).toFixed(2)} s**: a Mach grid of ${grid.nodes} nodes, ${grid.solves} solves in all (checks included), interpolation error ${grid.maxError.toExponential(1)} of the loads at CL = 1 (held under ${grid.tolerance.toExponential(0)}).`);
  out(`- One solve per Mach number instead: 100 000 × ${tOneSolve.toFixed(0)} ms ≈ **${((100000 * tOneSolve) / 60000).toFixed(0)} min**.`);
  out(`- Target: such a sweep in seconds, not tens of minutes: ${tDistinct < 10000 ? "met" : "missed"}.`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
out();
// Keep the load benchmark's section (tests/bench/load.ts) and the notes after it as they are.
const target = join(root, "docs", "benchmarks.md");
const previous = existsSync(target) ? readFileSync(target, "utf8") : "";
const keep = previous.indexOf("<!-- load benchmark: written by tests/bench/load.ts -->");
writeFileSync(target, lines.join("\n") + "\n" + (keep >= 0 ? "\n" + previous.slice(keep) : ""));
