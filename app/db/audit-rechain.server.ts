import type pg from "pg";
import { canonicalJson, entryHash, GENESIS_HASH, sha256Hex } from "./audit.server";
import type { AuditEntry } from "./schema";

/**
 * Once, after migration 0006: the audit trail was one chain for the whole database, each hash over
 * the previous hash and the entry's content. It is now one chain per organisation whose hashes also
 * cover each entry's id and sequence. The migration numbered the entries; this recomputes their
 * hashes (canonical JSON is defined in TypeScript, so SQL cannot) in one transaction, and records
 * in each organisation's chain that it was re-chained and whether the old chain was intact, so a
 * break from before is not hidden by the new hashes. The migration leaves the table
 * `audit_rechain_pending` as the marker; it is dropped here, so this runs once.
 */
export async function rechainAuditLogIfPending(client: pg.Client): Promise<void> {
  const marker = await client.query<{ t: string | null }>("SELECT to_regclass('audit_rechain_pending')::text AS t");
  if (!marker.rows[0]?.t) return;
  await client.query("BEGIN");
  try {
    const pending = await client.query("SELECT 1 FROM audit_rechain_pending LIMIT 1");
    if (pending.rowCount) await rechain(client);
    await client.query("DROP TABLE audit_rechain_pending");
    await client.query("COMMIT");
  } catch (error) {
    await client.query("ROLLBACK");
    throw error;
  }
}

type Row = Omit<AuditEntry, "hash" | "prevHash"> & { hash: string; prevHash: string };

function toEntry(r: Record<string, unknown>): Row {
  return {
    id: Number(r.id),
    seq: Number(r.seq),
    at: r.at as Date,
    organisationId: (r.organisation_id as string | null) ?? null,
    actorId: (r.actor_id as string | null) ?? null,
    actorEmail: (r.actor_email as string | null) ?? null,
    action: r.action as string,
    entityType: r.entity_type as string,
    entityId: (r.entity_id as string | null) ?? null,
    before: r.before as AuditEntry["before"],
    after: r.after as AuditEntry["after"],
    prevHash: r.prev_hash as string,
    hash: r.hash as string,
  };
}

/** The hash of an entry as the single chain of before 0006 computed it. */
function legacyHash(prev: string, e: Row): string {
  return sha256Hex(
    prev +
      canonicalJson({ at: e.at.toISOString(), organisationId: e.organisationId, actorId: e.actorId, actorEmail: e.actorEmail, action: e.action, entityType: e.entityType, entityId: e.entityId, before: e.before, after: e.after }),
  );
}

async function rechain(client: pg.Client): Promise<void> {
  await client.query("LOCK TABLE audit_log IN EXCLUSIVE MODE");
  const rows = (await client.query("SELECT * FROM audit_log ORDER BY id")).rows.map(toEntry);

  // What the old chain said about itself, before anything is recomputed.
  let prev = GENESIS_HASH;
  let legacy: { intact: true } | { intact: false; id: number } = { intact: true };
  for (const r of rows) {
    if (r.prevHash !== prev || legacyHash(prev, r) !== r.hash) {
      legacy = { intact: false, id: r.id };
      break;
    }
    prev = r.hash;
  }

  const heads = new Map<string | null, { seq: number; hash: string }>();
  const ids: number[] = [];
  const prevs: string[] = [];
  const hashes: string[] = [];
  for (const r of [...rows].sort((a, b) => a.seq - b.seq || a.id - b.id)) {
    const before = heads.get(r.organisationId)?.hash ?? GENESIS_HASH;
    const hash = entryHash(before, r);
    ids.push(r.id);
    prevs.push(before);
    hashes.push(hash);
    heads.set(r.organisationId, { seq: r.seq, hash });
  }
  await client.query("ALTER TABLE audit_log DISABLE TRIGGER audit_log_append_only");
  await client.query("UPDATE audit_log AS a SET prev_hash = v.p, hash = v.h FROM unnest($1::bigint[], $2::text[], $3::text[]) AS v(id, p, h) WHERE a.id = v.id", [ids, prevs, hashes]);
  await client.query("ALTER TABLE audit_log ENABLE TRIGGER audit_log_append_only");

  // One entry in each chain that was re-chained, saying so.
  const after = { entries: rows.length, previousChain: legacy.intact ? "intact" : `broken at entry ${legacy.id}`, reason: "hashes now cover each entry's id and its sequence in its organisation's chain" };
  for (const [organisationId, head] of heads) {
    const { rows: next } = await client.query<{ id: string }>("SELECT nextval(pg_get_serial_sequence('audit_log', 'id')) AS id");
    const entry = { id: Number(next[0]!.id), seq: head.seq + 1, at: new Date(), organisationId, actorId: null, actorEmail: null, action: "audit.rechain", entityType: "audit", entityId: null, before: null, after };
    await client.query(
      "INSERT INTO audit_log (id, seq, at, organisation_id, actor_id, actor_email, action, entity_type, entity_id, before, after, prev_hash, hash) VALUES ($1, $2, $3, $4, NULL, NULL, $5, $6, NULL, NULL, $7, $8, $9)",
      [entry.id, entry.seq, entry.at, organisationId, entry.action, entry.entityType, JSON.stringify(after), head.hash, entryHash(head.hash, entry)],
    );
  }
}
