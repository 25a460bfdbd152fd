/**
 * Vitest setupFiles of the integration project, run in the worker before each test file (and so
 * before any app module it imports): gives the file its own database cloned from the migrated
 * template, points the app's environment at the shared stand-in services, drops the database after
 * the file, and makes any console.error fail the test that caused it.
 */
import { randomBytes } from "node:crypto";
import pg from "pg";
import { afterAll, afterEach, beforeEach, inject, vi, type MockInstance } from "vitest";

const services = inject("testServices");

function adminClient(): pg.Client {
  return new pg.Client({ connectionString: `${services.postgresServerUrl}/postgres` });
}

async function withAdmin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = adminClient();
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

// Pool id keeps names readable per worker; the random part keeps successive files in one worker apart.
const database = `test_${process.env.VITEST_POOL_ID ?? "0"}_${randomBytes(4).toString("hex")}`;

await withAdmin(async (client) => {
  for (let attempt = 1; ; attempt++) {
    try {
      await client.query(`CREATE DATABASE "${database}" TEMPLATE "${services.templateDatabase}"`);
      return;
    } catch (error) {
      // 55006: the template is briefly in use (another clone starting); anything else is a real failure.
      if ((error as { code?: string }).code !== "55006" || attempt >= 20) throw error;
      await new Promise((r) => setTimeout(r, 100));
    }
  }
});

Object.assign(process.env, {
  NODE_ENV: "test",
  DATABASE_URL: `${services.postgresServerUrl}/${database}`,
  S3_ENDPOINT: services.s3Endpoint,
  S3_ACCESS_KEY_ID: "S3RVER",
  S3_SECRET_ACCESS_KEY: "S3RVER",
  S3_REGION: "us-east-1",
  SMTP_URL: `smtp://127.0.0.1:${services.smtpPort}`,
  MAIL_CAPTURE_DIR: services.mailDir,
  APP_ORIGIN: "http://127.0.0.1:3000",
});

afterAll(async () => {
  // Close the app's pool first if the file used it, so the drop does not cut live connections.
  const client = await import("../../app/db/client.server").catch(() => undefined);
  await client?.closeDb();
  await withAdmin((admin) => admin.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`));
});

let consoleError: MockInstance<typeof console.error>;
let reported: unknown[][] = [];

beforeEach(() => {
  reported = [];
  const original = console.error;
  // A test that expects an error replaces this with consoleError.mockImplementation(() => {}).
  consoleError = vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    reported.push(args);
    original(...args);
  });
});

afterEach(() => {
  consoleError.mockRestore();
  if (reported.length > 0) {
    const first = reported[0]!.map((a) => (a instanceof Error ? a.stack ?? a.message : String(a))).join(" ");
    throw new Error(`console.error was called ${reported.length} time(s) during this test; the first: ${first}`);
  }
});
