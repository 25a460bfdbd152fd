/**
 * `npm test`: the type check, ESLint, the Drizzle schema↔migrations check, Vitest (unit +
 * integration) and Playwright, one after the other, then one closing line `N passed, N failed` that
 * CI reads. The type check counts as one test, ESLint one per linted file, the schema check two (the
 * migration snapshots are consistent; the schema needs no new migration). A stage that cannot run,
 * crashes or leaves no report counts as a failure, never as zero tests.
 *
 *   npm test                      everything
 *   npm test -- --no-e2e          without the browser tests
 *   npm test -- --only unit       one stage: typecheck | lint | schema | unit | integration | e2e
 */
import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

type Stage = "typecheck" | "lint" | "schema" | "unit" | "integration" | "e2e";
const STAGES: Stage[] = ["typecheck", "lint", "schema", "unit", "integration", "e2e"];

interface Outcome {
  name: string;
  passed: number;
  failed: number;
  skipped: number;
  notes: string[];
}

function parseArgs(argv: string[]): Set<Stage> {
  const chosen = new Set<Stage>(STAGES);
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (arg === "--no-e2e") chosen.delete("e2e");
    else if (arg === "--only" || arg.startsWith("--only=")) {
      const value = arg.includes("=") ? arg.split("=")[1] : argv[++i];
      if (!STAGES.includes(value as Stage)) throw new Error(`--only takes one of ${STAGES.join(", ")}; got "${value ?? ""}"`);
      chosen.clear();
      chosen.add(value as Stage);
    } else {
      throw new Error(`unknown option "${arg}" (known: --no-e2e, --only ${STAGES.join("|")})`);
    }
  }
  return chosen;
}

const bin = (name: string) => path.resolve("node_modules/.bin", name);

/**
 * Runs a command with the console attached; resolves with its exit code, or a description of why it
 * could not run. Its input is closed, so a tool that would ask a question fails instead of waiting.
 */
function run(command: string, args: string[], env: NodeJS.ProcessEnv = process.env): Promise<{ code: number | null; error?: string }> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { stdio: ["ignore", "inherit", "inherit"], env });
    child.once("error", (error) => resolve({ code: null, error: `could not start ${command}: ${error.message}` }));
    child.once("exit", (code, signal) => resolve(signal ? { code: null, error: `${path.basename(command)} was killed by ${signal}` } : { code }));
  });
}

function banner(title: string) {
  process.stdout.write(`\n=== ${title} ===\n`);
}

function readJson<T>(file: string): T | undefined {
  try {
    return JSON.parse(fs.readFileSync(file, "utf8")) as T;
  } catch {
    return undefined;
  }
}

async function typecheck(): Promise<Outcome> {
  banner("type check (react-router typegen && tsc)");
  const outcome: Outcome = { name: "type check", passed: 0, failed: 0, skipped: 0, notes: [] };
  const typegen = await run(bin("react-router"), ["typegen"]);
  const tsc = typegen.code === 0 ? await run(bin("tsc"), []) : undefined;
  if (typegen.code === 0 && tsc?.code === 0) outcome.passed = 1;
  else {
    outcome.failed = 1;
    outcome.notes.push(typegen.code !== 0 ? typegen.error ?? `typegen exited with ${typegen.code}` : tsc?.error ?? `tsc exited with ${tsc?.code}`);
  }
  return outcome;
}

interface EslintFileReport {
  filePath: string;
  errorCount: number;
  warningCount: number;
  messages: { line?: number; column?: number; ruleId: string | null; message: string; severity: number }[];
}

