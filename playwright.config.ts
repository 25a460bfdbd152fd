import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { defineConfig, devices } from "@playwright/test";
import { CHROMIUM_ARGS, CHROMIUM_PATH } from "./tests/chromium";

// E2E_PORT_BASE moves every port of the run (app, PostgreSQL, S3, SMTP, OIDC) so that two
// checkouts can run their browser tests side by side; the default is 3100.
const BASE = Number(process.env.E2E_PORT_BASE ?? 3100);
const PORT = BASE;
const ORIGIN = `http://127.0.0.1:${PORT}`;
process.env.E2E_ORIGIN = ORIGIN;
// The app's own PostgreSQL, for the tests that change stored data as only someone outside the app could.
process.env.E2E_DATABASE_URL = `postgres://postgres@127.0.0.1:${BASE + 51239}/spanwright`;
const PREFIX = "spanwright-e2e-";

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * A fresh data folder per run: the one tests/run-all.ts passes in SPANWRIGHT_E2E_DATA_DIR (it removes
 * it afterwards), or else one named after the runner's PID. Playwright loads this file again in
 * every worker, so the first load records the folder in the environment the workers inherit. Folders
 * of earlier runs whose runner is gone are removed here (the app server still uses its own until the
 * run ends, so it cannot be removed at teardown).
 */
function e2eDataDir(): string {
  const existing = process.env.SPANWRIGHT_E2E_DATA_DIR;
  if (existing) return existing;
  for (const name of fs.readdirSync(os.tmpdir())) {
    const pid = Number(name.slice(PREFIX.length));
    if (name.startsWith(PREFIX) && Number.isInteger(pid) && !alive(pid)) {
      fs.rmSync(path.join(os.tmpdir(), name), { recursive: true, force: true });
    }
  }
  const dir = path.join(os.tmpdir(), `${PREFIX}${process.pid}`);
  fs.rmSync(dir, { recursive: true, force: true });
  // 0755, not mkdtemp's 0700: as root, the postgres user must be able to enter it.
  fs.mkdirSync(dir, { recursive: true, mode: 0o755 });
  process.env.SPANWRIGHT_E2E_DATA_DIR = dir;
  return dir;
}

export default defineConfig({
  testDir: "tests/e2e",
  testMatch: "*.spec.ts",
  workers: 1,
  fullyParallel: false,
  forbidOnly: Boolean(process.env.CI),
  retries: 0,
  // The limits say when a test has hung, not how fast a page must be (speed is measured by
  // `npm run bench`, never asserted here). On two cores shared with other work, a page whose loader
  // solves a sweep takes seconds: the tests wait for what the page shows, up to these bounds.
  timeout: 120_000,
  expect: { timeout: 20_000 },
  reporter: "list",
  use: {
    ...devices["Desktop Chrome"],
    baseURL: ORIGIN,
    viewport: { width: 1280, height: 800 },
    screenshot: "only-on-failure",
    trace: "off",
    launchOptions: {
      executablePath: CHROMIUM_PATH,
      args: CHROMIUM_ARGS,
    },
  },
  webServer: {
    command: "npx tsx app/server/start.ts",
    url: `${ORIGIN}/healthz`,
    timeout: 240_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
    // SIGINT to the whole group: start.ts shuts its services down, PostgreSQL does a fast shutdown.
    gracefulShutdown: { signal: "SIGINT", timeout: 20_000 },
    env: {
      SPANWRIGHT_DATA_DIR: e2eDataDir(),
      PORT: String(PORT),
      PG_PORT: new URL(process.env.E2E_DATABASE_URL).port,
      S3_PORT: String(BASE + 1479),
      SMTP_PORT: String(BASE - 565),
      OIDC_PORT: String(BASE + 1490),
      APP_ORIGIN: ORIGIN,
      // The browser tests reach the app directly; the throttling spec names its own client address as
      // a proxy would (X-Forwarded-For), so its failures hold back no other spec's sign-ins.
      TRUST_PROXY: "loopback",
      // Always the stand-ins, even when the calling shell points at real services.
      DATABASE_URL: "",
      S3_ENDPOINT: "",
      SMTP_URL: "",
      OIDC_ISSUER: "",
    },
  },
});
