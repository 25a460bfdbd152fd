/**
 * Faults: S3 cutting the connection in the middle of a report upload, the database restarting while
 * a report is being recorded and between page requests, and sessions outliving the app's process.
 * The database here is a cluster of this file's own (restarting the shared one would break every
 * other file), migrated and seeded like the app's.
 */
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { STEPS } from "~/domain/steps";
import { closeDb, db } from "~/db/client.server";
import { runMigrations } from "~/db/migrate.server";
import { auditLog, caseSteps, cases, reports, users, type Report } from "~/db/schema";
import { DATABASE_UNAVAILABLE_MESSAGE } from "~/utils/unavailable.server";
import { startPostgres, type RunningPostgres } from "~/server/dev-services/postgres";
import { action as reviewAction } from "~/routes/cases/review";
import { loader as casesLoader } from "~/routes/cases/list";
import { loader as apiCasesLoader } from "~/routes/api/v1/cases";
import { createReportRow, generateReport, setProgress } from "~/services/reports.server";
import { HeadObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { listKeys, resetS3Client, s3 } from "~/services/storage.server";
import { resetEnvCache } from "~/utils/env.server";
import { freePort } from "../setup/global-setup";
import { RouterContextProvider } from "react-router";
import { cookieFor, demoUser, form, request, run, seed, routeArgs } from "./helpers";

let dir = "";
let pgPort = 0;
let postgres: RunningPostgres | undefined;
let caseId = "";
let report: Report;
const cookies: Record<string, string> = {};

const startOwnPostgres = () => startPostgres({ dataDir: path.join(dir, "pg"), port: pgPort, throwaway: true, database: "spanwright_faults" });

/** A fast shutdown and a start on the same folder and port: what an operator's restart does. */
async function stopPostgres() {
  await postgres!.stop();
  postgres = undefined;
}

/** Runs a loader and returns the Response it answered or threw, whatever it was. */
async function answer(fn: (args: never) => unknown, req: Request): Promise<Response> {
  try {
    const out = await fn((await routeArgs(req, {})) as never);
    if (out instanceof Response) return out;
    return Response.json(out);
  } catch (thrown) {
    if (thrown instanceof Response) return thrown;
    throw thrown;
  }
}

const review = (who: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie: cookies[who], body: form(fields) }), params: { caseId } });

/** Size, time and SHA-256 of stored objects, as the store reports them (for a failure's message). */
async function objectHeads(keys: string[]): Promise<string> {
  const heads = await Promise.all(
    keys.map(async (key) => {
      const h = await s3().send(new HeadObjectCommand({ Bucket: "spanwright-reports", Key: key }));
      return { key, size: h.ContentLength, lastModified: h.LastModified?.toISOString(), sha256: h.Metadata?.sha256 };
    }),
  );
  return `${JSON.stringify(heads)} at ${new Date().toISOString()}`;
}

async function issueAudits(reportId: string) {
  return db.select().from(auditLog).where(and(eq(auditLog.action, "report.issue"), eq(auditLog.entityId, reportId)));
}

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "sw-faults-"));
  // mkdtemp gives 0700; as root, the postgres user must be able to pass through to its data folder.
  fs.chmodSync(dir, 0o711);
  pgPort = await freePort();
  postgres = await startOwnPostgres();
  await closeDb();
  process.env.DATABASE_URL = postgres.url;
  await runMigrations(postgres.url);
  await seed();
  for (const who of ["engineer", "checker"]) cookies[who] = await cookieFor(who as never);
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  for (const s of STEPS) {
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, s.key)));
    if (row!.status !== "submitted") expect((await review("engineer", { intent: "submit", step: s.key, password: demoUser("engineer").password })).status).toBe(200);
    expect((await review("checker", { intent: "approve", step: s.key, password: demoUser("checker").password })).status).toBe(200);
  }
  expect((await review("checker", { intent: "approve-case", password: demoUser("checker").password })).status).toBe(200);
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  report = await createReportRow({ caseId, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
}, 120_000);

