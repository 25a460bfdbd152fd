import { createHash } from "node:crypto";
import { execFile, spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import { appendFile, chown, mkdir, mkdtemp, readFile, readdir, readlink, rm, writeFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { createInterface } from "node:readline";
import { promisify } from "node:util";
import pg from "pg";

const execFileAsync = promisify(execFile);

const PG_ROOT = "/usr/lib/postgresql";
const INSTALL_AS_ROOT =
  "apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y --no-install-recommends postgresql";
const INSTALL_AS_USER = "sudo apt-get install -y postgresql";
/** Our settings live in their own file, rewritten on every start, so a changed port or mode applies. */
const MANAGED_CONF = "spanwright.conf";
const READY_TIMEOUT_MS = 60_000;

export interface PostgresOptions {
  /** Cluster folder; created and initialised on first use, reused afterwards. */
  dataDir: string;
  /** TCP port on 127.0.0.1. */
  port: number;
  /** Test cluster: durability off (fsync, synchronous_commit, full_page_writes) for speed. */
  throwaway?: boolean;
  /** Database to create when missing; the returned url points at it (else at `postgres`). */
  database?: string;
  /** Receives each line the server and initdb print. */
  log?: (line: string) => void;
}

export interface RunningPostgres {
  /** `postgres://postgres@127.0.0.1:PORT/DB` (trust authentication, loopback only). */
  url: string;
  port: number;
  /** The folder actually used: the one asked for, or, as root where the postgres user cannot enter it, /tmp (throwaway) or /var/lib/spanwright (durable). */
  dataDir: string;
  /** Fast shutdown (SIGINT: disconnect clients, checkpoint), resolved once the server has exited. */
  stop(): Promise<void>;
}

function isRoot(): boolean {
  return typeof process.getuid === "function" && process.getuid() === 0;
}

function compareVersions(a: string, b: string): number {
  const pa = a.split(".").map(Number);
  const pb = b.split(".").map(Number);
  for (let i = 0; i < Math.max(pa.length, pb.length); i++) {
    const d = (pa[i] ?? 0) - (pb[i] ?? 0);
    if (d !== 0) return d;
  }
  return 0;
}

async function newestInstalledBin(): Promise<string | undefined> {
  let versions: string[];
  try {
    versions = await readdir(PG_ROOT);
  } catch {
    return undefined;
  }
  const usable = versions
    .filter((v) => /^\d+(\.\d+)*$/.test(v))
    .sort(compareVersions)
    .reverse()
    .map((v) => join(PG_ROOT, v, "bin"))
    .filter((bin) => ["initdb", "pg_ctl", "postgres"].every((tool) => existsSync(join(bin, tool))));
  return usable[0];
}

function runStreaming(command: string): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn("bash", ["-c", command], { stdio: "inherit" });
    child.on("error", reject);
    child.on("exit", (code, signal) =>
      code === 0 ? resolvePromise() : reject(new Error(`\`${command}\` failed (${signal ?? `exit ${code}`})`)),
    );
  });
}

/**
 * Finds the newest Debian PostgreSQL server install (`/usr/lib/postgresql/<version>/bin` holding
 * initdb, pg_ctl and postgres). When none is installed: as root, installs Debian's `postgresql`
 * package with apt-get (output streamed) and looks again; otherwise throws an Error whose message is
 * exactly the command the user should run, so the caller can print it and stop.
 */
export async function findPostgresBin(): Promise<string> {
  const found = await newestInstalledBin();
  if (found) return found;
  if (!isRoot()) throw new Error(INSTALL_AS_USER);
  await runStreaming(INSTALL_AS_ROOT);
  const installed = await newestInstalledBin();
  if (!installed) throw new Error(`PostgreSQL server binaries still missing under ${PG_ROOT} after \`${INSTALL_AS_ROOT}\``);
  return installed;
}

interface PostgresUser {
  uid: number;
  gid: number;
}

async function postgresUser(): Promise<PostgresUser> {
  try {
    const [{ stdout: uid }, { stdout: gid }] = await Promise.all([
      execFileAsync("id", ["-u", "postgres"]),
      execFileAsync("id", ["-g", "postgres"]),
    ]);
    return { uid: Number(uid.trim()), gid: Number(gid.trim()) };
  } catch {
    throw new Error("The PostgreSQL server refuses to run as root and there is no `postgres` user; install Debian's postgresql package (it creates the user).");
  }
}