/** ESLint over the whole tree (eslint.config.js): a file passes when it has no error and no warning. */
async function lint(tmp: string): Promise<Outcome> {
  banner("lint (eslint .)");
  const outcome: Outcome = { name: "lint", passed: 0, failed: 0, skipped: 0, notes: [] };
  const report = path.join(tmp, "eslint.json");
  const result = await run(bin("eslint"), [".", "--format", "json", "--output-file", report]);
  const json = readJson<EslintFileReport[]>(report);
  if (!json) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `eslint left no report (exit ${result.code})`);
    return outcome;
  }
  for (const file of json) {
    if (file.errorCount + file.warningCount === 0) {
      outcome.passed++;
      continue;
    }
    outcome.failed++;
    for (const m of file.messages) {
      const where = `${path.relative(process.cwd(), file.filePath)}:${m.line ?? 0}:${m.column ?? 0}`;
      process.stdout.write(`${where}  ${m.severity === 2 ? "error" : "warning"}  ${m.message.split("\n")[0]}  ${m.ruleId ?? ""}\n`);
    }
  }
  if (result.code !== 0 && outcome.failed === 0) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `eslint exited with ${result.code}`);
  }
  process.stdout.write(`${json.length} files linted, ${outcome.failed} with problems\n`);
  return outcome;
}

/**
 * The Drizzle schema and the committed migrations agree: drizzle-kit checks that the snapshots in
 * drizzle/meta form one consistent chain, then generates against a copy of drizzle/ — a schema
 * change without its migration shows up as a new file there (named in the failure), and the
 * project's own drizzle/ is never touched.
 */
async function schema(tmp: string): Promise<Outcome> {
  banner("schema ↔ migrations (drizzle-kit check, drizzle-kit generate on a copy)");
  const outcome: Outcome = { name: "schema ↔ migrations", passed: 0, failed: 0, skipped: 0, notes: [] };
  const copy = path.join(tmp, "drizzle");
  fs.cpSync("drizzle", copy, { recursive: true });
  // drizzle-kit reads --out relative to the working folder.
  const out = path.relative(process.cwd(), copy);
  const check = await run(bin("drizzle-kit"), ["check", "--dialect", "postgresql", "--out", out]);
  if (check.code === 0) outcome.passed++;
  else {
    outcome.failed++;
    outcome.notes.push(check.error ?? `drizzle-kit check found the migration snapshots inconsistent (exit ${check.code})`);
  }
  const before = new Set(fs.readdirSync(copy));
  const generate = await run(bin("drizzle-kit"), ["generate", "--dialect", "postgresql", "--schema", "./app/db/schema.ts", "--out", out, "--name", "schema-check"]);
  const added = fs.readdirSync(copy).filter((f) => !before.has(f));
  if (generate.code === 0 && added.length === 0) outcome.passed++;
  else {
    outcome.failed++;
    if (generate.code !== 0) outcome.notes.push(generate.error ?? `drizzle-kit generate exited with ${generate.code}`);
    for (const file of added) {
      outcome.notes.push(`app/db/schema.ts differs from drizzle/: run \`npm run db:generate\` and commit the migration; it would be:`);
      outcome.notes.push(...fs.readFileSync(path.join(copy, file), "utf8").trim().split("\n"));
    }
  }
  return outcome;
}

interface VitestReport {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests?: number;
  testResults: { name: string; status: string; message?: string; assertionResults: { status: string }[] }[];
}

async function vitest(projects: Stage[], tmp: string): Promise<Outcome> {
  const name = `vitest (${projects.join(" + ")})`;
  banner(name);
  const outcome: Outcome = { name, passed: 0, failed: 0, skipped: 0, notes: [] };
  const report = path.join(tmp, "vitest.json");
  const args = ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...projects.flatMap((p) => ["--project", p])];
  const result = await run(bin("vitest"), args);
  const json = readJson<VitestReport>(report);
  if (!json) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `vitest left no report (exit ${result.code})`);
    return outcome;
  }
  outcome.passed = json.numPassedTests;
  outcome.failed = json.numFailedTests;
  outcome.skipped = json.numPendingTests + (json.numTodoTests ?? 0);
  // A file that fails before its tests run (import error, failing hook) has no failed test to count.
  for (const file of json.testResults) {
    if (file.status === "failed" && !file.assertionResults.some((a) => a.status === "failed")) {
      outcome.failed += 1;
      outcome.notes.push(`${path.relative(process.cwd(), file.name)} failed outside its tests${file.message ? `: ${file.message.split("\n")[0]}` : ""}`);
    }
  }
  if (result.code !== 0 && outcome.failed === 0) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `vitest exited with ${result.code} (unhandled error or set-up failure)`);
  }
  return outcome;
}

