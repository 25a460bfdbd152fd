import { and, asc, count, eq, gt } from "drizzle-orm";
import { data, redirect } from "react-router";
import { writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { memberships, signInAttempts, users } from "~/db/schema";
import { hasPermission, type Permission } from "~/domain/permissions";
import { dummyPasswordHash, verifyPassword } from "~/utils/password.server";
import type { CurrentUser } from "~/domain/people";
import { clearSessionCookie, createSession, deleteAllSessions, deleteSession, readSession } from "./session.server";

/** Failed attempts allowed in THROTTLE_WINDOW_MS for one account, and for one client address. */
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;
export const THROTTLE_WINDOW_MS = 15 * 60 * 1000;

/**
 * The signed-in person, or a redirect to the sign-in page (with the reason when the cookie was
 * present but not valid: expired, signed out elsewhere, or tampered with).
 */
export async function requireUser(request: Request): Promise<CurrentUser> {
  const state = await readSession(request);
  if (state.status === "valid") return state.current;
  const url = new URL(request.url);
  const params = new URLSearchParams({ redirectTo: url.pathname + url.search });
  if (state.status === "invalid") params.set("reason", "session");
  const headers = state.status === "invalid" ? { "Set-Cookie": await clearSessionCookie() } : undefined;
  throw redirect(`/login?${params}`, { headers });
}

/** As requireUser, and refuses with 403 unless one of the person's roles grants the permission. */
export async function requirePermission(request: Request, permission: Permission): Promise<CurrentUser> {
  const current = await requireUser(request);
  if (!hasPermission(current.roles, permission)) {
    throw data({ message: `Your role in ${current.organisation.name} does not allow this (needs ${permission}).` }, { status: 403 });
  }
  return current;
}

export async function getOptionalUser(request: Request): Promise<CurrentUser | null> {
  const state = await readSession(request);
  return state.status === "valid" ? state.current : null;
}

/**
 * Ends the session of the request (or, with `everywhere`, every session of its person) and records
 * it; returns the Set-Cookie header that clears the cookie. A request without a valid session only
 * has its cookie cleared.
 */
export async function signOut(request: Request, opts: { everywhere: boolean }): Promise<string> {
  const state = await readSession(request);
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
  | { ok: true; setCookie: string; current: { userId: string; roles: CurrentUser["roles"] } }
  | { ok: false; status: 401 | 429; message: string };

async function recentFailures(column: typeof signInAttempts.email | typeof signInAttempts.address, value: string) {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MS);
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(eq(column, value), eq(signInAttempts.succeeded, false), gt(signInAttempts.at, since)));
  return row?.n ?? 0;
}

/** The organisation a new session opens in: the person's oldest membership. */
export async function firstMembership(userId: string) {
  const [m] = await db.select().from(memberships).where(eq(memberships.userId, userId)).orderBy(asc(memberships.createdAt)).limit(1);
  return m;
}

/**
 * E-mail + password sign-in with per-account and per-address throttling. Unknown e-mail and wrong
 * password give the same answer, after the same amount of work.
 */
export async function signInWithPassword(input: {
  email: string;
  password: string;
  address: string;
  userAgent: string | null;
}): Promise<SignInResult> {
  const email = input.email.trim().toLowerCase();
  if ((await recentFailures(signInAttempts.email, email)) >= MAX_FAILURES_PER_ACCOUNT) {
    return { ok: false, status: 429, message: "Too many failed sign-in attempts for this account. Wait 15 minutes, then try again." };
  }
  if ((await recentFailures(signInAttempts.address, input.address)) >= MAX_FAILURES_PER_ADDRESS) {
    return { ok: false, status: 429, message: "Too many failed sign-in attempts from your network address. Wait 15 minutes, then try again." };
  }
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  const valid = user?.passwordHash
    ? await verifyPassword(user.passwordHash, input.password)
    : (await verifyPassword(await dummyPasswordHash(), input.password), false);
  const membership = valid && user && !user.disabled ? await firstMembership(user.id) : undefined;
  await db.insert(signInAttempts).values({ email, address: input.address, succeeded: Boolean(membership) });
  if (!user || !membership) {
    return { ok: false, status: 401, message: "The e-mail address or password is not correct." };
  }
  return completeSignIn(user, membership, "password", input.userAgent);
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