/** True when the postgres user can enter, read and write `dir` (every parent must be traversable). */
async function postgresCanUse(dir: string): Promise<boolean> {
  try {
    await execFileAsync("runuser", ["-u", "postgres", "--", "test", "-r", dir, "-a", "-w", dir, "-a", "-x", dir], { cwd: "/" });
    return true;
  } catch {
    return false;
  }
}

/** Creates the folder and, as root, hands it to the postgres user; returns the folder to use. */
async function prepareDataDir(dataDir: string, throwaway: boolean, user: PostgresUser | undefined): Promise<string> {
  await mkdir(dataDir, { recursive: true, mode: 0o700 });
  if (!user) return dataDir;
  await chown(dataDir, user.uid, user.gid);
  if (await postgresCanUse(dataDir)) return dataDir;
  if (!throwaway) {
    // As root in a folder the postgres user cannot enter (a 0700 home or temporary folder): keep the
    // cluster under /var/lib, in a folder named after the project's data folder, so it is found again.
    const parent = `/var/lib/spanwright/${createHash("sha256").update(dataDir).digest("hex").slice(0, 16)}`;
    await mkdir(parent, { recursive: true, mode: 0o755 });
    const stable = join(parent, "pg");
    await mkdir(stable, { recursive: true, mode: 0o700 });
    await chown(stable, user.uid, user.gid);
    if (await postgresCanUse(stable)) return stable;
    throw new Error(
      `The postgres user cannot reach ${dataDir} (a parent folder is probably mode 0700, such as a home folder). ` +
        `Put the data folder somewhere the postgres user can enter (for example under /tmp or /var/lib), or make its parents traversable (chmod o+x).`,
    );
  }
  // A throwaway cluster has no data worth keeping where it was asked for: use a fresh folder under /tmp.
  await rm(dataDir, { recursive: true, force: true }).catch(() => undefined);
  const fallback = await mkdtemp("/tmp/spanwright-pg-");
  await chown(fallback, user.uid, user.gid);
  return fallback;
}

function lineSink(log: ((line: string) => void) | undefined, tail: string[]) {
  return (line: string) => {
    tail.push(line);
    if (tail.length > 40) tail.shift();
    log?.(line);
  };
}

function collectLines(stream: NodeJS.ReadableStream | null, sink: (line: string) => void): void {
  if (!stream) return;
  createInterface({ input: stream, crlfDelay: Infinity }).on("line", sink);
}

async function runTool(bin: string, args: string[], user: PostgresUser | undefined, sink: (line: string) => void): Promise<void> {
  const [command, fullArgs] = user ? ["runuser", ["-u", "postgres", "--", bin, ...args]] : [bin, args];
  await new Promise<void>((resolvePromise, reject) => {
    const child = spawn(command, fullArgs, { cwd: "/", stdio: ["ignore", "pipe", "pipe"] });
    collectLines(child.stdout, sink);
    collectLines(child.stderr, sink);
    child.on("error", reject);
    child.on("exit", (code, signal) =>
      code === 0 ? resolvePromise() : reject(new Error(`${bin} ${args.join(" ")} failed (${signal ?? `exit ${code}`})`)),
    );
  });
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

async function waitForExit(pid: number, timeoutMs: number): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (!processAlive(pid)) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return !processAlive(pid);
}

/**
 * Deals with a postmaster.pid left behind (for instance after a kill -9 of a previous run): a
 * postmaster still serving this folder is shut down; a dead one needs nothing (the server replaces
 * its lock file); a PID since reused by an unrelated process would make the server refuse to start,
 * so that lock file is removed.
 */
