import { auditForEntity } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";

/** The newest entries about a case, for its history: who did what and when. */
export function caseHistory(caseId: string, limit = 20, database: Db | Tx = db) {
  return auditForEntity(database, "case", caseId, limit);
}
