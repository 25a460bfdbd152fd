// Benchmarks of the engine and the command line (not timed tests), each figure beside its peer
// measured in the same run: writes its section of docs/benchmarks.md. Run with `npm run bench`;
// `npx tsx tests/bench/run.ts --only dense,cli` runs some sections and only prints them.
import { execFileSync, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import { join } from "node:path";
import { performance } from "node:perf_hooks";
import { factorDense, luFactor, luSolve } from "../../app/engine/linear-solve";
import type { DenseSolver } from "../../app/engine/linear-solve";
import { buildLiftingLine } from "../../app/engine/lifting-line";
import { buildVortexLattice } from "../../app/engine/vortex-lattice";
import { addToEnvelope, createEnvelope, envelopeRows } from "../../app/engine/envelope";
import { evaluateCase } from "../../app/engine/load-case";
import type { LoadCase } from "../../app/engine/load-case";
import { solveMach } from "../../app/engine/superposition";
import { parseCase } from "../../app/exchange/parse";
import { runCase, runCaseEach } from "../../app/exchange/run";
import { ResultJson } from "../../app/exchange/result-json";
import type { MachSolution, SolveOptions, WingModel } from "../../app/engine/superposition";
import { writeDocsSection } from "./bench-app";
import { NUMPY_MISSING, numpyPython, runPeer } from "./numpy";

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

const loadNow = () =>
  os
    .loadavg()
    .map((v) => v.toFixed(2))
    .join(" / ");

/** Whole runs of the command line and its peer per benchmark: interleaved rounds, medians. */
const CLI_ROUNDS = 5;

/**
 * CPU seconds (user + system) of this process's finished child processes so far, theirs included: Linux's
 * cutime + cstime (/proc/self/stat fields 16 and 17, in clock ticks of 1/100 s); NaN where there is no /proc.
 */
function childrenCpu(): number {
  try {
    const stat = readFileSync("/proc/self/stat", "utf8");
    const f = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return (Number(f[13]) + Number(f[14])) / 100;
  } catch {
    return Number.NaN;
  }
}

const lines: string[] = [];
const out = (s = "") => {
  lines.push(s);
  console.log(s);
};
const MARK_START = "<!-- engine benchmark: written by tests/bench/run.ts -->";
const MARK_END = "<!-- end of engine benchmark -->";
const SECTIONS = ["spanwise", "dense", "envelope", "cli"] as const;
const onlyArg = process.argv.indexOf("--only");
const only = onlyArg > 0 ? process.argv[onlyArg + 1].split(",") : null;
for (const name of only ?? []) {
  if (!(SECTIONS as readonly string[]).includes(name)) throw new Error(`--only takes ${SECTIONS.join(", ")}; got "${name}"`);
}
const runs = (name: (typeof SECTIONS)[number]) => !only || only.includes(name);

const cpu = os.cpus();
out(MARK_START);
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
out(
  `- Load average when the run started: ${loadNow()} (1/5/15 min; the machine is shared, so other jobs can slow these numbers: each peer runs in the same run, and the ratios are the targets)`,
);
out();
function spanwiseSection(): void {
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
    const ms = time(
      () => buildVortexLattice(model.stations, { mach: 0.5, rule: "prandtl-glauert", resolution: m }).solveMany([() => 1, () => 0.01]),
      m >= 1000 ? 3 : 5,
    );
    if (m === 1200) ms1200 = ms;
    out(`| vortex lattice | ${m} strips | ${m} | ${ms.toFixed(1)} |`);
  }
  out();
  out(`Target: a 1 200-panel vortex-lattice solve well under a second → **${ms1200.toFixed(0)} ms** (${ms1200 < 1000 ? "met" : "missed"}).`);
  out();
}