async function clearStalePostmaster(dataDir: string, sink: (line: string) => void): Promise<void> {
  const pidFile = join(dataDir, "postmaster.pid");
  let pid: number;
  try {
    pid = Number((await readFile(pidFile, "utf8")).split("\n")[0]);
  } catch {
    return;
  }
  if (!Number.isInteger(pid) || pid <= 0 || !processAlive(pid)) return;
  const cwd = await readlink(`/proc/${pid}/cwd`).catch(() => "");
  if (resolve(cwd) !== resolve(dataDir)) {
    sink(`postmaster.pid names PID ${pid}, which is not a server for ${dataDir}; removing the stale lock file`);
    await rm(pidFile, { force: true });
    return;
  }
  sink(`an earlier server (PID ${pid}) still runs on ${dataDir}; shutting it down`);
  process.kill(pid, "SIGINT");
  if (await waitForExit(pid, 30_000)) return;
  process.kill(pid, "SIGQUIT");
  if (!(await waitForExit(pid, 5_000))) throw new Error(`The earlier PostgreSQL server (PID ${pid}) on ${dataDir} does not stop; stop it by hand.`);
}

function managedConf(port: number, throwaway: boolean): string {
  const lines = [
    "# Written by app/server/dev-services/postgres.ts on every start; edits here are overwritten.",
    "listen_addresses = '127.0.0.1'",
    `port = ${port}`,
    // TCP only: no socket folder whose permissions could stop a non-root user.
    "unix_socket_directories = ''",
  ];
  if (throwaway) lines.push("fsync = off", "synchronous_commit = off", "full_page_writes = off");
  return lines.join("\n") + "\n";
}

async function writeConfig(dataDir: string, port: number, throwaway: boolean, user: PostgresUser | undefined): Promise<void> {
  const mainConf = join(dataDir, "postgresql.conf");
  const include = `include_if_exists = '${MANAGED_CONF}'`;
  if (!(await readFile(mainConf, "utf8")).includes(include)) await appendFile(mainConf, `\n${include}\n`);
  const confPath = join(dataDir, MANAGED_CONF);
  await writeFile(confPath, managedConf(port, throwaway));
  if (user) await chown(confPath, user.uid, user.gid);
}

/**
 * A small shell that outlives nothing: when the calling Node process ends in any way (even kill -9),
 * the pipe on its stdin closes and it asks the server for a fast shutdown, so no server is orphaned.
 */
function spawnWatchdog(serverPid: number): ChildProcess {
  // `read` is a shell builtin: no grandchild is left behind when the watchdog itself is killed.
  // Its own process group and deaf to signals: a Ctrl-C or group kill aimed at the caller must not
  // end the watchdog before it has done its one job.
  const watchdog = spawn("sh", ["-c", `trap '' INT TERM HUP; while read -r _; do :; done; kill -INT ${serverPid} 2>/dev/null`], {
    stdio: ["pipe", "ignore", "ignore"],
    detached: true,
  });
  watchdog.unref();
  (watchdog.stdin as unknown as { unref?: () => void } | null)?.unref?.();
  return watchdog;
}

