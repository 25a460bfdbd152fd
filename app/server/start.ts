/**
 * `npm start`: brings up, on loopback, everything Spanwright needs on one workstation — PostgreSQL
 * from Debian's packages in a project folder, the S3 stand-in, the mail capture, the company
 * sign-in stand-in — then migrates, seeds the demo and serves the app. Each service is skipped when
 * its variable points at a real one (DATABASE_URL, S3_ENDPOINT, SMTP_URL, OIDC_ISSUER). Ctrl-C stops
 * the whole tree.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { DEMO_USERS } from "../demo/scenario";

const dev = process.argv.includes("--dev");
const dataDir = path.resolve(process.env.SPANWRIGHT_DATA_DIR ?? ".data");
const port = (name: string, fallback: number) => Number(process.env[name] ?? fallback);
const host = "127.0.0.1";

type Stoppable = { name: string; stop(): Promise<void> };
const running: Stoppable[] = [];
let stopping = false;

async function shutdown(code: number): Promise<never> {
  if (!stopping) {
    stopping = true;
    for (const s of running.reverse()) {
      await s.stop().catch((error: unknown) => console.warn(`stopping ${s.name}: ${String(error)}`));
    }
  }
  process.exit(code);
}

process.on("SIGINT", () => void shutdown(0));
process.on("SIGTERM", () => void shutdown(0));

function say(line: string) {
  process.stdout.write(`[spanwright] ${line}\n`);
}

/** Rebuilds only when a source file is newer than the last build, so later starts take seconds. */
function buildIfStale() {
  const marker = path.resolve("build/server/index.js");
  const builtAt = fs.existsSync(marker) ? fs.statSync(marker).mtimeMs : 0;
  const newest = (p: string): number => {
    if (!fs.existsSync(p)) return 0;
    const st = fs.statSync(p);
    if (!st.isDirectory()) return st.mtimeMs;
    return Math.max(st.mtimeMs, ...fs.readdirSync(p).map((f) => newest(path.join(p, f))));
  };
  const sourcesAt = Math.max(...["app", "public", "package-lock.json", "vite.config.ts", "react-router.config.ts"].map((p) => newest(path.resolve(p))));
  if (builtAt > sourcesAt) return;
  say("building the app (first start, or sources changed)…");
  const result = spawnSync(process.execPath, [path.resolve("node_modules/@react-router/dev/bin.js"), "build"], { stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
  // React Router's own config loader hands Vite 8 its deprecated `envFile: false` (nothing in our
  // configuration can change that): drop exactly that notice, pass on everything else.
  const stderr = result.stderr.split("\n").filter((line) => !line.includes("The `envFile` option is deprecated")).join("\n").trim();
  if (stderr) process.stderr.write(`${stderr}\n`);
  if (result.status !== 0) throw new Error("the build failed (see above)");
}

async function main() {
  fs.mkdirSync(dataDir, { recursive: true });
  const appOrigin = process.env.APP_ORIGIN ?? `http://${host}:${port("PORT", 3000)}`;
  process.env.APP_ORIGIN = appOrigin;
  process.env.NODE_ENV ??= dev ? "development" : "production";
  // The S3 client's notice that its releases from 2027 need Node 22: the version is pinned in
  // package.json, so it changes only when we upgrade it on purpose (README, "Versions").
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";

  if (!process.env.DATABASE_URL) {
    const { findPostgresBin, startPostgres } = await import("./dev-services/postgres");
    try {
      await findPostgresBin();
    } catch (error) {
      console.error(`PostgreSQL's server is not installed. Install it with:\n\n  ${(error as Error).message}\n\nthen run npm start again.`);
      process.exit(1);
    }
    const pg = await startPostgres({ dataDir: path.join(dataDir, "pg"), port: port("PG_PORT", 54329), database: "spanwright" });
    running.push({ name: "PostgreSQL", stop: pg.stop });
    process.env.DATABASE_URL = pg.url;
    const shown = path.relative(process.cwd(), pg.dataDir);
    say(`PostgreSQL   ${pg.url} (data in ${shown && !shown.startsWith("..") ? shown : pg.dataDir})`);
  }
  if (!process.env.S3_ENDPOINT) {
    const { startS3 } = await import("./dev-services/s3");
    const s3 = await startS3({ dir: path.join(dataDir, "s3"), port: port("S3_PORT", 4569), buckets: ["spanwright-uploads", "spanwright-reports", "spanwright-audit"] });
    running.push({ name: "S3 stand-in", stop: s3.stop });
    process.env.S3_ENDPOINT = s3.endpoint;
    say(`S3 stand-in  ${s3.endpoint}`);
  }
  if (!process.env.SMTP_URL) {
    const { startMailCapture } = await import("./dev-services/mail");
    const mailDir = path.join(dataDir, "mail");
    const mail = await startMailCapture({ port: port("SMTP_PORT", 2525), dir: mailDir });
    running.push({ name: "mail capture", stop: mail.stop });
    process.env.SMTP_URL = `smtp://${host}:${mail.port}`;
    process.env.MAIL_CAPTURE_DIR = mailDir;
    say(`Mail capture smtp://${host}:${mail.port} — read it at ${appOrigin}/dev/mailbox`);
  }
  if (!process.env.OIDC_ISSUER) {
    const { startOidcProvider } = await import("./dev-services/oidc");
    // The stand-in asks each demo person for their own demo password before it answers for them.
    const oidc = await startOidcProvider({ port: port("OIDC_PORT", 4580), users: DEMO_USERS.map((u) => ({ email: u.email, name: u.name, password: u.password })) });
    running.push({ name: "sign-in stand-in", stop: oidc.stop });
    process.env.OIDC_ISSUER = oidc.issuer;
    say(`Sign-in stand-in ${oidc.issuer}`);
  }

  const { runMigrations } = await import("../db/migrate.server");
  await runMigrations(process.env.DATABASE_URL!);
  const { db, closeDb } = await import("../db/client.server");
  const { seedDemo } = await import("../demo/seed.server");
  const seeded = await seedDemo(db);
  await closeDb();
  say(`database migrated; demo seed ${seeded.created ? `created ${seeded.created} records` : "already present"}`);

  if (!dev) buildIfStale();
  const webProcesses = dev ? 1 : Number(process.env.WEB_PROCESSES ?? Math.min(os.availableParallelism(), 4));
  if (!Number.isInteger(webProcesses) || webProcesses < 1) throw new Error(`WEB_PROCESSES must be a whole number of at least 1 (got ${process.env.WEB_PROCESSES})`);
  if (webProcesses === 1) {
    const { closeHttpServer, startHttpServer } = await import("./http");
    const server = await startHttpServer({ host, port: port("PORT", 3000), origin: appOrigin, dev });
    running.push({ name: "web server", stop: () => closeHttpServer(server) });
  } else {
    // Node runs JavaScript on one core per process: one web process per core serves the pages
    // (web.ts); this process keeps the services and the job worker.
    const cluster = (await import("node:cluster")).default;
    cluster.setupPrimary({ exec: path.join(import.meta.dirname, "web.ts") });
    const workers = Array.from({ length: webProcesses }, () => cluster.fork());
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            w.once("listening", () => resolve());
            w.once("exit", (code) => reject(new Error(`a web process exited during start-up (code ${code})`)));
          }),
      ),
    );
    cluster.on("exit", (w, code, signal) => {
      if (!stopping) {
        console.error(`[spanwright] web process ${w.process.pid} stopped (${signal ?? `code ${code}`}); stopping everything`);
        void shutdown(1);
      }
    });
    running.push({
      name: "web processes",
      stop: () =>
        Promise.all(workers.filter((w) => !w.isDead()).map((w) => new Promise<void>((resolve) => (w.once("exit", () => resolve()), w.disconnect())))).then(() => undefined),
    });
    say(`${webProcesses} web processes (WEB_PROCESSES)`);
  }

  // One background worker beside the web server; `npm run worker` starts more elsewhere.
  const { startWorkers } = await import("../jobs/workers.server");
  const { stopBoss } = await import("../jobs/boss.server");
  await startWorkers();
  running.push({ name: "job worker", stop: () => stopBoss() });
  say("job worker started (report generation)");

  say("demo users (local demonstration only):");
  for (const u of DEMO_USERS) say(`  ${u.label.padEnd(9)} ${u.email.padEnd(42)} ${u.password}`);
  say(`Spanwright is serving on ${appOrigin} — Ctrl-C stops everything.`);
}

main().catch(async (error: unknown) => {
  console.error(`[spanwright] start-up failed: ${error instanceof Error ? error.message : String(error)}`);
  await shutdown(1);
});
