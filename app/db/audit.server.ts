import { sha256 } from "@oslojs/crypto/sha2";
import { encodeHexLowerCase } from "@oslojs/encoding";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import type { Db, Tx } from "./client.server";
import { auditLog, users, type AuditEntry } from "./schema";

export const GENESIS_HASH = "0".repeat(64);
// One chain for the whole database: entries are serialised under this transaction-scoped lock.
const AUDIT_LOCK = 7_201_227;

export interface AuditInput {
  organisationId: string | null;
  actor: { id: string; email: string } | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
}

/** JSON with object keys sorted, so the same content always hashes the same. */
export function canonicalJson(value: unknown): string {
  if (value === undefined) return "null";
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  if (value instanceof Date) return JSON.stringify(value.toISOString());
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
}

export function sha256Hex(text: string | Uint8Array): string {
  const bytes = typeof text === "string" ? new TextEncoder().encode(text) : text;
  return encodeHexLowerCase(sha256(bytes));
}

function entryHash(prevHash: string, e: Omit<AuditEntry, "id" | "hash" | "prevHash">): string {
  return sha256Hex(
    prevHash +
      canonicalJson({
        at: e.at.toISOString(),
        organisationId: e.organisationId,
        actorId: e.actorId,
        actorEmail: e.actorEmail,
        action: e.action,
        entityType: e.entityType,
        entityId: e.entityId,
        before: e.before,
        after: e.after,
      }),
  );
}

/**
 * Appends one audit entry inside the caller's transaction (so it commits or rolls back with the
 * change it records), chained to the previous entry's hash.
 */
export async function writeAudit(tx: Tx, input: AuditInput): Promise<void> {
  await tx.execute(sql`SELECT pg_advisory_xact_lock(${AUDIT_LOCK})`);
  const [last] = await tx.select({ hash: auditLog.hash }).from(auditLog).orderBy(desc(auditLog.id)).limit(1);
  const prevHash = last?.hash ?? GENESIS_HASH;
  // Millisecond precision, as PostgreSQL stores microseconds but JS dates carry milliseconds.
  const at = new Date();
  const row = {
    at,
    organisationId: input.organisationId,
    actorId: input.actor?.id ?? null,
    actorEmail: input.actor?.email ?? null,
    action: input.action,
    entityType: input.entityType,
    entityId: input.entityId ?? null,
    before: (input.before ?? null) as AuditEntry["before"],
    after: (input.after ?? null) as AuditEntry["after"],
  };
  await tx.insert(auditLog).values({ ...row, prevHash, hash: entryHash(prevHash, row) });
}

export interface ChainCheck {
  entries: number;
  intact: boolean;
  /** The first entry whose stored hashes do not match its content or its predecessor. */
  brokenAt?: { id: number; reason: string };
}

/** Re-computes the whole chain from the genesis hash and reports the first break, if any. */
export async function verifyAuditChain(database: Db | Tx): Promise<ChainCheck> {
  const rows = await database.select().from(auditLog).orderBy(asc(auditLog.id));
  let prev = GENESIS_HASH;
  for (const row of rows) {
    if (row.prevHash !== prev) {
      return { entries: rows.length, intact: false, brokenAt: { id: row.id, reason: "does not follow the entry before it (an entry was removed or inserted)" } };
    }
    if (entryHash(prev, row) !== row.hash) {
      return { entries: rows.length, intact: false, brokenAt: { id: row.id, reason: "content differs from what was recorded (the entry was altered)" } };
    }
    prev = row.hash;
  }
  return { entries: rows.length, intact: true };
}

/** The newest entries about one entity, for "who changed it last" read-outs. */
export async function auditForEntity(database: Db | Tx, entityType: string, entityId: string, limit = 50) {
  // The history list shows who did what and when; the before/after images stay on the audit page.
  return database
    .select({ id: auditLog.id, at: auditLog.at, action: auditLog.action, actorEmail: auditLog.actorEmail, actorName: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.entityType, entityType), eq(auditLog.entityId, entityId)))
    .orderBy(desc(auditLog.id))
    .limit(limit);
}
