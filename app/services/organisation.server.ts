import { encodeBase32LowerCaseNoPadding } from "@oslojs/encoding";
import { and, asc, eq, gt, isNull } from "drizzle-orm";
import { sha256Hex, writeAudit } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { invitations, memberships, organisations, users } from "~/db/schema";
import type { Role } from "~/domain/vocabulary";
import { hashPassword, verifyPassword } from "~/utils/password.server";
import { env } from "~/utils/env.server";
import { sendMail } from "./mail.server";
import { DomainError } from "~/domain/errors";
import type { Actor } from "~/domain/people";

const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

export async function listMembers(organisationId: string, database: Db | Tx = db) {
  return database
    .select({ userId: users.id, name: users.name, email: users.email, roles: memberships.roles, lastSignInAt: users.lastSignInAt, sso: users.ssoSubject })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.organisationId, organisationId))
    .orderBy(asc(users.name));
}

export async function listOpenInvitations(organisationId: string, database: Db | Tx = db) {
  return database
    .select({ id: invitations.id, email: invitations.email, roles: invitations.roles, createdAt: invitations.createdAt, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(and(eq(invitations.organisationId, organisationId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
    .orderBy(asc(invitations.createdAt));
}

/** Changes a member's roles; the last administrator cannot remove their own administration. */
export async function setMemberRoles(input: { organisationId: string; userId: string; roles: Role[]; actor: Actor }, database: Db | Tx = db) {
  await database.transaction(async (tx) => {
    const [member] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.organisationId, input.organisationId), eq(memberships.userId, input.userId)))
      .for("update");
    if (!member) throw new DomainError("That person is not a member of this organisation.", { field: "userId", kind: "not-found" });
    if (member.roles.includes("admin") && !input.roles.includes("admin")) {
      const admins = await tx.select({ userId: memberships.userId, roles: memberships.roles }).from(memberships).where(eq(memberships.organisationId, input.organisationId));
      if (admins.filter((a) => a.roles.includes("admin")).length <= 1) {
        throw new DomainError("The organisation must keep at least one administrator.", { field: "roles" });
      }
    }
    const roles = [...new Set(input.roles)].sort();
    await tx.update(memberships).set({ roles }).where(eq(memberships.id, member.id));
    await writeAudit(tx, {
      organisationId: input.organisationId,
      actor: input.actor,
      action: "membership.roles.update",
      entityType: "membership",
      entityId: member.id,
      before: { userId: input.userId, roles: member.roles },
      after: { userId: input.userId, roles },
    });
  });
}

function newToken(): string {
  const bytes = new Uint8Array(20);
  crypto.getRandomValues(bytes);
  return encodeBase32LowerCaseNoPadding(bytes);
}

/** Records an invitation (only its token's hash) and e-mails the one-time link. */
export async function inviteMember(input: { organisationId: string; email: string; roles: Role[]; actor: Actor }, database: Db | Tx = db) {
  const email = input.email.trim().toLowerCase();
  const [existing] = await db
    .select({ id: memberships.id })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organisationId, input.organisationId), eq(users.email, email)));
  if (existing) throw new DomainError(`${email} is already a member of this organisation.`, { field: "email" });
  const [org] = await database.select().from(organisations).where(eq(organisations.id, input.organisationId));
  const token = newToken();
  await database.transaction(async (tx) => {
    const [row] = await tx
      .insert(invitations)
      .values({
        organisationId: input.organisationId,
        email,
        roles: [...new Set(input.roles)].sort(),
        tokenHash: sha256Hex(token),
        invitedBy: input.actor.id,
        expiresAt: new Date(Date.now() + INVITATION_TTL_MS),
      })
      .returning();
    await writeAudit(tx, {
      organisationId: input.organisationId,
      actor: input.actor,
      action: "invitation.create",
      entityType: "invitation",
      entityId: row!.id,
      after: { email, roles: row!.roles },
    });
  });
  await sendMail({
    to: email,
    organisationId: input.organisationId,
    subject: `You are invited to ${org!.name} on Spanwright`,
    paragraphs: [
      `${input.actor.email} has invited you to join ${org!.name} on Spanwright as ${input.roles.join(", ")}.`,
      "The link below works once and expires in 7 days.",
    ],
    link: { href: `${env().APP_ORIGIN}/invite/${token}`, label: "Accept the invitation" },
  });
}

export async function revokeInvitation(input: { organisationId: string; invitationId: string; actor: Actor }, database: Db | Tx = db) {
  await database.transaction(async (tx) => {
    const [row] = await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.id, input.invitationId), eq(invitations.organisationId, input.organisationId), isNull(invitations.acceptedAt)))
      .returning();
    if (!row) throw new DomainError("That invitation was not found or has already been used.", { field: "invitationId", kind: "not-found" });
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "invitation.revoke", entityType: "invitation", entityId: row.id });
  });
}

/** The open invitation behind a link, or null when it is unknown, used, revoked or expired. */
export async function findInvitation(token: string, database: Db | Tx = db) {
  const [row] = await db
    .select({ invitation: invitations, organisationName: organisations.name })
    .from(invitations)
    .innerJoin(organisations, eq(organisations.id, invitations.organisationId))
    .where(and(eq(invitations.tokenHash, sha256Hex(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())));
  if (!row) return null;
  const [account] = await database.select({ id: users.id }).from(users).where(eq(users.email, row.invitation.email));
  return { ...row, accountExists: Boolean(account) };
}

/**
 * Accepts an invitation: a new account is created with the given name and password; an existing
 * account must confirm its password. Either way the membership and the audit entry are one transaction.
 */
export async function acceptInvitation(input: { token: string; name?: string; password: string }, database: Db | Tx = db) {
  const found = await findInvitation(input.token);
  if (!found) throw new DomainError("This invitation link is not valid any more (used, revoked or expired).", { field: "token", kind: "not-found" });
  const inv = found.invitation;
  const [account] = await database.select().from(users).where(eq(users.email, inv.email));
  if (account && !(account.passwordHash && (await verifyPassword(account.passwordHash, input.password)))) {
    throw new DomainError("The password is not correct for this existing account.", { field: "password", kind: "unauthenticated" });
  }
  const passwordHash = account ? null : await hashPassword(input.password);
  return database.transaction(async (tx) => {
    let userId = account?.id;
    if (!userId) {
      const [created] = await tx.insert(users).values({ email: inv.email, name: input.name!.trim(), passwordHash }).returning();
      userId = created!.id;
    }
    const [claimed] = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt)))
      .returning();
    if (!claimed) throw new DomainError("This invitation has just been used.", { field: "token", kind: "conflict" });
    const [membership] = await tx.insert(memberships).values({ userId, organisationId: inv.organisationId, roles: inv.roles }).returning();
    await writeAudit(tx, {
      organisationId: inv.organisationId,
      actor: { id: userId, email: inv.email },
      action: "invitation.accept",
      entityType: "membership",
      entityId: membership!.id,
      after: { userId, roles: inv.roles },
    });
    return { userId, email: inv.email, organisationId: inv.organisationId, roles: inv.roles };
  });
}
