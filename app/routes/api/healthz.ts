import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";

/** Liveness and database reachability, for start-up scripts and load balancers. */
export async function loader() {
  try {
    await db.execute(sql`SELECT 1`);
    return Response.json({ status: "ok" }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ status: "unavailable", reason: "database unreachable" }, { status: 503 });
  }
}
