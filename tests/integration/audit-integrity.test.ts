import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq, sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { canonicalJson, entryHash, GENESIS_HASH, sha256Hex, verifyAuditChain, writeAudit } from "~/db/audit.server";
import { db, type Db } from "~/db/client.server";
import { runMigrations } from "~/db/migrate.server";
import * as schema from "~/db/schema";
import { auditLog, cases, organisations, reports, users } from "~/db/schema";
import { anchorChain, checkAuditTrail, listAnchors } from "~/services/audit-trail.server";
import { seed } from "./helpers";

/**
 * Integrity of the records against someone with database access (issue 9, items 8 and 10): the
 * audit trail is verified per organisation, its hashes cover each entry's id and sequence, its head
 * is anchored outside the database so a rewrite or a removal of the newest entries shows, the
 * migration that re-chained the old trail keeps verification working, and issued or released
 * reports cannot be changed or deleted at the database.
 */

let kelvard = "";
let northmoor = "";

beforeAll(async () => {
  await seed();
  const orgs = await db.select().from(organisations);
  kelvard = orgs.find((o) => o.slug === "kelvard-fenlow")!.id;
  northmoor = orgs.find((o) => o.slug === "northmoor-aerostructures")!.id;
});

/** As someone who has switched the append-only trigger off: the application never does this. */
async function bypassingTriggers(fn: () => Promise<unknown>) {
  await db.execute(sql`ALTER TABLE audit_log DISABLE TRIGGER audit_log_append_only`);
  try {
    await fn();
  } finally {
    await db.execute(sql`ALTER TABLE audit_log ENABLE TRIGGER audit_log_append_only`);
  }
}

const rowsOf = (organisationId: string) => db.select().from(auditLog).where(eq(auditLog.organisationId, organisationId)).orderBy(auditLog.seq);

/** What a forger who knows the algorithm does: recompute every hash from `fromSeq` on so the chain verifies again. */
async function recomputeFrom(organisationId: string, fromSeq: number) {
  const rows = await rowsOf(organisationId);
  let prev = rows.find((r) => r.seq === fromSeq - 1)?.hash ?? GENESIS_HASH;
  for (const r of rows.filter((x) => x.seq >= fromSeq)) {
    const hash = entryHash(prev, r);
    await db.execute(sql`UPDATE audit_log SET prev_hash = ${prev}, hash = ${hash} WHERE id = ${r.id}`);
    prev = hash;
  }
}

async function addEntries(organisationId: string, n: number, action = "probe.entry") {
  for (let i = 0; i < n; i++) await db.transaction((tx) => writeAudit(tx, { organisationId, actor: null, action, entityType: "probe", entityId: String(i) }));
}

describe("each organisation's audit trail is verified on its own (item 10)", () => {
  it("counts and reads only the organisation's entries, numbered from 1", async () => {
    const mine = await rowsOf(kelvard);
    const theirs = await rowsOf(northmoor);
    expect(mine.map((r) => r.seq)).toEqual(mine.map((_, i) => i + 1));
    expect(theirs.map((r) => r.seq)).toEqual(theirs.map((_, i) => i + 1));
    const check = await verifyAuditChain(db, kelvard);
    expect(check).toMatchObject({ intact: true, entries: mine.length });
  });

  it("does not report, or even see, a break in another organisation's trail", async () => {
    await addEntries(northmoor, 2, "probe.northmoor");
    const [victim] = (await rowsOf(northmoor)).slice(-1);
    await bypassingTriggers(() => db.execute(sql`UPDATE audit_log SET action = 'forged' WHERE id = ${victim!.id}`));
    expect(await verifyAuditChain(db, kelvard)).toMatchObject({ intact: true });
    const theirs = await verifyAuditChain(db, northmoor);
    expect(theirs.intact).toBe(false);
    expect(theirs.brokenAt!.seq).toBe(victim!.seq);
    await bypassingTriggers(() => db.execute(sql`UPDATE audit_log SET action = 'probe.northmoor' WHERE id = ${victim!.id}`));
    expect(await verifyAuditChain(db, northmoor)).toMatchObject({ intact: true });
  });
});

