import { isAscii } from "node:buffer";
import { readFileSync } from "node:fs";
import { isEngineError } from "../engine/errors";
import { parseCase } from "../exchange/parse";
import { resultToCsv } from "../exchange/csv";
import { DIRECT_MACH_LIMIT, runCase, runCaseEach } from "../exchange/run";
import type { SectionsFile } from "../exchange/sections";
import { parseSections } from "../exchange/sections";
import type { ResultRest, RunProgress } from "../exchange/run";
import { ResultJson } from "../exchange/result-json";

const USAGE = "usage: npm run -s analyze -- [--csv] [--quiet] [--sections SECTIONS.json] CASE.json   (use - to read one of them from stdin)";
/** Sweeps from this many cases (or with a Mach grid) report their progress on stderr. */
const LONG_SWEEP_CASES = 20000;

function fail(status: number, lines: string[]): never {
  process.stderr.write(lines.join("\n") + "\n");
  process.exit(status);
}

/** Read and parse a JSON file (or stdin for "-"), failing with the exit status the usage documents. */
function readJson(src: string): unknown {
  let text: string;
  try {
    const bytes = readFileSync(src === "-" ? 0 : src);
    // ASCII (every sweep we have seen) reads as Latin-1 byte for byte, without decoding UTF-8: the same text.
    text = bytes.toString(isAscii(bytes) ? "latin1" : "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    fail(66, [code === "ENOENT" ? `cannot read ${src}: no such file` : `cannot read ${src}: ${(e as Error).message}`]);
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    fail(65, [`${src === "-" ? "stdin" : src} is not valid JSON: ${(e as Error).message}`]);
  }
}

function main(argv: string[]): void {
  const args = [...argv];
  let sectionsSrc: string | undefined;
  const at = args.indexOf("--sections");
  if (at >= 0) {
    sectionsSrc = args[at + 1];
    if (sectionsSrc === undefined || sectionsSrc.startsWith("--")) fail(64, ["--sections needs a file (spanwright.sections/1)", USAGE]);
    args.splice(at, 2);
  }
  const csv = args.includes("--csv");
  const quiet = args.includes("--quiet");
  const rest = args.filter((a) => a !== "--csv" && a !== "--quiet");
  const unknown = rest.filter((a) => a.startsWith("--"));
  if (unknown.length) fail(64, [`unknown option ${unknown[0]}`, USAGE]);
  if (rest.length !== 1) fail(64, [USAGE]);
  if (sectionsSrc === "-" && rest[0] === "-") fail(64, ["only one of the case and the sections can come from stdin", USAGE]);
  const parsed = parseCase(readJson(rest[0]));
  if (!parsed.ok) fail(2, parsed.problems.map((p) => `${p.path}: ${p.message}`));
  let sections: SectionsFile | undefined;
  if (sectionsSrc !== undefined) {
    const s = parseSections(readJson(sectionsSrc), parsed.value);
    if (!s.ok) fail(2, s.problems.map((p) => `${p.path}: ${p.message}`));
    sections = s.value;
  }
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
  const options = { onProgress: long ? onProgress : undefined, sections };
  let method: ResultRest["method"];
  let writeOut: () => void;
  try {
    if (csv) {
      const result = runCase(file, { ...options, forceStations: true });
      method = result.method;
      writeOut = () => process.stdout.write(resultToCsv(result));
    } else {
      // Each case goes into the JSON as it is evaluated; nothing is written before the run has succeeded.
      const json = new ResultJson();
      const rest = runCaseEach(file, options, (c) => json.addCase(c));
      method = rest.method;
      writeOut = () => json.writeTo(rest, (bytes) => process.stdout.write(bytes));
    }
  } catch (e) {
    if (isEngineError(e)) fail(2, [e.field ? `${e.field}: ${e.message.replace(`${e.field}: `, "")}` : e.message]);
    throw e;
  }
  if (long) {
    const g = method.machGrid;
    say(
      g
        ? `done: ${g.solves} solves for ${g.machs} Mach numbers on a grid of ${g.nodes}; interpolation error ${g.maxError.toExponential(1)} of the loads at CL = 1 (held under ${g.tolerance.toExponential(0)})`
        : "done",
    );
  }
  // A reader that stops reading (`| head`) ends the run quietly, as other command-line tools do.
  process.stdout.on("error", (error: NodeJS.ErrnoException) => {
    if (error.code === "EPIPE") process.exit(0);
    throw error;
  });
  writeOut();
}

main(process.argv.slice(2));
