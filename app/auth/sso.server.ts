import { CodeChallengeMethod, OAuth2Client, decodeIdToken, generateCodeVerifier, generateState } from "arctic";
import { and, eq, isNull } from "drizzle-orm";
import { createCookie } from "react-router";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { cookiesSecure, env } from "~/utils/env.server";
import { completeSignIn, firstMembership, type SignInResult } from "./auth.server";
import type { SsoErrorCode } from "~/domain/sso";

interface Discovery {
  issuer: string;
  authorization_endpoint: string;
  token_endpoint: string;
}

let discovery: Promise<Discovery> | undefined;

/** Company sign-in is offered only when an OpenID Connect issuer is configured. */
export function ssoEnabled(): boolean {
  return Boolean(env().OIDC_ISSUER);
}

function loadDiscovery(): Promise<Discovery> {
  discovery ??= (async () => {
    const issuer = env().OIDC_ISSUER!.replace(/\/$/, "");
    const res = await fetch(`${issuer}/.well-known/openid-configuration`);
    if (!res.ok) throw new Error(`identity provider discovery failed: HTTP ${res.status}`);
    return (await res.json()) as Discovery;
  })().catch((error: unknown) => {
    discovery = undefined;
    throw error;
  });
  return discovery;
}

function client(): OAuth2Client {
  const e = env();
  return new OAuth2Client(e.OIDC_CLIENT_ID, e.OIDC_CLIENT_SECRET, `${e.APP_ORIGIN}/auth/sso/callback`);
}

// State, PKCE verifier, nonce and where to go afterwards, for the ten minutes the round trip may take.
let flowCookie: ReturnType<typeof createCookie> | undefined;
function ssoFlowCookie() {
  flowCookie ??= createCookie("sw_sso", { httpOnly: true, sameSite: "lax", secure: cookiesSecure(), path: "/auth/sso", maxAge: 600 });
  return flowCookie;
}

/** What the round trip is for: opening a session, or the proof behind one signature (signing.server.ts). */
export type SsoFlow = { kind: "sign-in"; state: string; codeVerifier: string; nonce: string; redirectTo: string } | { kind: "signature"; state: string; codeVerifier: string; nonce: string; requestId: string };

/**
 * Starts the authorization-code flow with PKCE (S256); returns the provider URL and the flow
 * cookie. `reauthenticate` asks the provider to authenticate the person afresh whatever session it
 * holds (prompt=login, max_age=0), as a signature needs; `nonce` may be given by the caller that
 * binds it to its own record.
 */
export async function beginSso(
  input: { loginHint?: string } & ({ kind: "sign-in"; redirectTo: string } | { kind: "signature"; requestId: string; nonce: string }),
): Promise<{ url: string; setCookie: string }> {
  const meta = await loadDiscovery();
  const state = generateState();
  const codeVerifier = generateCodeVerifier();
  const nonce = input.kind === "signature" ? input.nonce : generateState();
  const url = client().createAuthorizationURLWithPKCE(meta.authorization_endpoint, state, CodeChallengeMethod.S256, codeVerifier, [
    "openid",
    "email",
    "profile",
  ]);
  url.searchParams.set("nonce", nonce);
  if (input.loginHint) url.searchParams.set("login_hint", input.loginHint);
  if (input.kind === "signature") {
    url.searchParams.set("prompt", "login");
    url.searchParams.set("max_age", "0");
  }
  const flow: SsoFlow = input.kind === "signature" ? { kind: "signature", state, codeVerifier, nonce, requestId: input.requestId } : { kind: "sign-in", state, codeVerifier, nonce, redirectTo: input.redirectTo };
  return { url: url.toString(), setCookie: await ssoFlowCookie().serialize(flow) };
}

/** The identity the provider vouched for, after every check of its ID token. */
export interface SsoIdentity {
  sub: string;
  email: string;
  /** When the provider last authenticated the person (seconds since 1970), if it said. */
  authTime: number | null;
}

export type SsoCallback = { ok: true; flow: SsoFlow; identity: SsoIdentity } | { ok: false; flow: SsoFlow | null; code: SsoErrorCode };

interface IdClaims {
  iss?: string;
  aud?: string | string[];
  sub?: string;
  email?: string;
  email_verified?: boolean;
  nonce?: string;
  exp?: number;
  auth_time?: number;
}

/**
 * Reads the provider's answer: checks state against the flow cookie, exchanges the code (with the
 * PKCE verifier) at the token endpoint over the back channel, and checks issuer, audience, nonce
 * and expiry of the ID token.
 */
export async function readSsoCallback(request: Request): Promise<SsoCallback> {
  const url = new URL(request.url);
  const raw = (await ssoFlowCookie().parse(request.headers.get("Cookie"))) as (SsoFlow & { kind?: string }) | null;
  // A flow cookie of before signatures went through the provider has no kind: it was a sign-in.
  const flow: SsoFlow | null = raw ? ({ ...raw, kind: raw.kind ?? "sign-in" } as SsoFlow) : null;
  if (url.searchParams.get("error")) return { ok: false, flow, code: "refused" };
  const code = url.searchParams.get("code");
  if (!flow || !code || url.searchParams.get("state") !== flow.state) return { ok: false, flow, code: "expired" };
  const meta = await loadDiscovery();
  let claims: IdClaims;
  try {
    const tokens = await client().validateAuthorizationCode(meta.token_endpoint, code, flow.codeVerifier);
    claims = decodeIdToken(tokens.idToken()) as IdClaims;
  } catch {
    return { ok: false, flow, code: "code" };
  }
  const audience = Array.isArray(claims.aud) ? claims.aud : [claims.aud];
  const valid =
    claims.iss === meta.issuer &&
    audience.includes(env().OIDC_CLIENT_ID) &&
    claims.nonce === flow.nonce &&
    typeof claims.exp === "number" &&
    claims.exp * 1000 > Date.now() &&
    typeof claims.sub === "string" &&
    typeof claims.email === "string" &&
    claims.email_verified !== false &&
    (claims.auth_time === undefined || typeof claims.auth_time === "number");
  if (!valid) return { ok: false, flow, code: "token" };
  return { ok: true, flow, identity: { sub: claims.sub!, email: claims.email!.toLowerCase(), authTime: claims.auth_time ?? null } };
}

export type SsoSignIn = (SignInResult & { ok: true; redirectTo: string }) | { ok: false; code: SsoErrorCode };

/**
 * Completes a company sign-in: signs in the existing account with the identity's e-mail (linking
 * its subject the first time). Accounts are never created here: people join by invitation.
 */
export async function completeSsoSignIn(identity: SsoIdentity, flow: SsoFlow & { kind: "sign-in" }, userAgent: string | null): Promise<SsoSignIn> {
  const [user] = await db.select().from(users).where(eq(users.email, identity.email)).limit(1);
  const membership = user && !user.disabled ? await firstMembership(user.id) : undefined;
  if (!user || !membership || (user.ssoSubject && user.ssoSubject !== identity.sub)) return { ok: false, code: "no-account" };
  if (!user.ssoSubject) {
    await db.update(users).set({ ssoSubject: identity.sub }).where(and(eq(users.id, user.id), isNull(users.ssoSubject)));
  }
  const result = await completeSignIn(user, membership, "sso", userAgent);
  return { ...result, redirectTo: flow.redirectTo };
}

export async function clearSsoFlowCookie(): Promise<string> {
  return ssoFlowCookie().serialize("", { maxAge: 0 });
}
