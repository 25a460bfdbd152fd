import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";

/** Whether the database answers a trivial query now: for start-up scripts and load balancers. */
export async function databaseReachable(): Promise<boolean> {
  try {
    await db.execute(sql`SELECT 1`);
    return true;
  } catch {
    return false;
  }
}
