// What the benchmarks that drive the built app share: the app started with its own data folder and
// ports (always the stand-ins), stopped with its services, and each script's section of
// docs/benchmarks.md replaced between its markers.
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";

export const root = path.join(import.meta.dirname, "..", "..");

export interface BenchAppPorts {
  port: number;
  pg: number;
  s3: number;
  smtp: number;
  oidc: number;
}

/** The app under a benchmark: `tsx app/server/start.ts` on its own ports and in its own data folder. */
export function benchApp(name: string, ports: BenchAppPorts, say: (line: string) => void) {
  const origin = `http://127.0.0.1:${ports.port}`;
  const dataDir = path.join(os.tmpdir(), `spanwright-${name}-${process.pid}`);
  fs.rmSync(dataDir, { recursive: true, force: true });
  // 0755, not mkdtemp's 0700: as root, the postgres user must be able to enter it.
  fs.mkdirSync(dataDir, { recursive: true, mode: 0o755 });
  const env = {
    ...process.env,
    SPANWRIGHT_DATA_DIR: dataDir,
    PORT: String(ports.port),
    APP_ORIGIN: origin,
    PG_PORT: String(ports.pg),
    S3_PORT: String(ports.s3),
    SMTP_PORT: String(ports.smtp),
    OIDC_PORT: String(ports.oidc),
    NODE_ENV: "production",
    // Always the stand-ins, even when the calling shell points at real services.
    DATABASE_URL: "",
    S3_ENDPOINT: "",
    SMTP_URL: "",
    OIDC_ISSUER: "",
  };
  let app: ChildProcess | undefined;
  const log: string[] = [];
  const tail = () => log.slice(-30).join("");

  return {
    origin,
    dataDir,
    databaseUrl: `postgres://postgres@127.0.0.1:${ports.pg}/spanwright`,
    /** The process id of start.ts (the group leader). */
    pid: () => app?.pid,
    /** Starts the app and waits for /healthz; the seconds it took. */
    async start(timeoutMs = 300_000): Promise<number> {
      const t0 = performance.now();
      app = spawn(path.join(root, "node_modules", ".bin", "tsx"), ["app/server/start.ts"], { cwd: root, env, detached: true, stdio: ["ignore", "pipe", "pipe"] });
      app.stdout!.on("data", (b: Buffer) => log.push(b.toString()));
      app.stderr!.on("data", (b: Buffer) => log.push(b.toString()));
      say(`starting the app on ${origin} (data in ${dataDir})…`);
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        if (app.exitCode !== null) throw new Error(`the app exited during start-up:\n${tail()}`);
        const ok = await fetch(`${origin}/healthz`).then((r) => r.ok, () => false);
        if (ok) return (performance.now() - t0) / 1000;
        if (Date.now() > deadline) throw new Error(`no healthy app on ${origin} after ${timeoutMs / 1000} s:\n${tail()}`);
        await new Promise((r) => setTimeout(r, 250));
      }
    },
    /** Stops the app with its services and removes its data folder. */
    async stop() {
      if (app && app.exitCode === null && app.signalCode === null) {
        const running = app;
        const exited = new Promise<void>((r) => running.once("exit", () => r()));
        // SIGINT to the whole group: start.ts stops its services, PostgreSQL does a fast shutdown.
        process.kill(-running.pid!, "SIGINT");
        const timer = setTimeout(() => process.kill(-running.pid!, "SIGKILL"), 30_000);
        await exited;
        clearTimeout(timer);
      }
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/**
 * Replaces the part of docs/benchmarks.md between `start` and `end` (markers included in `section`) with
 * `section`, keeping the rest; where the markers are not there yet, `place` decides (default: at the end).
 */
export function writeDocsSection(start: string, end: string, section: string, place: (existing: string) => string = (existing) => `${existing.trimEnd()}\n\n${section}\n`): string {
  const file = path.join(root, "docs", "benchmarks.md");
  const existing = fs.existsSync(file) ? fs.readFileSync(file, "utf8") : "";
  const a = existing.indexOf(start);
  const z = existing.indexOf(end);
  const next = a >= 0 && z > a ? existing.slice(0, a) + section + existing.slice(z + end.length) : place(existing);
  fs.writeFileSync(file, next);
  return file;
}
