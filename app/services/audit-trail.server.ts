import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { and, desc, eq, lt, sql } from "drizzle-orm";
import { chainHead, entryHashAt, verifyAuditChain, type ChainCheck } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { auditLog } from "~/db/schema";
import { env } from "~/utils/env.server";
import { objectExists, putObject, s3 } from "./storage.server";

/**
 * An organisation's audit trail: its entries, its verification, and its anchors outside the database: small objects in the audit bucket, one per
 * checkpoint, each naming an organisation's chain head (its sequence number and hash) in its key.
 * A checkpoint is written when a report is issued and every 15 minutes by the worker while a chain
 * has moved. Someone who can write to the database but not to the bucket can then neither rewrite
 * entries (the anchored hashes stop matching) nor remove the newest ones (the count falls below an
 * anchor) without the audit page saying so. In a deployment the bucket should refuse overwrites and
 * deletion (S3 Object Lock in compliance mode, or an equivalent write-once store).
 */

const PREFIX = "audit-anchors";

export interface Anchor {
  seq: number;
  hash: string;
  /** When the store received it. */
  at: Date | null;
  key: string;
}

const chainKey = (organisationId: string | null) => organisationId ?? "system";

function anchorKey(organisationId: string | null, head: { seq: number; hash: string }): string {
  return `${PREFIX}/${chainKey(organisationId)}/${String(head.seq).padStart(12, "0")}-${head.hash}.json`;
}

/**
 * Writes a checkpoint of the organisation's chain head unless one at that head exists already.
 * `reason` says why ("checkpoint", "report KF60-TN-WL-001-R02 issued"). Returns the head anchored.
 */
export async function anchorChain(organisationId: string | null, reason: string): Promise<{ seq: number; hash: string } | null> {
  const head = await chainHead(db, organisationId);
  if (!head) return null;
  const bucket = env().S3_BUCKET_AUDIT;
  const key = anchorKey(organisationId, head);
  if (await objectExists(bucket, key)) return head;
  const body = new TextEncoder().encode(JSON.stringify({ chain: chainKey(organisationId), seq: head.seq, hash: head.hash, at: new Date().toISOString(), reason }));
  await putObject(bucket, key, body, "application/json", head.hash);
  return head;
}

/** The periodic checkpoint: every chain whose head has no anchor yet gets one. */
export async function anchorAllChains(): Promise<number> {
  const heads = await db.execute<{ organisation_id: string | null }>(sql`SELECT DISTINCT organisation_id FROM audit_log`);
  let written = 0;
  for (const { organisation_id } of heads.rows) {
    const before = await listAnchors(organisation_id);
    const head = await anchorChain(organisation_id, "checkpoint");
    if (head && !before.some((a) => a.seq === head.seq)) written++;
  }
  return written;
}

/** The anchors of one organisation's chain, oldest first. */
export async function listAnchors(organisationId: string | null): Promise<Anchor[]> {
  const out: Anchor[] = [];
  let token: string | undefined;
  do {
    const page = await s3().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET_AUDIT, Prefix: `${PREFIX}/${chainKey(organisationId)}/`, ContinuationToken: token }));
    for (const o of page.Contents ?? []) {
      const m = /\/(\d{12})-([0-9a-f]{64})\.json$/.exec(o.Key ?? "");
      if (m) out.push({ seq: Number(m[1]), hash: m[2]!, at: o.LastModified ?? null, key: o.Key! });
    }
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return out.sort((a, b) => a.seq - b.seq);
}

export interface TrailCheck {
  chain: ChainCheck;
  /** Anchors found and compared; null when the store could not be read. */
  anchors: { count: number; newest: Anchor | null } | null;
  intact: boolean;
  brokenAt?: { seq: number; reason: string };
  /** Set when the anchors could not be read: the chain was checked within the database only. */
  anchorsUnavailable?: string;
}

/**
 * Verifies one organisation's audit trail: its chain within the database (reading no other
 * organisation's entries), then against every anchor in the store. An anchored entry whose hash
 * differs means the trail was rewritten from there on; an anchor beyond the newest entry means
 * entries were removed.
 */
export async function checkAuditTrail(organisationId: string | null): Promise<TrailCheck> {
  const chain = await verifyAuditChain(db, organisationId);
  let anchors: Anchor[];
  try {
    anchors = await listAnchors(organisationId);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return { chain, anchors: null, intact: chain.intact, brokenAt: chain.brokenAt, anchorsUnavailable: `the anchors in storage could not be read (${message})` };
  }
  const summary = { count: anchors.length, newest: anchors[anchors.length - 1] ?? null };
  if (!chain.intact) return { chain, anchors: summary, intact: false, brokenAt: chain.brokenAt };
  for (const anchor of anchors) {
    const when = anchor.at ? ` on ${anchor.at.toISOString().replace("T", " ").slice(0, 16)} UTC` : "";
    if (anchor.seq > chain.entries) {
      return { chain, anchors: summary, intact: false, brokenAt: { seq: chain.entries + 1, reason: `the trail was anchored at ${anchor.seq} entries${when} but only ${chain.entries} remain (the newest entries were removed)` } };
    }
    if ((await entryHashAt(db, organisationId, anchor.seq)) !== anchor.hash) {
      return { chain, anchors: summary, intact: false, brokenAt: { seq: anchor.seq, reason: `its hash differs from the one anchored in storage${when} (the trail was rewritten up to here)` } };
    }
  }
  return { chain, anchors: summary, intact: true };
}

const PAGE = 100;

/** One page of an organisation's audit entries, newest first, from before entry id `before`. */
export async function listAuditEntries(organisationId: string, before?: number) {
  const filters = [eq(auditLog.organisationId, organisationId)];
  if (before !== undefined && Number.isInteger(before) && before > 0) filters.push(lt(auditLog.id, before));
  const entries = await db.select().from(auditLog).where(and(...filters)).orderBy(desc(auditLog.id)).limit(PAGE);
  return {
    entries: entries.map((e) => ({ id: e.id, seq: e.seq, at: e.at, actorEmail: e.actorEmail, action: e.action, entityType: e.entityType, entityId: e.entityId, before: e.before, after: e.after, hash: e.hash })),
    next: entries.length === PAGE ? entries[entries.length - 1]!.id : null,
  };
}
