import { readFileSync } from "node:fs";
import { isEngineError } from "../engine/errors";
import { parseCase } from "../exchange/parse";
import { resultToCsv } from "../exchange/csv";
import { DIRECT_MACH_LIMIT, runCase } from "../exchange/run";
import type { RunProgress } from "../exchange/run";

const USAGE = "usage: npm run -s analyze -- [--csv] [--quiet] CASE.json   (use - to read the case from stdin)";
/** Sweeps from this many cases (or with a Mach grid) report their progress on stderr. */
const LONG_SWEEP_CASES = 20000;

function fail(status: number, lines: string[]): never {
  process.stderr.write(lines.join("\n") + "\n");
  process.exit(status);
}

function main(argv: string[]): void {
  const csv = argv.includes("--csv");
  const quiet = argv.includes("--quiet");
  const rest = argv.filter((a) => a !== "--csv" && a !== "--quiet");
  const unknown = rest.filter((a) => a.startsWith("--"));
  if (unknown.length) fail(64, [`unknown option ${unknown[0]}`, USAGE]);
  if (rest.length !== 1) fail(64, [USAGE]);
  const src = rest[0];
  let text: string;
  try {
    text = readFileSync(src === "-" ? 0 : src, "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    fail(66, [code === "ENOENT" ? `cannot read ${src}: no such file` : `cannot read ${src}: ${(e as Error).message}`]);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(65, [`${src === "-" ? "stdin" : src} is not valid JSON: ${(e as Error).message}`]);
  }
  const parsed = parseCase(json);
  if (!parsed.ok) fail(2, parsed.problems.map((p) => `${p.path}: ${p.message}`));
  const file = parsed.value;
  const machs = new Set(file.cases.map((c) => c.mach)).size;
  const long = !quiet && (file.cases.length >= LONG_SWEEP_CASES || machs > DIRECT_MACH_LIMIT);
  const say = (line: string) => process.stderr.write(`analyze: ${line}\n`);
  if (long) {
    say(`${file.cases.length} cases, ${machs} distinct Mach numbers${machs > DIRECT_MACH_LIMIT ? ": solving on a Mach grid, interpolating between" : ""}`);
  }
  // Progress in steps of a tenth of the cases and every tenth solve (counts, not clock time).
  const step = Math.max(1000, Math.ceil(file.cases.length / 10 / 1000) * 1000);
  const onProgress = (p: RunProgress) => {
    if (p.phase === "solves" && p.done % 10 === 0) say(`${p.done} spanwise solves`);
    if (p.phase === "cases" && p.done % step === 0) say(`${p.done} of ${p.total} cases`);
  };
  let result;
  try {
    result = runCase(file, { forceStations: csv, onProgress: long ? onProgress : undefined });
  } catch (e) {
    if (isEngineError(e)) fail(2, [e.field ? `${e.field}: ${e.message.replace(`${e.field}: `, "")}` : e.message]);
    throw e;
  }
  if (long) {
    const g = result.method.machGrid;
    say(
      g
        ? `done: ${g.solves} solves for ${g.machs} Mach numbers on a grid of ${g.nodes}; interpolation error ${g.maxError.toExponential(1)} of the loads at CL = 1 (held under ${g.tolerance.toExponential(0)})`
        : "done",
    );
  }
  process.stdout.write(csv ? resultToCsv(result) : JSON.stringify(result) + "\n");
}

main(process.argv.slice(2));