describe("the audit trail holds against someone with database access (item 8)", () => {
  it("hashes each entry's own id and sequence: an entry moved to another place no longer verifies", async () => {
    const base = (await rowsOf(kelvard))[0]!;
    expect(entryHash(GENESIS_HASH, { ...base, seq: base.seq + 1 })).not.toBe(entryHash(GENESIS_HASH, base));
    expect(entryHash(GENESIS_HASH, { ...base, id: base.id + 1000 })).not.toBe(entryHash(GENESIS_HASH, base));
    await addEntries(kelvard, 1, "probe.move");
    const [last] = (await rowsOf(kelvard)).slice(-1);
    // Renumber the newest entry, keeping its content and stored hashes: the chain shows the gap and the moved entry.
    await bypassingTriggers(() => db.execute(sql`UPDATE audit_log SET seq = seq + 5 WHERE id = ${last!.id}`));
    const check = await verifyAuditChain(db, kelvard);
    expect(check.intact).toBe(false);
    expect(check.brokenAt!.reason).toMatch(/missing/);
    await bypassingTriggers(() => db.execute(sql`UPDATE audit_log SET seq = seq - 5 WHERE id = ${last!.id}`));
    expect(await verifyAuditChain(db, kelvard)).toMatchObject({ intact: true });
  });

  it("shows an edited entry whose hashes were all recomputed, once the trail has been anchored", async () => {
    const head = await anchorChain(kelvard, "checkpoint");
    expect(head).not.toBeNull();
    const anchors = await listAnchors(kelvard);
    expect(anchors.map((a) => a.seq)).toContain(head!.seq);
    expect(await checkAuditTrail(kelvard)).toMatchObject({ intact: true });

    const victim = (await rowsOf(kelvard))[1]!;
    await bypassingTriggers(async () => {
      await db.execute(sql`UPDATE audit_log SET actor_email = 'someone.else@kelvard-fenlow.example' WHERE id = ${victim.id}`);
      await recomputeFrom(kelvard, victim.seq);
    });
    // Inside the database alone the forgery is consistent…
    expect(await verifyAuditChain(db, kelvard)).toMatchObject({ intact: true });
    // …but the hash anchored outside it no longer matches.
    const check = await checkAuditTrail(kelvard);
    expect(check.intact).toBe(false);
    expect(check.brokenAt!.seq).toBe(head!.seq);
    expect(check.brokenAt!.reason).toMatch(/anchored in storage.*rewritten/);

    await bypassingTriggers(async () => {
      await db.execute(sql`UPDATE audit_log SET actor_email = ${victim.actorEmail} WHERE id = ${victim.id}`);
      await recomputeFrom(kelvard, victim.seq);
    });
    expect(await checkAuditTrail(kelvard)).toMatchObject({ intact: true });
  });

  it("notices that the newest entries were deleted", async () => {
    await addEntries(kelvard, 3, "probe.tail");
    const head = await anchorChain(kelvard, "checkpoint");
    const tail = (await rowsOf(kelvard)).slice(-2);
    await bypassingTriggers(() => db.execute(sql`DELETE FROM audit_log WHERE id IN (${tail[0]!.id}, ${tail[1]!.id})`));
    expect(await verifyAuditChain(db, kelvard)).toMatchObject({ intact: true });
    const check = await checkAuditTrail(kelvard);
    expect(check.intact).toBe(false);
    expect(check.brokenAt!.reason).toContain(`anchored at ${head!.seq} entries`);
    expect(check.brokenAt!.reason).toContain(`only ${head!.seq - 2} remain`);
  });
});

