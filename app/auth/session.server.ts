import { encodeBase32LowerCaseNoPadding } from "@oslojs/encoding";
import { and, desc, eq, gt, lt, sql } from "drizzle-orm";
import { createCookie } from "react-router";
import { sha256Hex } from "~/db/audit.server";
import { db, prepared } from "~/db/client.server";
import { rethrowUnavailable } from "~/utils/unavailable.server";
import { memberships, organisations, sessions, users } from "~/db/schema";
import type { CurrentUser } from "~/domain/people";
import { cookiesSecure } from "~/utils/env.server";

/** A session ends after this long without a request… */
export const SESSION_IDLE_MS = 12 * 60 * 60 * 1000;
/** …and in any case this long after sign-in. */
export const SESSION_ABSOLUTE_MS = 30 * 24 * 60 * 60 * 1000;
// Writing lastSeenAt on every request would turn every page view into a write; a minute is enough.
const TOUCH_AFTER_MS = 60 * 1000;

let cookie: ReturnType<typeof createCookie> | undefined;
function sessionCookie() {
  cookie ??= createCookie("sw_session", {
    httpOnly: true,
    sameSite: "lax",
    secure: cookiesSecure(),
    path: "/",
    maxAge: SESSION_ABSOLUTE_MS / 1000,
  });
  return cookie;
}

export type SessionState = { status: "none" } | { status: "invalid" } | { status: "valid"; current: CurrentUser };

/** 160 random bits, base32: the only copy of the token is in the person's cookie. */
function newToken(): string {
  const bytes = new Uint8Array(20);
  crypto.getRandomValues(bytes);
  return encodeBase32LowerCaseNoPadding(bytes);
}

/** Creates a database session and returns the Set-Cookie header that carries its token. */
export async function createSession(input: {
  userId: string;
  organisationId: string;
  method: "password" | "sso";
  userAgent?: string | null;
}): Promise<string> {
  const token = newToken();
  const now = Date.now();
  await db.insert(sessions).values({
    tokenHash: sha256Hex(token),
    userId: input.userId,
    organisationId: input.organisationId,
    method: input.method,
    expiresAt: new Date(now + SESSION_IDLE_MS),
    userAgent: input.userAgent?.slice(0, 300) ?? null,
  });
  return sessionCookie().serialize(token);
}

export async function clearSessionCookie(): Promise<string> {
  return sessionCookie().serialize("", { maxAge: 0 });
}

/**
 * Reads and validates the session of a request. Loaders ask through `requireUser` and friends,
 * which share one read per request (request-context.server.ts).
 */
export function readSession(request: Request): Promise<SessionState> {
  // Every signed-in page reads the session first, so an outage is answered here as a plain 503.
  return loadSession(request).catch(rethrowUnavailable);
}

// Every signed-in request makes this read: built once (see `prepared`).
const sessionByToken = prepared((database) =>
  database
    .select({
      id: sessions.id,
      createdAt: sessions.createdAt,
      lastSeenAt: sessions.lastSeenAt,
      expiresAt: sessions.expiresAt,
      user: { id: users.id, email: users.email, name: users.name, disabled: users.disabled },
      organisation: { id: organisations.id, name: organisations.name, slug: organisations.slug },
      roles: memberships.roles,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .innerJoin(organisations, eq(organisations.id, sessions.organisationId))
    .innerJoin(memberships, and(eq(memberships.userId, sessions.userId), eq(memberships.organisationId, sessions.organisationId)))
    .where(and(eq(sessions.tokenHash, sql.placeholder("tokenHash")), gt(sessions.expiresAt, sql.placeholder("now"))))
    .limit(1)
    .prepare("session_by_token"),
);

async function loadSession(request: Request): Promise<SessionState> {
  const header = request.headers.get("Cookie");
  // A cookie that is present but does not decode (altered by hand) is "invalid", not "none", so
  // the person is told their session is not valid rather than silently treated as a stranger.
  if (!header || !/(?:^|;\s*)sw_session=[^;]+/.test(header)) return { status: "none" };
  const token = (await sessionCookie().parse(header).catch(() => null)) as unknown;
  if (typeof token !== "string" || !/^[a-z2-7]{32}$/.test(token)) return { status: "invalid" };
  const now = new Date();
  const [row] = await sessionByToken().execute({ tokenHash: sha256Hex(token), now });
  if (!row || row.user.disabled) return { status: "invalid" };
  if (now.getTime() - row.createdAt.getTime() > SESSION_ABSOLUTE_MS) return { status: "invalid" };
  if (now.getTime() - row.lastSeenAt.getTime() > TOUCH_AFTER_MS) {
    await db
      .update(sessions)
      .set({ lastSeenAt: now, expiresAt: new Date(now.getTime() + SESSION_IDLE_MS) })
      .where(eq(sessions.id, row.id));
  }
  const { disabled: _disabled, ...user } = row.user;
  return { status: "valid", current: { sessionId: row.id, user, organisation: row.organisation, roles: row.roles } };
}

/** The person's open sessions, most recently used first: where they are signed in. */
export function listSessions(userId: string) {
  return db
    .select({ id: sessions.id, method: sessions.method, createdAt: sessions.createdAt, lastSeenAt: sessions.lastSeenAt, userAgent: sessions.userAgent })
    .from(sessions)
    .where(eq(sessions.userId, userId))
    .orderBy(desc(sessions.lastSeenAt));
}

export async function deleteSession(sessionId: string): Promise<void> {
  await db.delete(sessions).where(eq(sessions.id, sessionId));
}

/** "Sign out everywhere": ends every session of the person, on every device. */
export async function deleteAllSessions(userId: string): Promise<number> {
  const removed = await db.delete(sessions).where(eq(sessions.userId, userId)).returning({ id: sessions.id });
  return removed.length;
}

export async function purgeExpiredSessions(): Promise<void> {
  await db.delete(sessions).where(lt(sessions.expiresAt, new Date()));
}
