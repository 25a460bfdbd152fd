import { readFileSync } from "node:fs";
import { isEngineError } from "../engine/errors";
import { parseCase } from "../exchange/parse";
import { resultToCsv } from "../exchange/csv";
import { runCase } from "../exchange/run";

const USAGE = "usage: npm run -s analyze -- [--csv] CASE.json   (use - to read the case from stdin)";

function fail(status: number, lines: string[]): never {
  process.stderr.write(lines.join("\n") + "\n");
  process.exit(status);
}

function main(argv: string[]): void {
  const csv = argv.includes("--csv");
  const rest = argv.filter((a) => a !== "--csv");
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
  let result;
  try {
    result = runCase(parsed.value, { forceStations: csv });
  } catch (e) {
    if (isEngineError(e)) fail(2, [e.field ? `${e.field}: ${e.message.replace(`${e.field}: `, "")}` : e.message]);
    throw e;
  }
  process.stdout.write(csv ? resultToCsv(result) : JSON.stringify(result) + "\n");
}

main(process.argv.slice(2));