interface PlaywrightReport {
  stats: { expected: number; unexpected: number; flaky: number; skipped: number };
  errors: { message?: string }[];
}

async function playwright(tmp: string): Promise<Outcome> {
  const name = "playwright (e2e)";
  banner(name);
  const outcome: Outcome = { name, passed: 0, failed: 0, skipped: 0, notes: [] };
  const report = path.join(tmp, "playwright.json");
  // The app server's data folder lives in our temporary folder, so it goes when the run ends.
  // 0711/0755: as root, PostgreSQL runs as the postgres user, which must be able to enter it.
  fs.chmodSync(tmp, 0o711);
  const dataDir = path.join(tmp, "e2e-data");
  fs.mkdirSync(dataDir, { mode: 0o755 });
  const env = { ...process.env, PLAYWRIGHT_JSON_OUTPUT_NAME: report, SPANWRIGHT_E2E_DATA_DIR: dataDir };
  const result = await run(bin("playwright"), ["test", "--reporter=list,json"], env);
  const json = readJson<PlaywrightReport>(report);
  if (!json) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `playwright left no report (exit ${result.code})`);
    return outcome;
  }
  outcome.passed = json.stats.expected + json.stats.flaky;
  outcome.failed = json.stats.unexpected;
  outcome.skipped = json.stats.skipped;
  if (json.stats.flaky > 0) outcome.notes.push(`${json.stats.flaky} passed only on retry`);
  // Errors outside any test (web server did not start, global set-up threw) fail the stage.
  for (const error of json.errors) outcome.notes.push((error.message ?? "error outside the tests").split("\n")[0]!);
  if (json.errors.length > 0 && outcome.failed === 0) outcome.failed = 1;
  if (result.code !== 0 && outcome.failed === 0) {
    outcome.failed = 1;
    outcome.notes.push(result.error ?? `playwright exited with ${result.code}`);
  }
  return outcome;
}

async function main(): Promise<number> {
  let chosen: Set<Stage>;
  try {
    chosen = parseArgs(process.argv.slice(2));
  } catch (error) {
    process.stderr.write(`${(error as Error).message}\n`);
    process.stdout.write("0 passed, 1 failed\n");
    return 2;
  }
  const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "spanwright-reports-"));
  const started = Date.now();
  const outcomes: Outcome[] = [];
  try {
    if (chosen.has("typecheck")) outcomes.push(await typecheck());
    if (chosen.has("lint")) outcomes.push(await lint(tmp));
    if (chosen.has("schema")) outcomes.push(await schema(tmp));
    const projects = (["unit", "integration"] as const).filter((p) => chosen.has(p));
    if (projects.length > 0) outcomes.push(await vitest(projects, tmp));
    if (chosen.has("e2e")) outcomes.push(await playwright(tmp));
  } finally {
    fs.rmSync(tmp, { recursive: true, force: true });
  }

  banner(`summary (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  for (const o of outcomes) {
    process.stdout.write(`${o.failed > 0 ? "FAIL" : "ok  "} ${o.name}: ${o.passed} passed, ${o.failed} failed${o.skipped ? `, ${o.skipped} skipped` : ""}\n`);
    for (const note of o.notes) process.stdout.write(`       ${note}\n`);
  }
  const passed = outcomes.reduce((sum, o) => sum + o.passed, 0);
  const failed = outcomes.reduce((sum, o) => sum + o.failed, 0);
  process.stdout.write(`${passed} passed, ${failed} failed\n`);
  return failed > 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    process.stderr.write(`run-all crashed: ${error instanceof Error ? error.stack ?? error.message : String(error)}\n`);
    process.stdout.write("0 passed, 1 failed\n");
    process.exit(1);
  },
);
