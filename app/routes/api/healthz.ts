import { databaseReachable } from "~/services/health.server";

/** Liveness and database reachability, for start-up scripts and load balancers. */
export async function loader() {
  if (await databaseReachable()) return Response.json({ status: "ok" }, { headers: { "Cache-Control": "no-store" } });
  return Response.json({ status: "unavailable", reason: "database unreachable" }, { status: 503 });
}