// Realistic sweep of the demo aircraft: Mach 0.35–0.575, 0–4 000 m, nz from −1.24 to 3.1 (below stall).
const machs = Array.from({ length: 10 }, (_, i) => 0.35 + 0.025 * i);
const nzOf = (i: number) => -1.24 + ((i * 7) % 44) / 10;
const opts: SolveOptions = { spanwise: "vortex-lattice", rule: "karman-tsien", stations: 41 };

function envelopeSection(): void {
  // Envelope: 10 000 load cases over 10 Mach numbers at 41 stations.
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
  out(
    `- With superposition (10 solves, then every case combined from basic + additional loads): **${tSup.toFixed(0)} ms** (target < 500 ms: ${tSup < 500 ? "met" : "missed"}).`,
  );
  out(`- Re-solving every case: measured on ${subset.length} cases (${tSub.toFixed(0)} ms) and scaled to 10 000: **≈ ${(tRe / 1000).toFixed(1)} s**.`);
  out(`- Speed-up: **≈ ${(tRe / tSup).toFixed(0)}×** (target ≥ 50×: ${tRe / tSup >= 50 ? "met" : "missed"}).`);
  out();
}

function cliSection(): void {
  // CLI on 100 000 trimmed cases, summary output, including start-up and JSON, beside the numpy peer.
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
    const launcher = join(root, "app", "cli", "launch.mjs");
    const cli = launcher;
    const node = process.execPath;
    const load = loadNow();
    const wall = (fn: () => void) => {
      const t0 = performance.now();
      fn();
      return performance.now() - t0;
    };
    let outBytes = 0;
    let peerBytes = 0;
    const ours = () => (outBytes = execFileSync(node, [launcher, "--quiet", file], { maxBuffer: 1 << 30 }).length);
    const python = numpyPython();
    const peer = () => (peerBytes = runPeer(python!, "sweep_peer.py", [file]).length);
    const viaNpm = () => execFileSync("npm", ["run", "-s", "analyze", "--", "--quiet", file], { cwd: root, maxBuffer: 1 << 30 });
    const viaTsx = () => execFileSync(tsx, [join(root, "app", "cli", "analyze.ts"), "--quiet", file], { maxBuffer: 1 << 30 });
    // The same sweep with a distinct Mach number for every case: a Mach grid instead of 100 000 solves.
    const distinct = structuredClone(big);
    distinct.cases = big.cases.map((c: { mach: number }, i: number) => ({ ...c, mach: 0.35 + (0.225 * i) / 100000 }));
    const distinctFile = join(dir, "distinct.json");
    writeFileSync(distinctFile, JSON.stringify(distinct));
    let grid = { machs: 0, nodes: 0, solves: 0, maxError: 0, tolerance: 0 };
    const oursDistinct = () => {
      grid = JSON.parse(execFileSync(node, [cli, "--quiet", distinctFile], { maxBuffer: 1 << 30 }).toString()).method.machGrid;
    };
    ours(); // warm-up: builds the bundle if it is stale
    if (python) peer();
    // Interleaved rounds, so that every row sees the same load on this shared machine.
    const tOurs: number[] = [];
    const tNpmAll: number[] = [];
    const tTsxAll: number[] = [];
    const tPeer: number[] = [];
    const tDistinctAll: number[] = [];
    // CPU seconds of each run too: on a shared machine they vary far less than wall times.
    const cpu = { ours: [] as number[], npm: [] as number[], tsx: [] as number[], peer: [] as number[] };
    const timed = (fn: () => void, into: number[]) => {
      const c0 = childrenCpu();
      const t = wall(fn);
      into.push(childrenCpu() - c0);
      return t;
    };
    for (let round = 0; round < CLI_ROUNDS; round++) {
      tOurs.push(timed(ours, cpu.ours));
      tDistinctAll.push(wall(oursDistinct));
      tNpmAll.push(timed(viaNpm, cpu.npm));
      tTsxAll.push(timed(viaTsx, cpu.tsx));
      if (python) tPeer.push(timed(peer, cpu.peer));
    }
    const median = (t: number[]) => [...t].sort((x, y) => x - y)[Math.floor(t.length / 2)];
    const tCli = median(tOurs);
    const tNpm = median(tNpmAll);
    const tTsx = median(tTsxAll);
    const tStart = time(() => {
      spawnSync(node, [launcher]);
    }, 5);
    const tStartTsx = time(() => {
      execFileSync(tsx, [join(root, "tests", "bench", "noop.ts")]);
    }, 3);
    // In-process phases of the same work, to show where the time goes.
    const text = readFileSync(file, "utf8");
    const ph = { parse: 0, validate: 0, run: 0, cliRun: 0, runDistinct: 0, cpu: 0, cpuDistinct: 0 };
    {
      let t0 = performance.now();
      const json = JSON.parse(text);
      ph.parse = performance.now() - t0;
      t0 = performance.now();
      const p = parseCase(json);
      ph.validate = performance.now() - t0;
      if (!p.ok) throw new Error("benchmark case file must be valid");
      t0 = performance.now();
      const c0 = process.cpuUsage();
      const r = runCase(p.value);
      ph.run = performance.now() - t0;
      const c = process.cpuUsage(c0);
      ph.cpu = (c.user + c.system) / 1000;
      if (r.cases.length !== p.value.cases.length) throw new Error("benchmark run must give every case");
      // The command line's way: each case written into bytes as it is evaluated, none kept as an object.
      t0 = performance.now();
      const writer = new ResultJson();
      const rest = runCaseEach(p.value, {}, (c) => writer.addCase(c));
      let bytes = 0;
      writer.writeTo(rest, (b) => (bytes += b.length));
      ph.cliRun = performance.now() - t0;
      if (bytes !== outBytes) throw new Error(`in-process JSON (${bytes} bytes) differs in length from the command line's (${outBytes})`);
      const pd = parseCase(distinct);
      if (!pd.ok) throw new Error("benchmark case file must be valid");
      t0 = performance.now();
      const cd0 = process.cpuUsage();
      runCase(pd.value);
      ph.runDistinct = performance.now() - t0;
      const cd = process.cpuUsage(cd0);
      ph.cpuDistinct = (cd.user + cd.system) / 1000;
    }
    out('## Command line: 100 000 trimmed cases over 10 Mach numbers, `method.output: "summary"`');
    out();
    out(
      `Input ${(size / 1e6).toFixed(1)} MB of JSON; output ${(outBytes / 1e6).toFixed(1)} MB (ours) and ${(peerBytes / 1e6).toFixed(1)} MB (peer). Wall times of whole runs, start-up, ` +
        `reading, validation, solves, 100 000 cases, envelope and writing the JSON included; ${CLI_ROUNDS} rounds in which every row runs once in turn, after a warm-up, medians; CPU time is user + system of the run and its own child processes. ` +
        `Load average ${load} at the start of this section.`,
    );
    out();
    out("| run | wall time (s) | ÷ peer | CPU time (s) | ÷ peer |");
    out("|---|---|---|---|---|");
    const tPeerMedian = python ? median(tPeer) : NaN;
    const ratio = (ms: number) => (python ? `${(ms / tPeerMedian).toFixed(2)}×` : "—");
    const cPeer = python ? median(cpu.peer) : NaN;
    const cpuCells = (c: number[]) => (Number.isFinite(median(c)) ? `${median(c).toFixed(2)} | ${python ? `${(median(c) / cPeer).toFixed(2)}×` : "—"}` : "— | —");
    out(
      `| \`node app/cli/launch.mjs --quiet sweep.json\` (what \`npm run analyze\` runs: the prebuilt bundle) | ${(tCli / 1000).toFixed(2)} | ${ratio(tCli)} | ${cpuCells(cpu.ours)} |`,
    );
    out(`| \`npm run -s analyze -- --quiet sweep.json\` (adds npm's own start-up) | ${(tNpm / 1000).toFixed(2)} | ${ratio(tNpm)} | ${cpuCells(cpu.npm)} |`);
    out(`| \`tsx app/cli/analyze.ts --quiet sweep.json\` (compiling TypeScript at every start, as before) | ${(tTsx / 1000).toFixed(2)} | ${ratio(tTsx)} | ${cpuCells(cpu.tsx)} |`);
    if (python) {
      out(
        `| peer: \`python3 tests/bench/sweep_peer.py sweep.json\` (numpy ${JSON.parse(execFileSync(python, ["-c", "import json, numpy; print(json.dumps(numpy.__version__))"]).toString())}: lifting line per Mach, superposition, integration matrices over all cases, JSON in and out) | ${(tPeerMedian / 1000).toFixed(2)} | 1 | ${cpuCells(cpu.peer)} |`,
      );
    }
    out();
    out(
      `- Start-up alone: the launcher with its bundle ${tStart.toFixed(0)} ms (to its usage message); node + tsx on an empty script ${tStartTsx.toFixed(0)} ms.`,
    );
    out(
      `- In-process phases of the same work (inside this benchmark process, JIT warm): JSON.parse ${ph.parse.toFixed(0)} ms, validation ${ph.validate.toFixed(0)} ms, ` +
        `10 solves + 100 000 cases + envelope ${ph.run.toFixed(0)} ms (runCase, every case kept as an object); ` +
        `the same run as the command line makes it, each case written into UTF-8 bytes as it is evaluated and none kept, JSON included: ${ph.cliRun.toFixed(0)} ms.`,
    );
    if (python) {
      out(
        `- Target: ≤ 1.0× the numpy peer's wall time → **${(tCli / tPeerMedian).toFixed(2)}×** (${tCli <= tPeerMedian ? "met" : "missed"}); ` +
          `CPU time ${Number.isFinite(cPeer) ? `**${(median(cpu.ours) / cPeer).toFixed(2)}×**` : "not measured here"}.`,
      );
    }
    else out(`- Peer (numpy): ${NUMPY_MISSING}.`);
    const tDistinct = median(tDistinctAll);
    const tOneSolve = time(() => solveMach(model, 0.4, opts), 5);
    out();
    out("## Command line: the same 100 000 cases, every one at its own Mach number (0.35–0.575)");
    out();
    out(
      `- Wall time, all included, measured in the rounds above beside the 10-Mach sweep: **${(tDistinct / 1000).toFixed(2)} s** ` +
        `(${(tDistinct / tCli).toFixed(2)}× the same cases over 10 Mach numbers): a Mach grid of ${grid.nodes} nodes, ${grid.solves} solves in all (checks included), ` +
        `interpolation error ${grid.maxError.toExponential(1)} of the loads at CL = 1 (held under ${grid.tolerance.toExponential(0)}).`,
    );
    out(
      `- In-process (JIT warm): grid, 100 000 interpolated solutions, cases and envelope ${ph.runDistinct.toFixed(0)} ms (CPU time ${ph.cpuDistinct.toFixed(0)} ms), ` +
        `against ${ph.run.toFixed(0)} ms (CPU time ${ph.cpu.toFixed(0)} ms) over 10 Mach numbers: the interpolation costs ${((ph.cpuDistinct - ph.cpu) / 100).toFixed(0)} µs of CPU per case.`,
    );
    out(`- One solve per Mach number instead: 100 000 × ${tOneSolve.toFixed(0)} ms ≈ **${((100000 * tOneSolve) / 60000).toFixed(0)} min**.`);
    out(
      `- Target: such a sweep in seconds, not tens of minutes (under 10 s; or, where a loaded machine stretches every wall time past that, no slower than 1.5× the 10-Mach sweep measured beside it): ` +
        `${tDistinct < 10000 || tDistinct < 1.5 * tCli ? "met" : "missed"}.`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  out();
}

/** ‖b − A·x‖∞ / (‖A‖∞ ‖x‖∞), in double precision. */
function backwardError(a: Float64Array, n: number, x: ArrayLike<number>, b: ArrayLike<number>): number {
  let r = 0;
  let normA = 0;
  let normX = 0;
  for (let i = 0; i < n; i++) {
    let s = b[i];
    let row = 0;
    for (let j = 0; j < n; j++) {
      s -= a[i * n + j] * x[j];
      row += Math.abs(a[i * n + j]);
    }
    r = Math.max(r, Math.abs(s));
    normA = Math.max(normA, row);
    normX = Math.max(normX, Math.abs(x[i]));
  }
  return r / (normA * normX);
}

function denseSection(): void {
  // The system the 1 200-strip lattice of the example wing solves at M 0.5, with its two right-hand sides
  // (twist and zero lift at α = 0; a uniform 1 rad), caught on its way to the solver.
  let a = new Float64Array(0);
  const rhs: Float64Array[] = [];
  const capture = (m: Float64Array, n: number): DenseSolver => {
    a = m.slice();
    const s = factorDense(m, n);
    return { n, method: s.method, solve: (b) => (rhs.push(Float64Array.from(b)), s.solve(b)) };
  };
  buildVortexLattice(model.stations, { mach: 0.5, rule: "prandtl-glauert", resolution: 1200, denseSolver: capture }).solveMany([
    (sec) => ((sec.twist - sec.alphaL0) * Math.PI) / 180,
    () => 1,
  ]);
  const n = Math.round(Math.sqrt(a.length));
  const load = loadNow();
  const python = numpyPython();
  const dir = mkdtempSync(join(os.tmpdir(), "spanwright-dense-"));
  const k = rhs.length;
  const B = new Float64Array(n * k);
  for (let i = 0; i < n; i++) for (let j = 0; j < k; j++) B[i * k + j] = rhs[j][i];
  writeFileSync(join(dir, "a.f64"), new Uint8Array(a.buffer));
  writeFileSync(join(dir, "b.f64"), new Uint8Array(B.buffer));
  let peer: { numpy: string; blas: string[]; threads: string; cond1: number } | undefined;
  const peerTimes: number[] = [];
  let peerX: Float64Array[] = [];
  let method = "";
  let ours: Float64Array[] = [];
  const oursTimes: number[] = [];
  const oursOnce = () => {
    const s = factorDense(a, n);
    ours = rhs.map((b) => s.solve(b));
    method = s.method();
  };
  try {
    oursOnce(); // warm-up: compiles the kernel, sizes its memory
    // Interleaved rounds, so that both sides see the same load on this shared machine.
    for (let round = 0; round < 3; round++) {
      for (let i = 0; i < 3; i++) {
        const t0 = performance.now();
        oursOnce();
        oursTimes.push(performance.now() - t0);
      }
      if (python) {
        const args = [join(dir, "a.f64"), join(dir, "b.f64"), String(n), String(k), join(dir, "x.f64"), "--repeat", "3"];
        const r = JSON.parse(runPeer(python, "dense_solve_peer.py", round === 2 ? [...args, "--cond"] : args));
        peerTimes.push(...r.times_ms);
        peer = r;
      }
    }
    if (python) {
      const X = new Float64Array(readFileSync(join(dir, "x.f64")).buffer.slice(0));
      peerX = rhs.map((_, j) => Float64Array.from({ length: n }, (_, i) => X[i * k + j]));
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  const median = (t: number[]) => [...t].sort((x, y) => x - y)[Math.floor(t.length / 2)];
  const tOurs = median(oursTimes);
  const tPeer = median(peerTimes);
  let plain: Float64Array[] = [];
  const tPlain = time(() => {
    const f = luFactor(a.slice(), n);
    plain = rhs.map((b) => luSolve(f, b));
  }, 3);
  const be = (xs: Float64Array[]) => Math.max(...xs.map((x, k) => backwardError(a, n, x, rhs[k])));
  out(`## Dense solve: the 1 200-unknown vortex-lattice system against LAPACK`);
  out();
  out(
    `The influence matrix of the example wing with 1 200 strips at M 0.5 and its two right-hand sides, factorised and solved; ` +
      `the same matrix and right-hand sides go to numpy in the same run, in three interleaved rounds of three, after a warm-up on each side: medians of the nine. ` +
      `Load average ${load} at the start of this section.`,
  );
  out();
  const ratio = (ms: number) => (peer ? `${(ms / tPeer).toFixed(1)}×` : "—");
  out("| solver | median (ms) | ÷ LAPACK | backward error ‖b − Ax‖∞ / (‖A‖∞‖x‖∞) |");
  out("|---|---|---|---|");
  out(
    `| engine \`factorDense\`: single-precision LU in WebAssembly SIMD, refined in double (path taken: ${method}) | ${tOurs.toFixed(1)} | ${ratio(tOurs)} | ${be(ours).toExponential(1)} |`,
  );
  out(`| engine \`luFactor\`: the plain JavaScript LU (blocked, rank-4), before | ${tPlain.toFixed(0)} | ${ratio(tPlain)} | ${be(plain).toExponential(1)} |`);
  if (peer) {
    const blas = peer.blas.map((l) => l.replace(/^.*\//, "")).join(", ") || "unknown";
    out(
      `| peer: \`numpy.linalg.solve\` (LAPACK dgesv; numpy ${peer.numpy}, ${blas}, up to ${peer.threads} threads) | ${tPeer.toFixed(1)} | 1 | ${be(peerX).toExponential(1)} |`,
    );
  }
  out();
  out(
    `Stated accuracy: each solution of \`factorDense\` is refined until ‖b − Ax‖∞ ≤ ε·‖A‖∞‖x‖∞ (ε = 2⁻⁵³ = 1.1e-16, one rounding) or, once round-off ` +
      `stops the refinement, ≤ √n·ε·‖A‖∞‖x‖∞ (LAPACK dsgesv's test; ${(Math.sqrt(n) * 2 ** -53).toExponential(1)} here), checked in double precision; ` +
      `otherwise it is solved again by a double-precision LU.`,
  );
  if (peer) {
    const gap = (xs: Float64Array[]) => {
      let diff = 0;
      let scale = 0;
      xs.forEach((x, k) => x.forEach((v, i) => ((diff = Math.max(diff, Math.abs(v - peerX[k][i]))), (scale = Math.max(scale, Math.abs(peerX[k][i]))))));
      return (diff / scale).toExponential(1);
    };
    out(
      `Solutions against numpy's, relative to the largest unknown: \`factorDense\` ${gap(ours)}, plain LU ${gap(plain)} ` +
        `(κ₁(A) = ${peer.cond1.toExponential(1)} from numpy: up to κ·ε ≈ ${(peer.cond1 * 2 ** -53).toExponential(1)} is round-off).`,
    );
    const r = tOurs / tPeer;
    out(`Target: within 3× of LAPACK → **${r.toFixed(1)}×** (${r <= 3 ? "met" : "missed"}).`);
  } else {
    out(`Peer (numpy): ${NUMPY_MISSING}.`);
  }
  out();
}

// Run after every definition above (the sections use module-level constants).
if (runs("spanwise")) spanwiseSection();
if (runs("dense")) denseSection();
if (runs("envelope")) envelopeSection();
if (runs("cli")) cliSection();
out(MARK_END);
if (only) process.exit(0);
{
  // Replace this script's section, keep the rest (the load and browser benchmarks' sections and the notes);
  // on a first run with markers this script's part was everything before the load benchmark.
  writeDocsSection(MARK_START, MARK_END, lines.join("\n"), (existing) => {
    const load = existing.indexOf("<!-- load benchmark");
    return `${lines.join("\n")}\n\n${load >= 0 ? existing.slice(load) : existing}`.replace(/\n*$/, "\n");
  });
}
