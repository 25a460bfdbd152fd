/**
 * Vitest globalSetup of the integration project: one throwaway PostgreSQL cluster with a migrated
 * template database, the S3 stand-in and the mail capture, started once for the whole run on free
 * loopback ports in a temporary folder, and all stopped and removed afterwards. Each test file then
 * clones its own database from the template (see setup-test-env.ts).
 */
import { chmod, mkdir, mkdtemp, rm } from "node:fs/promises";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { runMigrations } from "../../app/db/migrate.server";
import { startMailCapture } from "../../app/server/dev-services/mail";
import { startPostgres } from "../../app/server/dev-services/postgres";
import { startS3 } from "../../app/server/dev-services/s3";

export const TEMPLATE_DATABASE = "spanwright_template";
export const TEST_BUCKETS = ["spanwright-uploads", "spanwright-reports", "spanwright-audit"];

/** What the workers receive through `inject("testServices")`. */
export interface TestServices {
  /** Server URL without a database name: `postgres://postgres@127.0.0.1:PORT`. */
  postgresServerUrl: string;
  templateDatabase: string;
  s3Endpoint: string;
  smtpPort: number;
  mailDir: string;
}

declare module "vitest" {
  export interface ProvidedContext {
    testServices: TestServices;
  }
}

/** A port the OS reports free right now; the tiny race until the server binds is acceptable in tests. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      const port = typeof address === "object" && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const started = Date.now();
  const root = await mkdtemp(join(tmpdir(), "spanwright-test-"));
  // mkdtemp makes the folder 0700; the postgres user (when we run as root) must be able to pass through.
  await chmod(root, 0o711);
  const stops: (() => Promise<void>)[] = [];
  const teardown = async () => {
    for (const stop of stops.reverse()) await stop().catch((error: unknown) => process.stderr.write(`test services teardown: ${String(error)}\n`));
    await rm(root, { recursive: true, force: true });
  };

  const pgLog: string[] = [];
  try {
    const pgPort = await freePort();
    const postgres = await startPostgres({
      dataDir: join(root, "pg"),
      port: pgPort,
      throwaway: true,
      database: TEMPLATE_DATABASE,
      log: (line) => pgLog.push(line),
    });
    stops.push(postgres.stop);
    await runMigrations(postgres.url);

    const s3 = await startS3({ dir: join(root, "s3"), port: 0, buckets: TEST_BUCKETS });
    stops.push(s3.stop);

    const mailDir = join(root, "mail");
    await mkdir(mailDir, { recursive: true });
    const mail = await startMailCapture({ port: 0, dir: mailDir });
    stops.push(mail.stop);

    project.provide("testServices", {
      postgresServerUrl: `postgres://postgres@127.0.0.1:${postgres.port}`,
      templateDatabase: TEMPLATE_DATABASE,
      s3Endpoint: s3.endpoint,
      smtpPort: mail.port,
      mailDir,
    });
    process.stdout.write(`test services ready in ${Date.now() - started} ms (PostgreSQL :${postgres.port}, S3 ${s3.endpoint}, SMTP :${mail.port})\n`);
  } catch (error) {
    await teardown();
    const tail = pgLog.slice(-20).join("\n");
    throw new Error(`${error instanceof Error ? error.message : String(error)}${tail ? `\nPostgreSQL said:\n${tail}` : ""}`);
  }
  return teardown;
}
