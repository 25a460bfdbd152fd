import { and, desc, eq, lt } from "drizzle-orm";
import { auditForEntity, verifyAuditChain } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { auditLog } from "~/db/schema";

/** Entries shown per page of the audit trail. */
export const AUDIT_PAGE = 100;

/**
 * The organisation's audit trail, newest first, a page at a time (`before` is the id the previous
 * page ended at), with a check of the whole hash chain from its first entry.
 */
export async function auditTrail(organisationId: string, opts: { before?: number } = {}, database: Db | Tx = db) {
  const filters = [eq(auditLog.organisationId, organisationId)];
  if (opts.before !== undefined && Number.isInteger(opts.before) && opts.before > 0) filters.push(lt(auditLog.id, opts.before));
  const [entries, chain] = await Promise.all([
    database.select().from(auditLog).where(and(...filters)).orderBy(desc(auditLog.id)).limit(AUDIT_PAGE),
    verifyAuditChain(database),
  ]);
  return {
    chain,
    entries: entries.map((e) => ({ id: e.id, at: e.at, actorEmail: e.actorEmail, action: e.action, entityType: e.entityType, entityId: e.entityId, before: e.before, after: e.after, hash: e.hash })),
    next: entries.length === AUDIT_PAGE ? entries[entries.length - 1]!.id : null,
  };
}

/** The newest entries about a case, for its history: who did what and when. */
export function caseHistory(caseId: string, limit = 20, database: Db | Tx = db) {
  return auditForEntity(database, "case", caseId, limit);
}
