import { createHash } from "node:crypto";
import { and, asc, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { db, prepared, type Db, type Tx } from "./client.server";
import { auditLog, users, type AuditEntry } from "./schema";

export const GENESIS_HASH = "0".repeat(64);
// Entries of one chain are serialised under this transaction-scoped lock (with the chain's key).
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

/** SHA-256 of the text's UTF-8 bytes (or of the bytes), lower-case hex; node's native hash, ~12× the pure-JS one on a case file. */
export function sha256Hex(text: string | Uint8Array): string {
  return createHash("sha256").update(text).digest("hex");
}

/**
 * The hash an entry carries: of the previous entry's hash and the entry's own key (id), its place
 * in its organisation's chain (seq) and its content. With id and seq inside, an entry cannot be
 * moved, renumbered or replayed elsewhere without its hash showing it.
 */
export function entryHash(prevHash: string, e: Omit<AuditEntry, "hash" | "prevHash">): string {
  return sha256Hex(
    prevHash +
      canonicalJson({
        id: e.id,
        seq: e.seq,
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

const chainOf = (organisationId: string | null) => (organisationId === null ? isNull(auditLog.organisationId) : eq(auditLog.organisationId, organisationId));

/** The newest entry of an organisation's chain (null: the system chain), or null when it is empty. */
export async function chainHead(database: Db | Tx, organisationId: string | null): Promise<{ seq: number; hash: string } | null> {
  const [last] = await database.select({ seq: auditLog.seq, hash: auditLog.hash }).from(auditLog).where(chainOf(organisationId)).orderBy(desc(auditLog.seq)).limit(1);
  return last ?? null;
}

/**
 * Appends one audit entry inside the caller's transaction (so it commits or rolls back with the
 * change it records), as the next entry of its organisation's chain.
 */
export async function writeAudit(tx: Tx, input: AuditInput): Promise<void> {
  await tx.execute(sql`SELECT pg_advisory_xact_lock(${AUDIT_LOCK}, hashtext(${input.organisationId ?? "system"}))`);
  const last = await chainHead(tx, input.organisationId);
  const prevHash = last?.hash ?? GENESIS_HASH;
  const [{ id }] = (await tx.execute<{ id: string }>(sql`SELECT nextval(pg_get_serial_sequence('audit_log', 'id')) AS id`)).rows as [{ id: string }];
  const row = {
    id: Number(id),
    seq: (last?.seq ?? 0) + 1,
    // Millisecond precision, as PostgreSQL stores microseconds but JS dates carry milliseconds.
    at: new Date(),
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
  /** Entries of the chain found in the database. */
  entries: number;
  /** The newest entry's place and hash (null for an empty chain). */
  head: { seq: number; hash: string } | null;
  intact: boolean;
  /** The first entry whose stored hashes, number or place do not match its content or its predecessor. */
  brokenAt?: { seq: number; id: number | null; reason: string };
}

const BATCH = 2000;

/**
 * Re-computes one organisation's chain (null: the system chain) from the genesis hash, reading it
 * in batches, and reports the first break: a missing or inserted entry, or an altered one. Other
 * organisations' entries are neither read nor counted.
 */
export async function verifyAuditChain(database: Db | Tx, organisationId: string | null): Promise<ChainCheck> {
  let prev = GENESIS_HASH;
  let expected = 1;
  let head: ChainCheck["head"] = null;
  for (;;) {
    const rows = await database
      .select()
      .from(auditLog)
      .where(and(chainOf(organisationId), gt(auditLog.seq, expected - 1)))
      .orderBy(asc(auditLog.seq))
      .limit(BATCH);
    for (const row of rows) {
      const broken = (reason: string): ChainCheck => ({ entries: expected - 1, head, intact: false, brokenAt: { seq: expected, id: row.id, reason } });
      if (row.seq !== expected) return broken(`entry ${expected} is missing: the chain goes on at ${row.seq} (entries were removed)`);
      if (row.prevHash !== prev) return broken("does not follow the entry before it (an entry was removed or inserted)");
      if (entryHash(prev, row) !== row.hash) return broken("content differs from what was recorded (the entry was altered)");
      prev = row.hash;
      head = { seq: row.seq, hash: row.hash };
      expected++;
    }
    if (rows.length < BATCH) return { entries: expected - 1, head, intact: true };
  }
}

/** The hash of the entry at `seq` in an organisation's chain, or null when there is none. */
export async function entryHashAt(database: Db | Tx, organisationId: string | null, seq: number): Promise<string | null> {
  const [row] = await database.select({ hash: auditLog.hash }).from(auditLog).where(and(chainOf(organisationId), eq(auditLog.seq, seq)));
  return row?.hash ?? null;
}

/** The newest entries about one entity, for "who changed it last" read-outs. */
function entityHistoryQuery(database: Db | Tx) {
  // The history list shows who did what and when; the before/after images stay on the audit page.
  return database
    .select({ id: auditLog.id, at: auditLog.at, action: auditLog.action, actorEmail: auditLog.actorEmail, actorName: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.entityType, sql.placeholder("entityType")), eq(auditLog.entityId, sql.placeholder("entityId"))))
    .orderBy(desc(auditLog.id))
    .limit(sql.placeholder("limit"));
}

// The case overview makes this read on every view: built once (see `prepared`).
const entityHistory = prepared((database) => entityHistoryQuery(database).prepare("entity_history"));

export async function auditForEntity(database: Db | Tx, entityType: string, entityId: string, limit = 50) {
  return (database === db ? entityHistory() : entityHistoryQuery(database)).execute({ entityType, entityId, limit });
}
