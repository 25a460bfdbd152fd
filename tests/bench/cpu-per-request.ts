// CPU per request of one page, served by one web process of the production build, against the
// peer page (tests/bench/peer) — and, optionally, by other checkouts of the app (a commit before a
// change) — interleaved in rounds on one database. CPU time is read from /proc (user + system of
// the serving process ÷ requests), which a shared machine disturbs far less than latency. Not a
// test and not part of `npm run bench`: the tool behind "Where a page's time goes" in
// docs/benchmarks.md.
//
//   npx tsx tests/bench/cpu-per-request.ts --database postgres://postgres@127.0.0.1:PORT/spanwright \
//     --sign-in http://127.0.0.1:APP_PORT [--path /cases/{case}] [--requests 1500] [--rounds 3] \
//     [--also before=/path/to/other/checkout] [--flags before=--node-option,...] [--profile] [--compressed]
//
// The database is a running app's (`npm start` with WEB_PROCESSES=1 and SPANWRIGHT_DATA_DIR):
// the demo engineer signs in there, and the session cookie serves every server measured. Each
// checkout must be built (`npx react-router build`); with --profile every server also writes V8 CPU
// profiles (.cpuprofile, one per thread) into profiles/<name>/ of the current folder.
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import autocannon from "autocannon";
import { DEMO_USERS } from "../../app/demo/scenario";

const root = path.join(import.meta.dirname, "..", "..");
const arg = (name: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : undefined;
};
const DATABASE_URL = arg("database") ?? "";
const SIGN_IN = arg("sign-in") ?? "";
const REQUESTS = Number(arg("requests") ?? 1500);
const ROUNDS = Number(arg("rounds") ?? 3);
const PAGE = arg("path") ?? "/cases/{case}";
const PROFILE = process.argv.includes("--profile");
// As the load benchmark's autocannon asks, uncompressed unless --compressed (then brotli, as browsers).
const ENCODING: Record<string, string> = process.argv.includes("--compressed") ? { "Accept-Encoding": "br, gzip" } : {};
if (!DATABASE_URL || !SIGN_IN) throw new Error("--database and --sign-in are required (see the comment at the top)");
// --flags name=--a,--b: node options for the server of that name (runtime settings compared side by side).
const flags = new Map(process.argv.flatMap((a, i) => (a === "--flags" ? [process.argv[i + 1]!] : [])).map((s) => [s.slice(0, s.indexOf("=")), s.slice(s.indexOf("=") + 1).split(",")]));
const others = process.argv.flatMap((a, i) => (a === "--also" ? [process.argv[i + 1]!] : [])).map((s) => {
  const [name, dir] = s.split("=");
  return { name: name!, dir: path.resolve(dir!) };
});

const TICK_MS = 1000 / Number(execFileSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).trim());
function cpuMs(pid: number): number {
  const stat = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  return (Number(fields[11]) + Number(fields[12])) * TICK_MS;
}

interface Server {
  name: string;
  origin: string;
  process: ChildProcess;
  pid: number;
}

async function start(name: string, cwd: string, script: string, port: number, env: Record<string, string>): Promise<Server> {
  const origin = `http://127.0.0.1:${port}`;
  const nodeArgs = [...(flags.get(name) ?? []), "--import", "tsx", ...(PROFILE ? ["--cpu-prof", `--cpu-prof-dir=${path.resolve("profiles", name.replace(/\W+/g, "-"))}`] : [])];
  const child = spawn(process.execPath, [...nodeArgs, script], {
    cwd,
    env: { ...process.env, NODE_ENV: "production", PORT: String(port), APP_ORIGIN: origin, DATABASE_URL, WEB_PROCESSES: "1", ...env },
    stdio: ["ignore", "inherit", "inherit"],
  });
  for (let i = 0; ; i++) {
    try {
      await fetch(`${origin}/`);
      break;
    } catch {
      if (i > 240) throw new Error(`${name} did not start on ${origin}`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }
  // With --import tsx node runs the script itself: the spawned process is the server.
  return { name, origin, process: child, pid: child.pid! };
}

async function drive(server: Server, url: string, cookie: string, amount: number): Promise<{ cpu: number; rps: number; non2xx: number }> {
  const before = cpuMs(server.pid);
  const result = await autocannon({ url: server.origin + url, headers: { Cookie: cookie, ...ENCODING }, connections: 10, amount, timeout: 30 });
  return { cpu: (cpuMs(server.pid) - before) / amount, rps: result.requests.average, non2xx: result.non2xx + result.errors };
}

async function main() {
  const engineer = DEMO_USERS.find((u) => u.label === "engineer")!;
  const login = await fetch(`${SIGN_IN}/login`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: SIGN_IN },
    body: new URLSearchParams({ email: engineer.email, password: engineer.password }),
  });
  const cookie = login.headers.get("set-cookie")?.split(";")[0] ?? "";
  if (!cookie.startsWith("sw_session=")) throw new Error(`sign-in failed: ${login.status}`);
  const list = (await (await fetch(`${SIGN_IN}/api/v1/cases`, { headers: { Cookie: cookie } })).json()) as { cases: { id: string; reference: string }[] };
  const caseId = list.cases.find((c) => c.reference === "TN-WL-001")!.id;
  const url = PAGE.replace("{case}", caseId);

  const peerDir = path.join(root, "tests", "bench", "peer");
  execFileSync(path.join(root, "node_modules", ".bin", "react-router"), ["build"], { cwd: peerDir, stdio: "ignore" });
  const servers: Server[] = [await start("peer", peerDir, path.join(peerDir, "server.ts"), 4530, {})];
  const apps = [{ name: "this checkout", dir: root }, ...others];
  for (const [i, a] of apps.entries()) servers.push(await start(a.name, a.dir, path.join(a.dir, "app", "server", "web.ts"), 4531 + i, {}));
  try {
    for (const s of servers) {
      const res = await fetch(s.origin + (s.name === "peer" ? `/cases/${caseId}` : url), { headers: { Cookie: cookie } });
      const html = await res.text();
      process.stdout.write(`${s.name}: ${res.status}, ${html.length} characters of HTML\n`);
      await drive(s, s.name === "peer" ? `/cases/${caseId}` : url, cookie, Math.round(REQUESTS / 2)); // warm-up
    }
    const table: Record<string, number[]> = {};
    for (let round = 1; round <= ROUNDS; round++) {
      for (const s of servers) {
        const r = await drive(s, s.name === "peer" ? `/cases/${caseId}` : url, cookie, REQUESTS);
        (table[s.name] ??= []).push(r.cpu);
        process.stdout.write(`round ${round} ${s.name}: ${r.cpu.toFixed(2)} ms CPU per request, ${r.rps.toFixed(0)} req/s, ${r.non2xx} failed\n`);
      }
    }
    const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;
    const peer = median(table.peer!);
    process.stdout.write(`\nload average ${(await import("node:os")).loadavg().map((v) => v.toFixed(1)).join(" / ")}\n`);
    for (const [name, v] of Object.entries(table)) process.stdout.write(`${name}: ${v.map((x) => x.toFixed(2)).join(", ")} → median ${median(v).toFixed(2)} ms (${(median(v) / peer).toFixed(2)}× the peer)\n`);
  } finally {
    // SIGTERM: web.ts closes and exits, and node writes the CPU profile on exit.
    for (const s of servers) s.process.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 1500));
  }
}

await main();
