import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { verifyAuditChain, writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { auditLog, cases, memberships, organisations, programmes, users } from "~/db/schema";
import { action as newCaseAction } from "~/routes/cases/new";
import { cookieFor, form, request, run, seed } from "./helpers";

beforeAll(async () => {
  await seed();
});

async function counts() {
  const tables = { organisations, users, memberships, programmes, cases };
  const out: Record<string, number> = {};
  for (const [name, table] of Object.entries(tables)) out[name] = (await db.select().from(table)).length;
  return out;
}

describe("demo seed", () => {
  it("is idempotent: a second run creates nothing and changes no counts", async () => {
    const before = await counts();
    const again = await seed();
    expect(again.created).toBe(0);
    expect(await counts()).toEqual(before);
    expect(before).toMatchObject({ organisations: 2, users: 5, memberships: 5, programmes: 2, cases: 3 });
  });
});

describe("audit trail", () => {
  it("records a change in the same transaction, with who, what, when and the after-image", async () => {
    const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
    const res = await run(newCaseAction, {
      request: request("/cases/new", { method: "POST", cookie: await cookieFor("engineer"), body: form({ programmeId: p!.id, reference: "TN-WL-900", title: "Audit probe case" }) }),
    });
    expect(res.status).toBe(302);
    const [entry] = await db.select().from(auditLog).where(eq(auditLog.action, "case.create")).orderBy(sql`id desc`).limit(1);
    expect(entry!.actorEmail).toBe("erin.hale@kelvard-fenlow.example");
    expect((entry!.after as { reference: string }).reference).toBe("TN-WL-900");
    expect(entry!.at.getTime()).toBeGreaterThan(Date.now() - 60_000);
  });

  it("rolls the entry back with a failed change", async () => {
    const before = (await db.select().from(auditLog)).length;
    await expect(
      db.transaction(async (tx) => {
        await writeAudit(tx, { organisationId: null, actor: null, action: "probe", entityType: "probe" });
        throw new Error("change failed");
      }),
    ).rejects.toThrow("change failed");
    expect((await db.select().from(auditLog)).length).toBe(before);
  });

  it("refuses UPDATE and DELETE at the database", async () => {
    // Drizzle wraps the database's error; the trigger's message is on its cause.
    const refusal = { cause: expect.objectContaining({ message: expect.stringMatching(/append-only/) }) };
    await expect(db.execute(sql`UPDATE audit_log SET action = 'edited'`)).rejects.toMatchObject(refusal);
    await expect(db.execute(sql`DELETE FROM audit_log`)).rejects.toMatchObject(refusal);
  });

  it("verifies an organisation's hash chain and shows where an altered entry breaks it", async () => {
    const [kelvard] = await db.select().from(organisations).where(eq(organisations.slug, "kelvard-fenlow"));
    expect(await verifyAuditChain(db, kelvard!.id)).toMatchObject({ intact: true });
    const [victim] = await db.select().from(auditLog).where(eq(auditLog.organisationId, kelvard!.id)).orderBy(sql`seq`).offset(2).limit(1);
    // Only someone bypassing the application (a superuser disabling the trigger) can do this.
    await db.execute(sql`ALTER TABLE audit_log DISABLE TRIGGER audit_log_append_only`);
    await db.execute(sql`UPDATE audit_log SET after = '{"forged":true}'::jsonb WHERE id = ${victim!.id}`);
    await db.execute(sql`ALTER TABLE audit_log ENABLE TRIGGER audit_log_append_only`);
    const check = await verifyAuditChain(db, kelvard!.id);
    expect(check.intact).toBe(false);
    expect(check.brokenAt).toMatchObject({ id: victim!.id, seq: victim!.seq });
    expect(check.brokenAt?.reason).toMatch(/altered/);
  });
});
