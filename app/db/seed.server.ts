import { and, eq } from "drizzle-orm";
import { hashPassword } from "~/auth/password.server";
import { writeAudit } from "./audit.server";
import type { Db } from "./client.server";
import { DEMO_CASES, DEMO_ORGANISATIONS, DEMO_PROGRAMMES, DEMO_USERS } from "./demo";
import { cases, memberships, organisations, programmes, users } from "./schema";

/**
 * Creates the demo scenario where it is missing and leaves everything that exists alone, so it can
 * run at every start (passwords and roles changed by people are kept).
 */
export async function seedDemo(db: Db): Promise<{ created: number }> {
  let created = 0;
  const orgIds: Record<string, string> = {};
  for (const [key, org] of Object.entries(DEMO_ORGANISATIONS)) {
    const [row] = await db.insert(organisations).values(org).onConflictDoNothing().returning();
    if (row) created++;
    orgIds[key] = row?.id ?? (await db.select().from(organisations).where(eq(organisations.slug, org.slug)))[0]!.id;
  }

  const userIds: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const [existing] = await db.select().from(users).where(eq(users.email, u.email));
    let id = existing?.id;
    if (!id) {
      const passwordHash = await hashPassword(u.password);
      id = await db.transaction(async (tx) => {
        const [row] = await tx.insert(users).values({ email: u.email, name: u.name, passwordHash }).returning();
        await tx.insert(memberships).values({ userId: row!.id, organisationId: orgIds[u.organisation]!, roles: u.roles });
        await writeAudit(tx, { organisationId: orgIds[u.organisation]!, actor: null, action: "seed.user.create", entityType: "user", entityId: row!.id, after: { email: u.email, roles: u.roles } });
        return row!.id;
      });
      created++;
    }
    userIds[u.label] = id;
  }

  const programmeIds: Record<string, string> = {};
  for (const p of DEMO_PROGRAMMES) {
    const organisationId = orgIds[p.organisation]!;
    const [existing] = await db.select().from(programmes).where(and(eq(programmes.organisationId, organisationId), eq(programmes.code, p.code)));
    programmeIds[p.code] =
      existing?.id ??
      (await db.transaction(async (tx) => {
        const { organisation: _org, ...values } = p;
        const [row] = await tx.insert(programmes).values({ ...values, organisationId }).returning();
        await writeAudit(tx, { organisationId, actor: null, action: "seed.programme.create", entityType: "programme", entityId: row!.id, after: row });
        created++;
        return row!.id;
      }));
  }

  for (const c of DEMO_CASES) {
    const programmeId = programmeIds[c.programme]!;
    const [existing] = await db.select().from(cases).where(and(eq(cases.programmeId, programmeId), eq(cases.reference, c.reference)));
    if (existing) continue;
    const [programme] = await db.select().from(programmes).where(eq(programmes.id, programmeId));
    const createdBy = c.programme === "NA14" ? userIds.outsider! : userIds.engineer!;
    await db.transaction(async (tx) => {
      const { programme: _p, ...values } = c;
      const [row] = await tx.insert(cases).values({ ...values, programmeId, organisationId: programme!.organisationId, createdBy }).returning();
      await writeAudit(tx, { organisationId: programme!.organisationId, actor: null, action: "seed.case.create", entityType: "case", entityId: row!.id, after: row });
    });
    created++;
  }
  return { created };
}
