import { encodeBase32LowerCaseNoPadding } from "@oslojs/encoding";
import { and, desc, eq, isNull } from "drizzle-orm";
import { sha256Hex, writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { apiTokens, memberships, organisations, users } from "~/db/schema";
import { hasPermission, scopeFor, type Permission } from "~/domain/permissions";
import type { CurrentUser } from "~/domain/people";
import { readsOf, type RequestScope } from "./request-context.server";
import type { Actor } from "~/domain/people";
import { DomainError } from "~/domain/errors";
import type { ApiTokenScope } from "~/domain/vocabulary";
import { apiError } from "~/utils/http.server";

/** Every personal API token starts with this, so it is recognisable in a configuration file or a leak scan. */
export const API_TOKEN_PREFIX = "sw_";
// "sw_" + 160 random bits in lower-case base32 without padding (32 characters).
const TOKEN_PATTERN = /^sw_[a-z2-7]{32}$/;
// Enough of the token to tell several apart on the tokens page, far too little to guess the rest.
const SHOWN_PREFIX_LENGTH = API_TOKEN_PREFIX.length + 6;
// As for sessions: writing lastUsedAt on every call would turn every read into a write.
const TOUCH_AFTER_MS = 60 * 1000;


/**
 * The person behind an API call, whether they came with the browser cookie or a personal token, and
 * what the token may do (a session may do whatever the person's roles allow).
 */
export type ApiUser = CurrentUser & { via: "session" | "token"; tokenId: string | null; scope: ApiTokenScope };

function unauthorized(message: string, invalidToken: boolean): never {
  // RFC 6750 §3: the challenge names the scheme, and the error when a token was presented but refused.
  const challenge = invalidToken ? 'Bearer realm="spanwright", error="invalid_token"' : 'Bearer realm="spanwright"';
  throw apiError(401, "unauthorized", message, { "WWW-Authenticate": challenge });
}

/**
 * The caller of an API route: the session cookie of a signed-in browser, or
 * `Authorization: Bearer sw_…` with a personal API token that is not revoked, whose person is not
 * disabled and is still a member of the token's organisation. Refusals are thrown as JSON
 * Responses, never redirects: 401 without or with bad credentials, 403 when none of the person's
 * roles grants `permission`, or when the token's scope is read-only and `permission` changes records.
 */
export async function requireApiUser(scope: RequestScope, permission: Permission): Promise<ApiUser> {
  const { headers } = scope.request;
  const current = headers.has("Authorization") ? await tokenUser(headers.get("Authorization")!) : await sessionUser(scope);
  if (!hasPermission(current.roles, permission)) {
    throw apiError(403, "forbidden", `Your role in ${current.organisation.name} does not allow this (needs ${permission}).`);
  }
  if (scopeFor(permission) === "read-write" && current.scope !== "read-write") {
    throw apiError(403, "insufficient-scope", `This API token is read-only; ${permission} needs a token with the read-write scope (create one at /account/tokens).`);
  }
  return current;
}

async function sessionUser(scope: RequestScope): Promise<ApiUser> {
  const state = await readsOf(scope).session();
  if (state.status === "valid") return { ...state.current, via: "session", tokenId: null, scope: "read-write" };
  if (state.status === "invalid") unauthorized("Your session has ended or is not valid. Sign in again, or send a personal API token.", false);
  unauthorized("Sign in, or send a personal API token as 'Authorization: Bearer sw_…' (create one at /account/tokens).", false);
}

async function tokenUser(header: string): Promise<ApiUser> {
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
  if (!match) unauthorized("The Authorization header must be 'Bearer sw_…' with a personal API token.", true);
  const token = match[1]!;
  if (!TOKEN_PATTERN.test(token)) unauthorized("That is not a Spanwright API token (they start with sw_ followed by 32 characters).", true);
  const [row] = await db
    .select({
      id: apiTokens.id,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
      scope: apiTokens.scope,
      user: { id: users.id, email: users.email, name: users.name, disabled: users.disabled },
      organisation: { id: organisations.id, name: organisations.name, slug: organisations.slug },
      roles: memberships.roles,
    })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .innerJoin(organisations, eq(organisations.id, apiTokens.organisationId))
    // A person who has left the organisation keeps no access through old tokens: the join drops them.
    .innerJoin(memberships, and(eq(memberships.userId, apiTokens.userId), eq(memberships.organisationId, apiTokens.organisationId)))
    .where(eq(apiTokens.tokenHash, sha256Hex(token)))
    .limit(1);
  // One answer for unknown, revoked and disabled, so a caller learns nothing about which it was.
  if (!row || row.revokedAt || row.user.disabled) unauthorized("The API token is not valid: it is unknown, revoked, or its account is disabled.", true);
  const now = new Date();
  if (!row.lastUsedAt || now.getTime() - row.lastUsedAt.getTime() > TOUCH_AFTER_MS) {
    await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.id));
  }
  const { disabled: _disabled, ...user } = row.user;
  return { sessionId: `token:${row.id}`, user, organisation: row.organisation, roles: row.roles, via: "token", tokenId: row.id, scope: row.scope };
}

