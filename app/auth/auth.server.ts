import { and, asc, eq, ne } from "drizzle-orm";
import { data, redirect } from "react-router";
import { writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { memberships, sessions, users } from "~/db/schema";
import { hasPermission, type Permission } from "~/domain/permissions";
import { dummyPasswordHash, hashPassword, verifyPassword } from "~/utils/password.server";
import type { CurrentUser } from "~/domain/people";
import { clearSessionCookie, createSession, deleteAllSessions, deleteSession } from "./session.server";
import { readsOf, type RequestScope } from "./request-context.server";
import { reconfirmPassword } from "./reconfirm.server";
import { checkThrottle, deviceTokenOf, isKnownDevice, recordAttempt, rememberDevice } from "./throttle.server";

/**
 * The signed-in person, or a redirect to the sign-in page (with the reason when the cookie was
 * present but not valid: expired, signed out elsewhere, or tampered with).
 */
export async function requireUser(scope: RequestScope): Promise<CurrentUser> {
  const state = await readsOf(scope).session();
  if (state.status === "valid") return state.current;
  const url = new URL(scope.request.url);
  const params = new URLSearchParams({ redirectTo: url.pathname + url.search });
  if (state.status === "invalid") params.set("reason", "session");
  const headers = state.status === "invalid" ? { "Set-Cookie": await clearSessionCookie() } : undefined;
  throw redirect(`/login?${params}`, { headers });
}

/** As requireUser, and refuses with 403 unless one of the person's roles grants the permission. */
export async function requirePermission(scope: RequestScope, permission: Permission): Promise<CurrentUser> {
  const current = await requireUser(scope);
  if (!hasPermission(current.roles, permission)) {
    throw data({ message: `Your role in ${current.organisation.name} does not allow this (needs ${permission}).` }, { status: 403 });
  }
  return current;
}

export async function getOptionalUser(scope: RequestScope): Promise<CurrentUser | null> {
  const state = await readsOf(scope).session();
  return state.status === "valid" ? state.current : null;
}

/**
 * Ends the session of the request (or, with `everywhere`, every session of its person) and records
 * it; returns the Set-Cookie header that clears the cookie. A request without a valid session only
 * has its cookie cleared.
 */
export async function signOut(scope: RequestScope, opts: { everywhere: boolean }): Promise<string> {
  const state = await readsOf(scope).session();
  if (state.status === "valid") {
    const { current } = state;
    if (opts.everywhere) await deleteAllSessions(current.user.id);
    else await deleteSession(current.sessionId);
    await db.transaction((tx) =>
      writeAudit(tx, {
        organisationId: current.organisation.id,
        actor: { id: current.user.id, email: current.user.email },
        action: opts.everywhere ? "auth.sign-out.everywhere" : "auth.sign-out",
        entityType: "user",
        entityId: current.user.id,
      }),
    );
  }
  return clearSessionCookie();
}

export type SignInResult =
  | { ok: true; setCookie: string; current: { userId: string; roles: CurrentUser["roles"] }; deviceCookie?: string }
  | { ok: false; status: 401 | 429; message: string; retryAfterSeconds?: number };

/** The organisation a new session opens in: the person's oldest membership. */
export async function firstMembership(userId: string) {
  const [m] = await db.select().from(memberships).where(eq(memberships.userId, userId)).orderBy(asc(memberships.createdAt)).limit(1);
  return m;
}

/**
 * E-mail + password sign-in, throttled per account and per client address with growing delays
 * (throttle.server.ts). A browser that signed in to the account before (its device cookie, from
 * `cookieHeader`) is not held back by others' failures, so nobody can lock the owner out. Unknown
 * e-mail and wrong password give the same answer, after the same amount of work. On success the
 * answer sets the session cookie and the device cookie.
 */
export async function signInWithPassword(input: {
  email: string;
  password: string;
  address: string;
  userAgent: string | null;
  cookieHeader?: string | null;
}): Promise<SignInResult> {
  const email = input.email.trim().toLowerCase();
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  const deviceToken = await deviceTokenOf(input.cookieHeader ?? null);
  const device = user ? await isKnownDevice(deviceToken, user.id) : false;
  const throttle = await checkThrottle({ purpose: "sign-in", email, address: input.address, device });
  if (!throttle.ok) return { ok: false, status: 429, message: `Too many failed sign-in attempts. ${throttle.message.replace(/^Too many wrong passwords\. /, "")}`, retryAfterSeconds: throttle.retryAfterSeconds };
  const valid = user?.passwordHash
    ? await verifyPassword(user.passwordHash, input.password)
    : (await verifyPassword(await dummyPasswordHash(), input.password), false);
  const membership = valid && user && !user.disabled ? await firstMembership(user.id) : undefined;
  await recordAttempt({ purpose: "sign-in", email, address: input.address, device, succeeded: Boolean(membership) });
  if (!user || !membership) {
    return { ok: false, status: 401, message: "The e-mail address or password is not correct." };
  }
  const signedIn = await completeSignIn(user, membership, "password", input.userAgent);
  return { ...signedIn, deviceCookie: await rememberDevice(deviceToken, user.id) };
}

/** Opens a session for a person already identified (by password or by the company identity provider). */
export async function completeSignIn(
  user: { id: string; email: string },
  membership: { organisationId: string; roles: CurrentUser["roles"] },
  method: "password" | "sso",
  userAgent: string | null,
): Promise<SignInResult & { ok: true }> {
  const setCookie = await createSession({ userId: user.id, organisationId: membership.organisationId, method, userAgent });
  await db.transaction(async (tx) => {
    await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
    await writeAudit(tx, {
      organisationId: membership.organisationId,
      actor: { id: user.id, email: user.email },
      action: `auth.sign-in.${method}`,
      entityType: "user",
      entityId: user.id,
    });
  });
  return { ok: true, setCookie, current: { userId: user.id, roles: membership.roles } };
}

/**
 * Changes the person's own password after their current one (throttled and audited as a
 * signature's is) and ends every other session of theirs: whoever may have learnt the old password
 * and signed in with it elsewhere is signed out. This session stays; API tokens are separate
 * credentials, listed and revoked on the tokens page.
 * @throws DomainError unauthenticated for a wrong current password, too-many while held back
 * @returns how many other sessions were ended
 */
export async function changeOwnPassword(input: { current: CurrentUser; currentPassword: string; newPassword: string; address: string }): Promise<number> {
  const { current } = input;
  await reconfirmPassword({ current, password: input.currentPassword, purpose: "password-change", about: { entityType: "user", entityId: current.user.id, what: "change their password" }, address: input.address, field: "current" });
  const passwordHash = await hashPassword(input.newPassword);
  return db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, current.user.id));
    const ended = await tx.delete(sessions).where(and(eq(sessions.userId, current.user.id), ne(sessions.id, current.sessionId))).returning({ id: sessions.id });
    await writeAudit(tx, {
      organisationId: current.organisation.id,
      actor: { id: current.user.id, email: current.user.email },
      action: "auth.password-change",
      entityType: "user",
      entityId: current.user.id,
      after: { otherSessionsEnded: ended.length, address: input.address },
    });
    return ended.length;
  });
}
