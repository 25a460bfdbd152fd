import PgBoss from "pg-boss";

/** Queue names: every background job of the product. */
export const QUEUES = { generateReport: "report.generate", computeResults: "results.compute", analyze: "analysis.run", auditCheckpoint: "audit.checkpoint", rerunReport: "report.rerun", ruleSensitivity: "sensitivity.compute" } as const;

/**
 * Queues asked again and again while their work is pending (the distribution page asks each second,
 * the loads page and the results API on every request) hold at most one waiting job per singleton
 * key ("short"): asking again adds none, and a job lost after its retries is sent again by the next
 * ask. pg-boss 10's "standard" policy ignores a singleton key without singletonSeconds.
 */
const QUEUE_POLICY: Partial<Record<(typeof QUEUES)[keyof typeof QUEUES], "short">> = { [QUEUES.ruleSensitivity]: "short", [QUEUES.computeResults]: "short" };

/** How often the audit trail's heads are anchored outside the database (cron, UTC). */
export const AUDIT_CHECKPOINT_CRON = "*/15 * * * *";

const globalForBoss = globalThis as unknown as { __spanwrightBoss?: Promise<PgBoss> };

/**
 * One pg-boss instance per process, on the application's own PostgreSQL, started on first use.
 * Web processes only send; worker processes also work (workers.server.ts).
 */
export function boss(): Promise<PgBoss> {
  globalForBoss.__spanwrightBoss ??= (async () => {
    const url = process.env.DATABASE_URL;
    if (!url) throw new Error("DATABASE_URL is not set");
    const instance = new PgBoss({ connectionString: url, max: 4 });
    instance.on("error", (error) => console.warn(`job queue: ${error.message}`));
    await instance.start();
    for (const name of Object.values(QUEUES)) {
      const policy = QUEUE_POLICY[name] ?? "standard";
      await instance.createQueue(name, { name, policy });
      // createQueue leaves a queue that exists as it was: one made before its policy changed gets the new one.
      if ((await instance.getQueue(name))?.policy !== policy) await instance.updateQueue(name, { name, policy });
    }
    return instance;
  })().catch((error: unknown) => {
    globalForBoss.__spanwrightBoss = undefined;
    throw error;
  });
  return globalForBoss.__spanwrightBoss;
}

export async function stopBoss(): Promise<void> {
  const pending = globalForBoss.__spanwrightBoss;
  globalForBoss.__spanwrightBoss = undefined;
  if (pending) await (await pending).stop({ graceful: true, wait: true });
}

/** Report jobs retry three times, a minute apart, so an S3 or database outage can pass. */
export const REPORT_JOB_OPTIONS = { retryLimit: 3, retryDelay: 30, retryBackoff: true, expireInSeconds: 15 * 60 } as const;
