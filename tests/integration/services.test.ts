/**
 * Checks of the local stand-in services themselves (the harness the other integration tests rely
 * on): S3, mail capture and the OpenID Connect provider. Expected behaviour is that of the S3 API,
 * SMTP and OpenID Connect Core 1.0 / RFC 6749 / RFC 7636 (PKCE).
 */
import { createHash, createPublicKey, randomBytes, verify, type JsonWebKey } from "node:crypto";
import { GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import nodemailer from "nodemailer";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listCapturedMail, readCapturedMail } from "~/server/dev-services/mail";
import { startOidcProvider, type RunningOidcProvider } from "~/server/dev-services/oidc";

describe("per-file database", () => {
  it("is a fresh clone of the migrated template, reachable through DATABASE_URL", async () => {
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    try {
      const { rows } = await client.query<{ db: string; tables: string }>(
        "SELECT current_database() AS db, (SELECT count(*) FROM information_schema.tables WHERE table_schema = 'public') AS tables",
      );
      expect(rows[0]!.db).toMatch(/^test_\d+_[0-9a-f]{8}$/);
      // The template was migrated, so the clone already has the app's tables.
      expect(Number(rows[0]!.tables)).toBeGreaterThan(0);
    } finally {
      await client.end();
    }
  });
});

describe("S3 stand-in", () => {
  const s3 = () =>
    new S3Client({
      endpoint: process.env.S3_ENDPOINT,
      region: process.env.S3_REGION,
      forcePathStyle: true,
      credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID!, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY! },
    });

  it("stores, lists and returns an object byte for byte in both buckets", async () => {
    const client = s3();
    for (const bucket of ["spanwright-uploads", "spanwright-reports"]) {
      const key = `harness/${randomBytes(6).toString("hex")}.csv`;
      const body = "station,chord_m\n0.0,2.10\n0.5,1.62\n";
      await client.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: "text/csv" }));
      const listed = await client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: "harness/" }));
      expect(listed.Contents?.map((o) => o.Key)).toContain(key);
      const got = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
      expect(got.ContentType).toBe("text/csv");
      expect(await got.Body!.transformToString()).toBe(body);
    }
    client.destroy();
  });
});

describe("mail capture", () => {
  it("captures a message sent over SMTP with its subject, text and HTML, newest first", async () => {
    const transport = nodemailer.createTransport({ url: process.env.SMTP_URL, secure: false, ignoreTLS: true } as never);
    const to = `harness-${randomBytes(4).toString("hex")}@kelvard-fenlow.example`;
    await transport.sendMail({ from: "Spanwright <no-reply@spanwright.invalid>", to, subject: "First notice", text: "one", html: "<p>one</p>" });
    await transport.sendMail({
      from: "Spanwright <no-reply@spanwright.invalid>",
      to: to.toUpperCase(),
      subject: "Loads case KF-60 ready for check",
      text: "The case is ready.",
      html: "<p>The case is <b>ready</b>.</p>",
    });
    transport.close();

    const mails = await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to });
    expect(mails.map((m) => m.subject)).toEqual(["Loads case KF-60 ready for check", "First notice"]);
    const [latest] = mails;
    expect(latest!.to).toEqual([to]);
    expect(latest!.from).toContain("no-reply@spanwright.invalid");
    expect(latest!.text.trim()).toBe("The case is ready.");
    expect(latest!.html).toContain("<b>ready</b>");
    expect(Number.isNaN(Date.parse(latest!.receivedAt))).toBe(false);
    expect(await readCapturedMail(process.env.MAIL_CAPTURE_DIR!, latest!.id)).toEqual(latest);
    expect(await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: "nobody@northmoor-aero.example" })).toEqual([]);
  });
});