/**
 * Creates a personal API token for a member of an organisation, read-only or read-write. The token
 * (`sw_` + 160 random bits, base32) is returned once and never stored: only its SHA-256 and its
 * first characters are kept.
 */
export async function createApiToken(input: { userId: string; organisationId: string; name: string; scope: ApiTokenScope; actor: Actor }): Promise<{ id: string; token: string }> {
  const name = input.name.trim();
  if (name.length < 1 || name.length > 80) throw new DomainError("Give the token a name of 1 to 80 characters.", { field: "name" });
  const bytes = new Uint8Array(20);
  crypto.getRandomValues(bytes);
  const token = API_TOKEN_PREFIX + encodeBase32LowerCaseNoPadding(bytes);
  return db.transaction(async (tx) => {
    const [member] = await tx
      .select({ id: memberships.id })
      .from(memberships)
      .where(and(eq(memberships.userId, input.userId), eq(memberships.organisationId, input.organisationId)));
    if (!member) throw new DomainError("Only a member of the organisation can hold a token for it.", { field: "organisationId", kind: "forbidden" });
    const [row] = await tx
      .insert(apiTokens)
      .values({ userId: input.userId, organisationId: input.organisationId, name, scope: input.scope, tokenHash: sha256Hex(token), prefix: token.slice(0, SHOWN_PREFIX_LENGTH) })
      .returning({ id: apiTokens.id, prefix: apiTokens.prefix });
    await writeAudit(tx, {
      organisationId: input.organisationId,
      actor: input.actor,
      action: "api-token.create",
      entityType: "api-token",
      entityId: row!.id,
      after: { userId: input.userId, name, prefix: row!.prefix, scope: input.scope },
    });
    return { id: row!.id, token };
  });
}

/** Revokes one of the person's own tokens; from then on it answers 401. Revoking twice changes nothing. */
export async function revokeApiToken(input: { tokenId: string; userId: string; actor: Actor }): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(apiTokens)
      .where(and(eq(apiTokens.id, input.tokenId), eq(apiTokens.userId, input.userId)))
      .for("update");
    if (!row) throw new DomainError("That token was not found among yours.", { field: "tokenId", kind: "not-found" });
    if (row.revokedAt) return;
    const [updated] = await tx
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(and(eq(apiTokens.id, row.id), isNull(apiTokens.revokedAt)))
      .returning({ revokedAt: apiTokens.revokedAt });
    await writeAudit(tx, {
      organisationId: row.organisationId,
      actor: input.actor,
      action: "api-token.revoke",
      entityType: "api-token",
      entityId: row.id,
      before: { name: row.name, prefix: row.prefix, revokedAt: null },
      after: { name: row.name, prefix: row.prefix, revokedAt: updated!.revokedAt },
    });
  });
}

/** The person's tokens, newest first, without their hashes. */
export async function listApiTokens(userId: string) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      scope: apiTokens.scope,
      organisationName: organisations.name,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .innerJoin(organisations, eq(organisations.id, apiTokens.organisationId))
    .where(eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.createdAt));
}
