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

/** Starts the authorization-code flow with PKCE (S256); returns the provider URL and the flow cookie. */
export async function beginSso(input: { loginHint?: string; redirectTo: string }): Promise<{ url: string; setCookie: string }> {
  const meta = await loadDiscovery();
  const state = generateState();
  const codeVerifier = generateCodeVerifier();
  const nonce = generateState();
  const url = client().createAuthorizationURLWithPKCE(meta.authorization_endpoint, state, CodeChallengeMethod.S256, codeVerifier, [
    "openid",
    "email",
    "profile",
  ]);
  url.searchParams.set("nonce", nonce);
  if (input.loginHint) url.searchParams.set("login_hint", input.loginHint);
  const setCookie = await ssoFlowCookie().serialize({ state, codeVerifier, nonce, redirectTo: input.redirectTo });
  return { url: url.toString(), setCookie };
}

export type SsoOutcome = (SignInResult & { ok: true; redirectTo?: string }) | { ok: false; code: SsoErrorCode };

interface IdClaims {
  iss?: string;
  aud?: string | string[];
  sub?: string;
  email?: string;
  email_verified?: boolean;
  nonce?: string;
  exp?: number;
}

/**
 * Completes the flow: checks state, exchanges the code (with the PKCE verifier) at the token
 * endpoint over the back channel, checks issuer, audience, nonce and expiry of the ID token, and
 * signs in the existing account with that e-mail. Accounts are never created here: people join an
 * organisation by invitation.
 */
export async function completeSso(request: Request): Promise<SsoOutcome> {
  const url = new URL(request.url);
  const flow = (await ssoFlowCookie().parse(request.headers.get("Cookie"))) as
    | { state: string; codeVerifier: string; nonce: string; redirectTo: string }
    | null;
  const error = url.searchParams.get("error");
  if (error) return { ok: false, code: "refused" };
  const code = url.searchParams.get("code");
  if (!flow || !code || url.searchParams.get("state") !== flow.state) {
    return { ok: false, code: "expired" };
  }
  const meta = await loadDiscovery();
  let claims: IdClaims;
  try {
    const tokens = await client().validateAuthorizationCode(meta.token_endpoint, code, flow.codeVerifier);
    claims = decodeIdToken(tokens.idToken()) as IdClaims;
  } catch {
    return { ok: false, code: "code" };
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
    claims.email_verified !== false;
  if (!valid) return { ok: false, code: "token" };

  const email = claims.email!.toLowerCase();
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  const membership = user && !user.disabled ? await firstMembership(user.id) : undefined;
  if (!user || !membership || (user.ssoSubject && user.ssoSubject !== claims.sub)) {
    return { ok: false, code: "no-account" };
  }
  if (!user.ssoSubject) {
    await db.update(users).set({ ssoSubject: claims.sub! }).where(and(eq(users.id, user.id), isNull(users.ssoSubject)));
  }
  const result = await completeSignIn(user, membership, "sso", request.headers.get("User-Agent"));
  return { ...result, redirectTo: flow.redirectTo };
}

export async function clearSsoFlowCookie(): Promise<string> {
  return ssoFlowCookie().serialize("", { maxAge: 0 });
}