describe("issued and released reports are append-only at the database (item 8)", () => {
  let reportId = "";

  beforeAll(async () => {
    const [c] = await db.select().from(cases).where(and(eq(cases.organisationId, kelvard), eq(cases.reference, "TN-WL-002")));
    const [erin] = await db.select().from(users).where(eq(users.email, "erin.hale@kelvard-fenlow.example"));
    const [r] = await db
      .insert(reports)
      .values({ organisationId: kelvard, caseId: c!.id, version: 90, reportNumber: "KF60-TN-WL-002-R90", status: "issued", requestedBy: erin!.id, bucket: "spanwright-reports", key: "cases/x/R90.pdf", size: 10, sha256: "a".repeat(64), issuedAt: new Date() })
      .returning();
    reportId = r!.id;
  });

  const refused = (message: RegExp) => ({ cause: expect.objectContaining({ message: expect.stringMatching(message) }) });

  it("lets an issued report take its release and nothing else", async () => {
    await expect(db.execute(sql`UPDATE reports SET sha256 = ${"b".repeat(64)} WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/may only be released/));
    await expect(db.execute(sql`UPDATE reports SET status = 'queued' WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/may only be released/));
    await expect(db.execute(sql`UPDATE reports SET status = 'released', released_at = now(), key = 'elsewhere.pdf' WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/may only be released/));
    await expect(db.execute(sql`DELETE FROM reports WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/DELETE refused/));
    await expect(db.execute(sql`UPDATE reports SET status = 'released' WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/reports_released_has_time/));
    await db.execute(sql`UPDATE reports SET status = 'released', released_at = now() WHERE id = ${reportId}`);
  });

  it("refuses every change and deletion of a released report, the probe's UPDATE status = 'issued' included", async () => {
    await expect(db.execute(sql`UPDATE reports SET status = 'issued' WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/released report is kept/));
    await expect(db.execute(sql`UPDATE reports SET progress_note = 'x' WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/released report is kept/));
    await expect(db.execute(sql`DELETE FROM reports WHERE id = ${reportId}`)).rejects.toMatchObject(refused(/DELETE refused/));
    const [still] = await db.select().from(reports).where(eq(reports.id, reportId));
    expect(still!.status).toBe("released");
  });

  it("refuses a report marked issued without its stored object", async () => {
    const [other] = await db.select().from(reports).where(eq(reports.id, reportId));
    await expect(
      db.insert(reports).values({ organisationId: kelvard, caseId: other!.caseId, version: 91, reportNumber: "KF60-TN-WL-002-R91", status: "issued", requestedBy: other!.requestedBy }),
    ).rejects.toMatchObject(refused(/reports_issued_has_object/));
  });

  it("keeps signatures append-only", async () => {
    const [r] = await db.select().from(reports).where(eq(reports.id, reportId));
    const [sig] = (
      await db.execute<{ id: string }>(
        sql`INSERT INTO signatures (organisation_id, case_id, report_id, signer_id, signer_name, role, meaning, confirmed_by, revision_hash) VALUES (${kelvard}, ${r!.caseId}, ${reportId}, ${r!.requestedBy}, 'Probe', 'quality', 'released', 'password', ${r!.sha256}) RETURNING id`,
      )
    ).rows;
    await expect(db.execute(sql`UPDATE signatures SET signer_name = 'Someone else' WHERE id = ${sig!.id}`)).rejects.toMatchObject(refused(/append-only/));
    await expect(db.execute(sql`DELETE FROM signatures WHERE id = ${sig!.id}`)).rejects.toMatchObject(refused(/append-only/));
  });
});

describe("the migration that re-chained the old trail (0006)", () => {
  const services = inject("testServices");
  const made: string[] = [];

  afterAll(async () => {
    const admin = new pg.Client({ connectionString: `${services.postgresServerUrl}/postgres` });
    await admin.connect();
    for (const name of made) await admin.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
    await admin.end();
  });

  /** The hash the single database-wide chain carried before 0006 (docs/security.md). */
  const legacyHash = (prev: string, e: { at: Date; organisationId: string | null; actorEmail: string | null; action: string; entityType: string; entityId: string | null; after: unknown }) =>
    sha256Hex(prev + canonicalJson({ at: e.at.toISOString(), organisationId: e.organisationId, actorId: null, actorEmail: e.actorEmail, action: e.action, entityType: e.entityType, entityId: e.entityId, before: null, after: e.after }));

  async function legacyDatabase(tamper: boolean): Promise<string> {
    const name = `rechain_${Math.random().toString(36).slice(2, 10)}`;
    const admin = new pg.Client({ connectionString: `${services.postgresServerUrl}/postgres` });
    await admin.connect();
    await admin.query(`CREATE DATABASE "${name}"`);
    made.push(name);
    await admin.end();
    const url = `${services.postgresServerUrl}/${name}`;
    // The migrations as they stood before 0006.
    const folder = fs.mkdtempSync(path.join(os.tmpdir(), "sw-migrations-"));
    fs.cpSync("drizzle", folder, { recursive: true });
    const journal = JSON.parse(fs.readFileSync(path.join(folder, "meta/_journal.json"), "utf8")) as { entries: { idx: number }[] };
    journal.entries = journal.entries.filter((e) => e.idx <= 5);
    fs.writeFileSync(path.join(folder, "meta/_journal.json"), JSON.stringify(journal));
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    await migrate(drizzle(client), { migrationsFolder: folder });
    const orgs = (await client.query<{ id: string }>("INSERT INTO organisations (name, slug) VALUES ('A', 'a'), ('B', 'b') RETURNING id")).rows.map((r) => r.id);
    let prev = GENESIS_HASH;
    for (let i = 0; i < 6; i++) {
      const e = { at: new Date(Date.UTC(2026, 0, 1, 0, i)), organisationId: orgs[i % 2]!, actorEmail: "old@example.invalid", action: `old.${i}`, entityType: "probe", entityId: String(i), after: { i } };
      const hash = legacyHash(prev, e);
      await client.query("INSERT INTO audit_log (at, organisation_id, actor_email, action, entity_type, entity_id, after, prev_hash, hash) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)", [e.at, e.organisationId, e.actorEmail, e.action, e.entityType, e.entityId, JSON.stringify(e.after), prev, hash]);
      prev = hash;
    }
    if (tamper) {
      await client.query("ALTER TABLE audit_log DISABLE TRIGGER audit_log_append_only");
      await client.query("UPDATE audit_log SET action = 'forged' WHERE action = 'old.3'");
    }
    await client.end();
    fs.rmSync(folder, { recursive: true, force: true });
    return url;
  }

  async function withDb<T>(url: string, fn: (database: Db) => Promise<T>): Promise<T> {
    const pool = new pg.Pool({ connectionString: url, max: 1 });
    try {
      return await fn(drizzle(pool, { schema }));
    } finally {
      await pool.end();
    }
  }

  it("re-chains an intact old trail per organisation, and every chain verifies, with the re-chaining recorded", async () => {
    const url = await legacyDatabase(false);
    await runMigrations(url);
    await withDb(url, async (d) => {
      const orgs = await d.select().from(organisations);
      for (const o of orgs) {
        const check = await verifyAuditChain(d, o.id);
        expect(check, o.slug).toMatchObject({ intact: true, entries: 4 });
        const [last] = await d.select().from(auditLog).where(eq(auditLog.organisationId, o.id)).orderBy(sql`seq desc`).limit(1);
        expect(last).toMatchObject({ seq: 4, action: "audit.rechain", after: expect.objectContaining({ previousChain: "intact", entries: 6 }) });
      }
      expect((await d.execute(sql`SELECT to_regclass('audit_rechain_pending') AS t`)).rows[0]).toEqual({ t: null });
    });
    // A second start changes nothing.
    await runMigrations(url);
    await withDb(url, async (d) => expect((await d.select().from(auditLog)).length).toBe(8));
  });

  it("says in the re-chained trail that the old chain was already broken, rather than hiding it", async () => {
    const url = await legacyDatabase(true);
    await runMigrations(url);
    await withDb(url, async (d) => {
      const entries = await d.select().from(auditLog).where(eq(auditLog.action, "audit.rechain"));
      const forged = await d.select().from(auditLog).where(eq(auditLog.action, "forged"));
      expect(entries).toHaveLength(2);
      for (const e of entries) expect((e.after as { previousChain: string }).previousChain).toBe(`broken at entry ${forged[0]!.id}`);
    });
  });
});
