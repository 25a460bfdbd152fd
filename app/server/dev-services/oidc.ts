import { createHash } from "node:crypto";
import type { IncomingMessage } from "node:http";
import { OAuth2Server, type MutableRedirectUri, type MutableResponse, type MutableToken } from "oauth2-mock-server";

export interface OidcUser {
  email: string;
  name: string;
}

export interface StartOidcOptions {
  /** TCP port on 127.0.0.1. */
  port: number;
  /** The only people this provider will sign in; chosen per request by `login_hint`. */
  users: OidcUser[];
}

export interface RunningOidcProvider {
  /** `http://127.0.0.1:PORT`, equal to the `iss` claim; endpoints are `/authorize`, `/token`, `/userinfo`, `/jwks`. */
  issuer: string;
  stop(): Promise<void>;
}

interface Identity {
  sub: string;
  email: string;
  email_verified: true;
  name: string;
}

/** A subject that stays the same for an e-mail across restarts, as a real provider's would. */
function subjectFor(email: string): string {
  return `user-${createHash("sha256").update(email).digest("hex").slice(0, 24)}`;
}

function queryParam(req: IncomingMessage, name: string): string | undefined {
  const value = new URL(req.url ?? "/", "http://127.0.0.1").searchParams.get(name);
  return value ?? undefined;
}

/**
 * Starts a local OpenID Connect provider (oauth2-mock-server) on 127.0.0.1:`port` for the
 * authorization-code flow (PKCE supported). There is no login page: the person signing in is named
 * by the authorization request's `login_hint` (an e-mail), which must be one of `users`; otherwise
 * the provider redirects back with `error=access_denied` and issues no code. The ID token (and the
 * access token) carry `sub` (stable per e-mail), `email`, `email_verified: true` and `name`, plus the
 * `nonce` of the authorization request; `aud` is the client id. A code can be exchanged once.
 */
export async function startOidcProvider(opts: StartOidcOptions): Promise<RunningOidcProvider> {
  const directory = new Map<string, Identity>();
  for (const user of opts.users) {
    const email = user.email.trim().toLowerCase();
    directory.set(email, { sub: subjectFor(email), email, email_verified: true, name: user.name });
  }
  const byCode = new Map<string, Identity>();
  const byAccessToken = new Map<string, Identity>();

  const server = new OAuth2Server();
  await server.issuer.keys.generate("RS256");
  const service = server.service;

  service.on("beforeAuthorizeRedirect", (redirect: MutableRedirectUri, req: IncomingMessage) => {
    const code = redirect.url.searchParams.get("code");
    if (!code) return;
    const identity = directory.get(queryParam(req, "login_hint")?.trim().toLowerCase() ?? "");
    if (identity) {
      byCode.set(code, identity);
      return;
    }
    redirect.url.searchParams.delete("code");
    redirect.url.searchParams.set("error", "access_denied");
    redirect.url.searchParams.set("error_description", "login_hint does not name a known user of this local provider");
  });

  // Fires for the access token and the ID token of the same token request.
  service.on("beforeTokenSigning", (token: MutableToken, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const code = req.body?.["code"];
    const identity = typeof code === "string" ? byCode.get(code) : undefined;
    if (identity) Object.assign(token.payload, identity);
  });

  service.on("beforeResponse", (response: MutableResponse, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const code = req.body?.["code"];
    const identity = typeof code === "string" ? byCode.get(code) : undefined;
    if (req.body?.["grant_type"] !== "authorization_code" || !identity) {
      // Only codes this provider issued for a known user are honoured; no other grant yields an identity.
      response.statusCode = 400;
      response.body = { error: "invalid_grant", error_description: "unknown, used or denied authorization code" };
      return;
    }
    byCode.delete(code as string);
    const accessToken = (response.body as { access_token?: unknown }).access_token;
    if (typeof accessToken === "string") byAccessToken.set(accessToken, identity);
  });

  service.on("beforeUserinfo", (response: MutableResponse, req: IncomingMessage) => {
    const bearer = /^Bearer (.+)$/i.exec(req.headers.authorization ?? "")?.[1];
    const identity = bearer ? byAccessToken.get(bearer) : undefined;
    if (identity) {
      response.body = { ...identity };
    } else {
      response.statusCode = 401;
      response.body = { error: "invalid_token" };
    }
  });

  await server.start(opts.port, "127.0.0.1");
  const issuer = `http://127.0.0.1:${server.address().port}`;
  server.issuer.url = issuer;

  let stopping: Promise<void> | undefined;
  return {
    issuer,
    stop() {
      stopping ??= server.stop();
      return stopping;
    },
  };
}