function escapeIdentifier(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

async function waitUntilReady(port: number, exited: () => string | undefined): Promise<void> {
  const deadline = Date.now() + READY_TIMEOUT_MS;
  let lastError: unknown;
  while (Date.now() < deadline) {
    const reason = exited();
    if (reason) throw new Error(reason);
    const client = new pg.Client({ host: "127.0.0.1", port, user: "postgres", database: "postgres", connectionTimeoutMillis: 2_000 });
    client.on("error", () => undefined);
    try {
      await client.connect();
      await client.query("SELECT 1");
      return;
    } catch (error) {
      lastError = error;
    } finally {
      await client.end().catch(() => undefined);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`PostgreSQL on 127.0.0.1:${port} did not accept connections within ${READY_TIMEOUT_MS / 1000} s: ${String(lastError)}`);
}

async function ensureDatabase(port: number, database: string): Promise<void> {
  const client = new pg.Client({ host: "127.0.0.1", port, user: "postgres", database: "postgres" });
  await client.connect();
  try {
    const found = await client.query("SELECT 1 FROM pg_database WHERE datname = $1", [database]);
    if (found.rowCount === 0) {
      await client.query(`CREATE DATABASE ${escapeIdentifier(database)}`).catch((error: { code?: string }) => {
        // Someone else created it between the check and now: that is what we wanted.
        if (error.code !== "42P04") throw error;
      });
    }
  } finally {
    await client.end();
  }
}

// After a kill -9 the old server's backends hold its shared memory for a moment; retrying is enough.
const RETRYABLE_START = /shared memory block .* is still in use|lock file .* already exists|could not create shared memory segment/i;

/**
 * Starts a PostgreSQL server from Debian's binaries as a child of this process, listening on
 * 127.0.0.1:`port` only (TCP, no Unix socket), trust authentication for user `postgres`.
 *
 * Initialises the cluster on first use (`initdb -U postgres --auth=trust -E UTF8 --locale=C.UTF-8`,
 * plus `--no-sync` when throwaway) and reuses its data on later starts. As root the server runs as the
 * `postgres` user (which must be able to reach `dataDir`; a throwaway cluster falls back to /tmp).
 * Resolves once the server accepts connections (at most 60 s) and `database`, if given, exists.
 * The server stops with `stop()`, or by itself when this process exits.
 */
export async function startPostgres(opts: PostgresOptions): Promise<RunningPostgres> {
  const bin = await findPostgresBin();
  const throwaway = opts.throwaway ?? false;
  const tail: string[] = [];
  const sink = lineSink(opts.log, tail);
  const user = isRoot() ? await postgresUser() : undefined;
  const dataDir = await prepareDataDir(resolve(opts.dataDir), throwaway, user);

  if (!existsSync(join(dataDir, "PG_VERSION"))) {
    const args = ["-D", dataDir, "-U", "postgres", "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"];
    if (throwaway) args.push("--no-sync");
    await runTool(join(bin, "initdb"), args, user, sink).catch((error: Error) => {
      throw new Error(`${error.message}\n${tail.join("\n")}`);
    });
  }
  await writeConfig(dataDir, opts.port, throwaway, user);
  await clearStalePostmaster(dataDir, sink);

  let server: { child: ChildProcess; watchdog: ChildProcess | undefined } | undefined;
  for (let attempt = 1; ; attempt++) {
    tail.length = 0;
    // Spawned directly (uid/gid) rather than through runuser, so our signals reach the server itself.
    // Its own process group: a Ctrl-C meant for the caller reaches the caller, which stops its
    // clients first and then calls stop(); if the caller dies instead, the watchdog stops the server.
    const child = spawn(join(bin, "postgres"), ["-D", dataDir], {
      cwd: "/",
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
      ...(user ? { uid: user.uid, gid: user.gid } : {}),
    });
    collectLines(child.stdout, sink);
    collectLines(child.stderr, sink);
    const watchdog = child.pid ? spawnWatchdog(child.pid) : undefined;
    let exitReason: string | undefined;
    const exited = new Promise<void>((r) => child.once("exit", () => r()));
    child.once("exit", (code, signal) => {
      exitReason = `PostgreSQL exited during start-up (${signal ?? `exit ${code}`}):\n${tail.join("\n")}`;
    });
    child.once("error", (error) => {
      exitReason = `Could not run ${join(bin, "postgres")}: ${error.message}`;
    });
    try {
      await waitUntilReady(opts.port, () => exitReason);
      server = { child, watchdog };
      break;
    } catch (error) {
      watchdog?.kill("SIGKILL");
      if (exitReason === undefined) {
        child.kill("SIGQUIT");
        await exited;
        throw error;
      }
      if (attempt >= 20 || !RETRYABLE_START.test(exitReason)) throw error;
      await new Promise((r) => setTimeout(r, 500));
    }
  }

  const { child: running, watchdog } = server;
  const serverExited = new Promise<void>((r) => {
    if (running.exitCode !== null || running.signalCode !== null) r();
    else running.once("exit", () => r());
  });
  let stopping: Promise<void> | undefined;
  const stop = () => {
    stopping ??= (async () => {
      running.kill("SIGINT");
      const timer = setTimeout(() => running.kill("SIGQUIT"), 30_000);
      await serverExited;
      clearTimeout(timer);
      watchdog?.kill("SIGKILL");
      // A /tmp folder we chose ourselves (see prepareDataDir) is ours to clean up.
      if (dataDir !== resolve(opts.dataDir)) await rm(dataDir, { recursive: true, force: true });
    })();
    return stopping;
  };

  try {
    if (opts.database) await ensureDatabase(opts.port, opts.database);
  } catch (error) {
    await stop();
    throw error;
  }
  const database = opts.database ?? "postgres";
  return {
    url: `postgres://postgres@127.0.0.1:${opts.port}/${encodeURIComponent(database)}`,
    port: opts.port,
    dataDir,
    stop,
  };
}
