import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { rechainAuditLogIfPending } from "./audit-rechain.server";

// Fixed key so that several web or worker processes starting together migrate one at a time.
const MIGRATION_LOCK = 7_201_226;

// Every entry point (server, worker, CLI, tests) runs from the project root, where drizzle/ lives.
function migrationsFolder(): string {
  return path.resolve(process.cwd(), "drizzle");
}

/** Applies every committed migration in `drizzle/` under an advisory lock, then the data steps they leave. */
export async function runMigrations(databaseUrl: string): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    await client.query("SELECT pg_advisory_lock($1)", [MIGRATION_LOCK]);
    await migrate(drizzle(client), { migrationsFolder: migrationsFolder() });
    await rechainAuditLogIfPending(client);
  } finally {
    await client.query("SELECT pg_advisory_unlock($1)", [MIGRATION_LOCK]).catch(() => {});
    await client.end();
  }
}
