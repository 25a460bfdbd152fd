/**
 * `npm run worker`: a background-job process on its own. It needs DATABASE_URL and the S3_*
 * variables of the web processes it serves; run as many as the load needs.
 */
import { closeDb } from "../db/client.server";
import { stopBoss } from "../jobs/boss.server";
import { startWorkers } from "../jobs/workers.server";
import { env } from "../utils/env.server";

async function main() {
  env();
  await startWorkers();
  process.stdout.write("[spanwright] worker started: report generation\n");
  const stop = async () => {
    await stopBoss().catch(() => {});
    await closeDb().catch(() => {});
    process.exit(0);
  };
  process.on("SIGINT", () => void stop());
  process.on("SIGTERM", () => void stop());
}

main().catch((error: unknown) => {
  console.error(`[spanwright] worker failed to start: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