describe("OpenID Connect stand-in", () => {
  const users = [
    { email: "ada.engineer@kelvard-fenlow.example", name: "Ada Engineer", password: "ada-demo-password" },
    { email: "ben.checker@kelvard-fenlow.example", name: "Ben Checker", password: "ben-demo-password" },
  ];
  const clientId = "spanwright";
  const redirectUri = "http://127.0.0.1:3000/auth/sso/callback";
  let provider: RunningOidcProvider;

  beforeAll(async () => {
    provider = await startOidcProvider({ port: 0, users });
  });
  afterAll(async () => {
    await provider.stop();
  });

  function decodePart(part: string): Record<string, unknown> {
    return JSON.parse(Buffer.from(part, "base64url").toString("utf8")) as Record<string, unknown>;
  }

  function authorizeParams(loginHint: string, challenge: string, nonce: string, extra: Record<string, string> = {}) {
    return new URLSearchParams({
      response_type: "code",
      client_id: clientId,
      redirect_uri: redirectUri,
      scope: "openid email profile",
      state: "state-123",
      nonce,
      code_challenge: challenge,
      code_challenge_method: "S256",
      login_hint: loginHint,
      ...extra,
    });
  }

  /** GET /authorize, with the stand-in's own session cookie when given. */
  async function ask(params: URLSearchParams, cookie?: string) {
    return fetch(`${provider.issuer}/authorize?${params}`, { redirect: "manual", headers: cookie ? { Cookie: cookie } : {} });
  }

  /** Answers the stand-in's sign-in form; resolves with the redirect back (or the refusal) and the session cookie. */
  async function signIn(params: URLSearchParams, password: string, email = params.get("login_hint")!) {
    const body = new URLSearchParams(params);
    body.set("email", email);
    body.set("password", password);
    const res = await fetch(`${provider.issuer}/authorize`, { method: "POST", body, redirect: "manual" });
    return { res, back: res.headers.get("location") ? new URL(res.headers.get("location")!) : null, cookie: res.headers.get("set-cookie")?.split(";")[0] };
  }

  /** The whole front channel for one person: ask, sign in with their password, come back with a code. */
  async function authorize(loginHint: string, challenge: string, nonce: string): Promise<URL> {
    const params = authorizeParams(loginHint, challenge, nonce);
    const person = users.find((u) => u.email === loginHint.toLowerCase());
    const { res, back } = await signIn(params, person?.password ?? "not-a-password");
    expect(res.status).toBe(302);
    return back!;
  }

  async function idTokenFor(back: URL, verifier: string) {
    const res = await fetch(`${provider.issuer}/token`, {
      method: "POST",
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ grant_type: "authorization_code", client_id: clientId, code: back.searchParams.get("code")!, redirect_uri: redirectUri, code_verifier: verifier }),
    });
    return decodePart(((await res.json()) as { id_token: string }).id_token.split(".")[1]!);
  }

  const pkce = () => {
    const verifier = randomBytes(32).toString("base64url");
    return { verifier, challenge: createHash("sha256").update(verifier).digest("base64url") };
  };

  it("publishes a discovery document whose issuer is its own loopback URL", async () => {
    const res = await fetch(`${provider.issuer}/.well-known/openid-configuration`);
    const doc = (await res.json()) as Record<string, unknown>;
    expect(provider.issuer).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    expect(doc.issuer).toBe(provider.issuer);
    expect(doc.authorization_endpoint).toBe(`${provider.issuer}/authorize`);
    expect(doc.token_endpoint).toBe(`${provider.issuer}/token`);
    expect(doc.code_challenge_methods_supported).toContain("S256");
  });

  it("signs in the named person, after their password, through authorize → token with PKCE S256", async () => {
    const verifier = randomBytes(32).toString("base64url");
    const challenge = createHash("sha256").update(verifier).digest("base64url");
    const back = await authorize("Ben.Checker@kelvard-fenlow.example", challenge, "nonce-456");
    expect(back.origin + back.pathname).toBe(redirectUri);
    expect(back.searchParams.get("state")).toBe("state-123");
    const code = back.searchParams.get("code");
    expect(code).toBeTruthy();

    const exchange = () =>
      fetch(`${provider.issuer}/token`, {
        method: "POST",
        headers: {
          "Content-Type": "application/x-www-form-urlencoded",
          Authorization: `Basic ${Buffer.from(`${clientId}:local-secret`).toString("base64")}`,
        },
        body: new URLSearchParams({ grant_type: "authorization_code", code: code!, redirect_uri: redirectUri, code_verifier: verifier }),
      });
    const res = await exchange();
    expect(res.status).toBe(200);
    const tokens = (await res.json()) as { id_token: string; access_token: string };
    const [header, payload, signature] = tokens.id_token.split(".");
    const claims = decodePart(payload!);
    expect(claims).toMatchObject({
      iss: provider.issuer,
      aud: clientId,
      email: "ben.checker@kelvard-fenlow.example",
      email_verified: true,
      name: "Ben Checker",
      nonce: "nonce-456",
    });
    expect(claims.sub).toMatch(/^user-[0-9a-f]{24}$/);

    // The signature verifies against the published key set (RS256, RFC 7518 §3.3).
    const { kid } = decodePart(header!) as { kid: string };
    const jwks = (await (await fetch(`${provider.issuer}/jwks`)).json()) as { keys: (JsonWebKey & { kid: string })[] };
    const key = createPublicKey({ key: jwks.keys.find((k) => k.kid === kid)!, format: "jwk" });
    expect(verify("RSA-SHA256", Buffer.from(`${header}.${payload}`), key, Buffer.from(signature!, "base64url"))).toBe(true);

    // The user-info endpoint answers for the same person.
    const info = (await (await fetch(`${provider.issuer}/userinfo`, { headers: { Authorization: `Bearer ${tokens.access_token}` } })).json()) as Record<string, unknown>;
    expect(info).toMatchObject({ sub: claims.sub, email: "ben.checker@kelvard-fenlow.example" });

    // A code is single-use (RFC 6749 §4.1.2).
    expect((await exchange()).status).toBe(400);
  });

  it("gives the same subject to the same e-mail on every sign-in, and different ones to different people", async () => {
    const subjectOf = async (email: string) => {
      const verifier = randomBytes(32).toString("base64url");
      const back = await authorize(email, createHash("sha256").update(verifier).digest("base64url"), "n");
      const res = await fetch(`${provider.issuer}/token`, {
        method: "POST",
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
        body: new URLSearchParams({ grant_type: "authorization_code", client_id: clientId, code: back.searchParams.get("code")!, redirect_uri: redirectUri, code_verifier: verifier }),
      });
      return decodePart(((await res.json()) as { id_token: string }).id_token.split(".")[1]!).sub;
    };
    const first = await subjectOf(users[0]!.email);
    expect(await subjectOf(users[0]!.email)).toBe(first);
    expect(await subjectOf(users[1]!.email)).not.toBe(first);
  });

  it("refuses a verifier that does not match the challenge", async () => {
    const back = await authorize(users[0]!.email, createHash("sha256").update("a".repeat(43)).digest("base64url"), "n");
    const res = await fetch(`${provider.issuer}/token`, {
      method: "POST",
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ grant_type: "authorization_code", client_id: clientId, code: back.searchParams.get("code")!, redirect_uri: redirectUri, code_verifier: "b".repeat(43) }),
    });
    expect(res.status).toBe(400);
  });

  it("answers for nobody on a login_hint alone: it asks for the person's password and issues no code", async () => {
    const res = await ask(authorizeParams(users[1]!.email, pkce().challenge, "n"));
    expect(res.status).toBe(200);
    expect(res.headers.get("location")).toBeNull();
    const html = await res.text();
    expect(html).toContain('type="password"');
    expect(html).toContain(`value="${users[1]!.email}"`);
  });

  it("refuses a wrong password or an unknown person with the form again, and no code", async () => {
    for (const [email, password] of [[users[0]!.email, "wrong-password"], ["someone@northmoor-aero.example", "anything"]] as const) {
      const { res, back } = await signIn(authorizeParams(email, pkce().challenge, "n"), password, email);
      expect(res.status).toBe(401);
      expect(back).toBeNull();
      expect(await res.text()).toContain("not correct");
    }
  });

  it("keeps its own sign-in session, and honours prompt=login and max_age by asking again; auth_time is when the person signed in", async () => {
    const first = pkce();
    const before = Math.floor(Date.now() / 1000);
    const { back, cookie } = await signIn(authorizeParams(users[0]!.email, first.challenge, "n1"), users[0]!.password);
    expect(cookie).toMatch(/^sw_idp=/);
    const claims = await idTokenFor(back!, first.verifier);
    expect(claims.auth_time).toBeGreaterThanOrEqual(before);
    expect(claims.auth_time).toBeLessThanOrEqual(Math.floor(Date.now() / 1000));

    // Within its session and without prompt, it answers at once with the same auth_time (single sign-on).
    const again = pkce();
    const quick = await ask(authorizeParams(users[0]!.email, again.challenge, "n2"), cookie);
    expect(quick.status).toBe(302);
    expect((await idTokenFor(new URL(quick.headers.get("location")!), again.verifier)).auth_time).toBe(claims.auth_time);

    // prompt=login and max_age=0 each make it ask for the password again, even within its session.
    for (const extra of [{ prompt: "login" }, { max_age: "0" }] as Record<string, string>[]) {
      const res = await ask(authorizeParams(users[0]!.email, pkce().challenge, "n3", extra), cookie);
      expect(res.status, JSON.stringify(extra)).toBe(200);
      expect(await res.text()).toContain("Confirm who you are again");
    }
  });
});