afterAll(async () => {
  await closeDb();
  await postgres?.stop();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe("a report through S3 and database faults", () => {
  it("leaves nothing stored or recorded when S3 cuts the connection in the middle of the upload", async () => {
    // A loopback proxy in front of the S3 stand-in that lets a PUT's head and its first 8 KiB of
    // body through and then drops both sides: the store sees an upload that never finishes.
    const upstream = new URL(process.env.S3_ENDPOINT!);
    let cuts = 0;
    const proxy = net.createServer((client) => {
      const server = net.connect(Number(upstream.port), upstream.hostname);
      let forwarded = 0;
      let isPut: boolean | undefined;
      client.on("error", () => {});
      server.on("error", () => client.destroy());
      server.pipe(client);
      client.on("data", (chunk: Buffer) => {
        isPut ??= chunk.subarray(0, 4).toString("latin1") === "PUT ";
        forwarded += chunk.length;
        if (isPut && forwarded > 8192) {
          cuts++;
          server.write(chunk.subarray(0, Math.max(0, chunk.length - (forwarded - 8192))));
          server.destroy();
          client.destroy();
          return;
        }
        server.write(chunk);
      });
      client.on("end", () => server.end());
    });
    await new Promise<void>((r) => proxy.listen(0, "127.0.0.1", r));
    const saved = process.env.S3_ENDPOINT;
    process.env.S3_ENDPOINT = `http://127.0.0.1:${(proxy.address() as net.AddressInfo).port}`;
    resetEnvCache();
    resetS3Client();
    try {
      await expect(generateReport(report.id, { retryCount: 0, retryLimit: 3 })).rejects.toThrow();
    } finally {
      process.env.S3_ENDPOINT = saved;
      resetEnvCache();
      resetS3Client();
      await new Promise<void>((r) => proxy.close(() => r()));
    }
    expect(cuts).toBeGreaterThan(0);
    expect(await listKeys("spanwright-reports", `cases/${caseId}/`)).toEqual([]);
    const [row] = await db.select().from(reports).where(eq(reports.id, report.id));
    // Queued again for the job's next attempt, with the reason kept for the reports page.
    expect(row).toMatchObject({ status: "queued", sha256: null, key: null, issuedAt: null });
    expect(row!.progressNote).toMatch(/failed; retrying/);
    expect(await issueAudits(report.id)).toHaveLength(0);
  }, 120_000);

  it("keeps a failed attempt's note when a progress write of that attempt arrives late", async () => {
    // The renderer's progress writes are not awaited: one can reach the database after the attempt
    // has failed and the row went back to "queued". It must not overwrite "failed; retrying".
    const [before] = await db.select().from(reports).where(eq(reports.id, report.id));
    expect(before!.status).toBe("queued");
    await setProgress(report.id, 80, "Attached documents");
    const [after] = await db.select().from(reports).where(eq(reports.id, report.id));
    expect(after).toMatchObject({ status: "queued", progress: before!.progress, progressNote: before!.progressNote });
  });

  it("leaves no half-issued report when the database restarts while the issue is being recorded", async () => {
    // Hold the case row so the job stops inside its final transaction: PDF already in S3, the
    // report row updated but not committed. That is the worst moment for the database to go.
    const locker = new pg.Client({ connectionString: postgres!.url });
    locker.on("error", () => {});
    await locker.connect();
    await locker.query("BEGIN");
    await locker.query("SELECT id FROM cases WHERE id = $1 FOR UPDATE", [caseId]);
    const { rows: me } = await locker.query<{ pid: number }>("SELECT pg_backend_pid() AS pid");
    const attempt = generateReport(report.id, { retryCount: 1, retryLimit: 3 }).then(
      () => null,
      (error: unknown) => error,
    );
    const deadline = Date.now() + 90_000;
    for (;;) {
      // Waiting on this very lock (any other lock wait in the database would prove nothing).
      const { rows } = await locker.query<{ n: number }>("SELECT count(*)::int AS n FROM pg_stat_activity WHERE $1 = ANY(pg_blocking_pids(pid))", [me[0]!.pid]);
      if (rows[0]!.n > 0) break;
      if (Date.now() > deadline) throw new Error("the report job never reached its recording transaction");
      await new Promise((r) => setTimeout(r, 50));
    }
    const uploaded = await listKeys("spanwright-reports", `cases/${caseId}/`);
    expect(uploaded).toHaveLength(1);
    const before = await objectHeads(uploaded);
    // Every S3 request from here on, with its answer: if the object is still listed below, the
    // message says whether its removal was sent and what the store answered.
    const sent: string[] = [];
    type Sent = { input: { Key?: string }; constructor: { name: string } };
    const send = S3Client.prototype.send as unknown as (this: S3Client, command: Sent) => Promise<{ $metadata?: { httpStatusCode?: number } }>;
    const spy = vi.spyOn(S3Client.prototype, "send").mockImplementation(function (this: S3Client, command: Sent) {
      const name = `${command.constructor.name} ${JSON.stringify(command.input.Key ?? null)} at ${new Date().toISOString()}`;
      return send.call(this, command).then(
        (out) => (sent.push(`${name}: ${out.$metadata?.httpStatusCode ?? "?"} at ${new Date().toISOString()}`), out),
        (error: unknown) => (sent.push(`${name}: ${error instanceof Error ? error.message : String(error)}`), Promise.reject(error)),
      );
    } as never);
    try {
      await stopPostgres();
      const failure = await attempt;
      expect(failure).toBeInstanceOf(Error);
      // The object of the report that was not recorded is removed even though the database is away.
      // (Once in several runs under load it was still listed here: the message tells which write it is.)
      const left = await listKeys("spanwright-reports", `cases/${caseId}/`);
      expect(left, left.length ? `uploaded ${before}; still listed ${await objectHeads(left)}; S3 requests since: ${sent.join("; ")}` : "").toEqual([]);
    } finally {
      spy.mockRestore();
      await locker.end().catch(() => {});
      // Whatever failed above, the later tests get their database back.
      postgres ??= await startOwnPostgres();
    }
    const [row] = await db.select().from(reports).where(eq(reports.id, report.id));
    expect(row!.status).not.toBe("issued");
    expect(row).toMatchObject({ sha256: null, key: null, issuedAt: null, snapshot: null });
    const [c] = await db.select().from(cases).where(eq(cases.id, caseId));
    expect(c!.status).not.toBe("issued");
    expect(await issueAudits(report.id)).toHaveLength(0);
  }, 120_000);

  it("is issued exactly once by the job's next attempt once both services are back", async () => {
    await generateReport(report.id, { retryCount: 2, retryLimit: 3 });
    const [row] = await db.select().from(reports).where(eq(reports.id, report.id));
    expect(row!.status).toBe("issued");
    expect(await listKeys("spanwright-reports", `cases/${caseId}/`)).toEqual([row!.key]);
    expect(await issueAudits(report.id)).toHaveLength(1);
    expect(row!.attempts).toBe(3);
    // A duplicate delivery of the same job changes nothing.
    await generateReport(report.id, { retryCount: 3, retryLimit: 3 });
    expect(await issueAudits(report.id)).toHaveLength(1);
  }, 120_000);
});

describe("requests while the database is away", () => {
  it("answers pages and the API with a plain 503, then works again after the restart without restarting the app", async () => {
    const page = () => answer(casesLoader, request("/cases", { cookie: cookies.engineer }));
    const api = () => answer(apiCasesLoader, request("/api/v1/cases", { cookie: cookies.engineer }));
    expect((await page()).status).toBe(200);
    await stopPostgres();

    const down = await page();
    expect(down.status).toBe(503);
    expect(down.headers.get("Retry-After")).toBeTruthy();
    const body = await down.text();
    expect(JSON.parse(body)).toMatchObject({ message: DATABASE_UNAVAILABLE_MESSAGE });
    // Words for a person: no stack frames, no driver error.
    expect(body).not.toMatch(/ECONNREFUSED|\bat .*\.ts:\d+|node_modules/);
    const apiDown = await api();
    expect(apiDown.status).toBe(503);
    expect(await apiDown.json()).toEqual({ error: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE });

    postgres = await startOwnPostgres();
    // The same pool and the same session cookie: nothing was restarted but PostgreSQL.
    const back = await page();
    expect(back.status).toBe(200);
    expect(((await back.json()) as { cases: { reference: string }[] }).cases.map((c) => c.reference)).toContain("TN-WL-001");
    expect((await api()).status).toBe(200);
  }, 120_000);
});

describe("sessions", () => {
  it("survive a restart of the app: a fresh process's modules and pool accept the old cookie", async () => {
    await closeDb();
    vi.resetModules();
    const fresh = await import("~/auth/auth.server");
    const { requestReads } = await import("~/auth/request-context.server");
    const scope = { request: request("/cases", { cookie: cookies.checker }), context: new RouterContextProvider() };
    await requestReads({ ...scope, params: {}, url: new URL(scope.request.url), pattern: "" }, async () => new Response());
    const current = await fresh.requireUser(scope);
    expect(current.user.email).toBe(demoUser("checker").email);
    const freshDb = await import("~/db/client.server");
    await freshDb.closeDb();
  });
});
