import { createHash, randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type Server } from "node:http";
import express, { type Request, type Response } from "express";
import { OAuth2Issuer, OAuth2Service, type MutableRedirectUri, type MutableResponse, type MutableToken } from "oauth2-mock-server";

export interface OidcUser {
  email: string;
  name: string;
  /** The credential this stand-in asks for before it answers for the person. */
  password: string;
}

export interface StartOidcOptions {
  /** TCP port on 127.0.0.1. */
  port: number;
  /** The only people this provider will sign in, each with the password it asks for. */
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

/** Who signed in at this provider, and when (seconds since 1970, as `auth_time` is written). */
interface Authentication {
  identity: Identity;
  authTime: number;
}

/** A subject that stays the same for an e-mail across restarts, as a real provider's would. */
function subjectFor(email: string): string {
  return `user-${createHash("sha256").update(email).digest("hex").slice(0, 24)}`;
}

const SESSION_COOKIE = "sw_idp";
// The parameters of an authorization request the form carries through the sign-in.
const AUTHORIZE_PARAMS = ["response_type", "client_id", "redirect_uri", "scope", "state", "nonce", "code_challenge", "code_challenge_method", "login_hint", "prompt", "max_age"];

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function page(params: URLSearchParams, opts: { email: string; error?: string; reauth: boolean }): string {
  const hidden = AUTHORIZE_PARAMS.filter((k) => params.has(k))
    .map((k) => `<input type="hidden" name="${k}" value="${escape(params.get(k)!)}">`)
    .join("");
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Local sign-in stand-in</title>
<style>body{font:15px system-ui,sans-serif;max-width:26rem;margin:4rem auto;padding:0 1rem;color:#1d2430}label{display:block;margin:.8rem 0 .2rem;font-weight:600}input[type=email],input[type=password]{width:100%;padding:.4rem;box-sizing:border-box}button{margin-top:1rem;padding:.5rem 1rem}.note{color:#555;font-size:13px}.error{color:#a11;font-weight:600}</style></head>
<body><h1>Local sign-in stand-in</h1>
<p class="note">This page stands in for your company's identity provider on a workstation. ${opts.reauth ? "Confirm who you are again: the application asked for a fresh sign-in." : "Sign in with the demo password shown in the README."}</p>
${opts.error ? `<p class="error" role="alert">${escape(opts.error)}</p>` : ""}
<form method="post" action="/authorize">${hidden}
<label for="email">E-mail</label><input id="email" name="email" type="email" autocomplete="username" value="${escape(opts.email)}" required>
<label for="password">Password</label><input id="password" name="password" type="password" autocomplete="current-password" required autofocus>
<button type="submit">Sign in</button></form></body></html>`;
}

/**
 * Starts a local OpenID Connect provider on 127.0.0.1:`port` for the authorization-code flow (PKCE
 * supported), built on oauth2-mock-server. Unlike the bare mock, it answers for nobody without a
 * credential: `/authorize` shows a sign-in form (the e-mail prefilled from `login_hint`) and issues a
 * code only after the person's own password. It keeps a sign-in session (a cookie on its own origin)
 * as a real provider does, and honours `prompt=login` and `max_age` by asking again; the ID token's
 * `auth_time` is the time of that sign-in. Tokens carry `sub` (stable per e-mail), `email`,
 * `email_verified: true`, `name`, the request's `nonce` and `aud` = client id. A code is used once.
 */
export async function startOidcProvider(opts: StartOidcOptions): Promise<RunningOidcProvider> {
  const directory = new Map<string, Identity & { password: string }>();
  for (const user of opts.users) {
    const email = user.email.trim().toLowerCase();
    directory.set(email, { sub: subjectFor(email), email, email_verified: true, name: user.name, password: user.password });
  }
  const sessions = new Map<string, Authentication>();
  const byCode = new Map<string, Authentication>();
  const byAccessToken = new Map<string, Identity>();

  const issuer = new OAuth2Issuer();
  await issuer.keys.generate("RS256");
  const service = new OAuth2Service(issuer);

  // The person is authenticated by the routes below before the mock's own /authorize runs.
  service.on("beforeAuthorizeRedirect", (redirect: MutableRedirectUri, req: IncomingMessage & { authenticated?: Authentication }) => {
    const code = redirect.url.searchParams.get("code");
    if (!code) return;
    if (req.authenticated) {
      byCode.set(code, req.authenticated);
      return;
    }
    redirect.url.searchParams.delete("code");
    redirect.url.searchParams.set("error", "access_denied");
  });

  // Fires for the access token and the ID token of the same token request.
  service.on("beforeTokenSigning", (token: MutableToken, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const code = req.body?.["code"];
    const found = typeof code === "string" ? byCode.get(code) : undefined;
    if (found) Object.assign(token.payload, found.identity, { auth_time: found.authTime });
  });

  service.on("beforeResponse", (response: MutableResponse, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const code = req.body?.["code"];
    const found = typeof code === "string" ? byCode.get(code) : undefined;
    if (req.body?.["grant_type"] !== "authorization_code" || !found) {
      // Only codes this provider issued after a sign-in are honoured; no other grant yields an identity.
      response.statusCode = 400;
      response.body = { error: "invalid_grant", error_description: "unknown, used or denied authorization code" };
      return;
    }
    byCode.delete(code as string);
    const accessToken = (response.body as { access_token?: unknown }).access_token;
    if (typeof accessToken === "string") byAccessToken.set(accessToken, found.identity);
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

  const app = express();
  app.disable("x-powered-by");
  const now = () => Math.floor(Date.now() / 1000);
  const sessionOf = (req: Request) => {
    const sid = /(?:^|;\s*)sw_idp=([0-9a-f]{40})/.exec(req.headers.cookie ?? "")?.[1];
    return sid ? sessions.get(sid) : undefined;
  };
  /** Hands the request, now authenticated, to the mock's own /authorize (which issues the code). */
  const authorizeAs = (req: Request, params: URLSearchParams, authenticated: Authentication, next: () => void) => {
    (req as Request & { authenticated?: Authentication }).authenticated = authenticated;
    req.method = "GET";
    req.url = `/authorize?${params}`;
    next();
  };

  app.get("/authorize", (req, res: Response, next) => {
    const params = new URL(req.url, "http://stand-in").searchParams;
    const session = sessionOf(req);
    const maxAge = params.has("max_age") ? Number(params.get("max_age")) : undefined;
    // max_age=0 asks for a new sign-in every time, as prompt=login does (OpenID Connect Core 1.0, 3.1.2.1).
    const fresh = session && params.get("prompt") !== "login" && (maxAge === undefined || (Number.isFinite(maxAge) && maxAge > 0 && now() - session.authTime <= maxAge));
    if (session && fresh) return authorizeAs(req, params, session, next);
    res.type("html").send(page(params, { email: params.get("login_hint") ?? session?.identity.email ?? "", reauth: Boolean(session) }));
  });

  app.post("/authorize", express.urlencoded({ extended: false, limit: "16kb" }), (req: Request, res: Response, next) => {
    const body = req.body as Record<string, string | undefined>;
    const params = new URLSearchParams();
    for (const k of AUTHORIZE_PARAMS) if (typeof body[k] === "string") params.set(k, body[k]);
    const email = (body.email ?? "").trim().toLowerCase();
    const person = directory.get(email);
    if (!person || body.password !== person.password) {
      res.status(401).type("html").send(page(params, { email, error: "The e-mail address or password is not correct.", reauth: false }));
      return;
    }
    const { password: _password, ...identity } = person;
    const authenticated = { identity, authTime: now() };
    const sid = randomBytes(20).toString("hex");
    sessions.set(sid, authenticated);
    res.setHeader("Set-Cookie", `${SESSION_COOKIE}=${sid}; Path=/; HttpOnly; SameSite=Lax`);
    authorizeAs(req, params, authenticated, next);
  });

  app.use(service.requestHandler);

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, "127.0.0.1", () => resolve());
  });
  const address = server.address();
  const url = `http://127.0.0.1:${typeof address === "object" && address ? address.port : opts.port}`;
  issuer.url = url;

  let stopping: Promise<void> | undefined;
  return {
    issuer: url,
    stop() {
      stopping ??= new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      });
      return stopping;
    },
  };
}
