import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { MAX_FAILURES_PER_ACCOUNT, requireUser, signInWithPassword } from "~/auth/auth.server";
import { readSession, SESSION_IDLE_MS } from "~/auth/session.server";
import { db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";
import { action as logoutAction } from "~/routes/auth/logout";
import { action as loginAction } from "~/routes/auth/login";
import { cookieFor, demoUser, form, request, run, seed } from "./helpers";

beforeAll(async () => {
  await seed();
});

describe("password sign-in", () => {
  it("signs a demo user in and opens a database session holding only the token's SHA-256", async () => {
    const u = demoUser("engineer");
    const result = await signInWithPassword({ email: u.email.toUpperCase(), password: u.password, address: "10.0.0.1", userAgent: "vitest" });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const token = result.setCookie.split(";")[0]!.split("=")[1]!;
    expect(result.setCookie).toMatch(/HttpOnly/i);
    expect(result.setCookie).toMatch(/SameSite=Lax/i);
    const stored = await db.select().from(sessions).where(eq(sessions.userId, result.current.userId));
    expect(stored.length).toBeGreaterThan(0);
    expect(stored.every((s) => s.tokenHash !== token && /^[0-9a-f]{64}$/.test(s.tokenHash))).toBe(true);
  });

  it("stores passwords as argon2id hashes, never in plain text", async () => {
    const [row] = await db.select().from(users).where(eq(users.email, demoUser("checker").email));
    expect(row!.passwordHash).toMatch(/^\$argon2id\$/);
    expect(row!.passwordHash).not.toContain(demoUser("checker").password);
  });

  it("answers a wrong password and an unknown user alike with 401 and no session", async () => {
    const before = (await db.select().from(sessions)).length;
    const wrong = await run(loginAction, { request: request("/login", { method: "POST", body: form({ email: demoUser("quality").email, password: "not-the-password" }) }) });
    const unknown = await run(loginAction, { request: request("/login", { method: "POST", body: form({ email: "nobody@nowhere.example", password: "whatever-long" }) }) });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect((wrong.body as { message: string }).message).toBe((unknown.body as { message: string }).message);
    expect((await db.select().from(sessions)).length).toBe(before);
  });

  it("names the field when the form is malformed", async () => {
    const res = await run(loginAction, { request: request("/login", { method: "POST", body: form({ email: "not-an-address", password: "" }) }) });
    expect(res.status).toBe(400);
    const errors = (res.body as { fieldErrors: Record<string, string[]> }).fieldErrors;
    expect(errors.email?.[0]).toMatch(/e-mail/i);
    expect(errors.password?.[0]).toMatch(/password/i);
  });

  it("throttles an account after repeated failures, even when the right password follows", async () => {
    const u = demoUser("admin");
    for (let i = 0; i < MAX_FAILURES_PER_ACCOUNT; i++) {
      const r = await signInWithPassword({ email: u.email, password: `wrong-password-${i}`, address: `10.1.1.${i}`, userAgent: null });
      expect(r.ok).toBe(false);
    }
    const blocked = await signInWithPassword({ email: u.email, password: u.password, address: "10.1.2.1", userAgent: null });
    expect(blocked).toMatchObject({ ok: false, status: 429 });
  });

  it("throttles a client address that guesses across many accounts", async () => {
    for (let i = 0; i < 20; i++) {
      await signInWithPassword({ email: `guess${i}@nowhere.example`, password: "guess-guess-guess", address: "10.9.9.9", userAgent: null });
    }
    const u = demoUser("quality");
    const blocked = await signInWithPassword({ email: u.email, password: u.password, address: "10.9.9.9", userAgent: null });
    expect(blocked).toMatchObject({ ok: false, status: 429 });
  });
});

describe("sessions", () => {
  it("accepts a valid cookie and refuses a tampered one with a redirect that clears it", async () => {
    const cookie = await cookieFor("checker");
    const state = await readSession(request("/cases", { cookie }));
    expect(state.status).toBe("valid");
    const tampered = cookie.slice(0, -1) + (cookie.endsWith("a") ? "b" : "a");
    const refused = await requireUser(request("/cases", { cookie: tampered })).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(Response);
    const res = refused as Response;
    expect(res.status).toBe(302);
    expect(res.headers.get("Location")).toBe("/login?redirectTo=%2Fcases&reason=session");
    expect(res.headers.get("Set-Cookie")).toMatch(/Max-Age=0/);
  });

  it("refuses an expired session", async () => {
    const cookie = await cookieFor("quality");
    const s = await readSession(request("/", { cookie }));
    if (s.status !== "valid") throw new Error("expected a valid session");
    await db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.id, s.current.sessionId));
    expect((await readSession(request("/", { cookie }))).status).toBe("invalid");
  });

  it("slides the idle expiry forward on use", async () => {
    const cookie = await cookieFor("engineer");
    const s = await readSession(request("/", { cookie }));
    if (s.status !== "valid") throw new Error("expected a valid session");
    const old = new Date(Date.now() - 2 * 60 * 60 * 1000);
    await db.update(sessions).set({ lastSeenAt: old, expiresAt: new Date(Date.now() + 60_000) }).where(eq(sessions.id, s.current.sessionId));
    expect((await readSession(request("/", { cookie }))).status).toBe("valid");
    const [row] = await db.select().from(sessions).where(eq(sessions.id, s.current.sessionId));
    expect(row!.expiresAt.getTime()).toBeGreaterThan(Date.now() + SESSION_IDLE_MS - 60_000);
  });

  it("signs out everywhere: every session of the person ends", async () => {
    const first = await cookieFor("checker");
    const second = await cookieFor("checker");
    const res = await run(logoutAction, { request: request("/logout", { method: "POST", cookie: first, body: form({ everywhere: "1" }) }) });
    expect(res.status).toBe(302);
    expect((await readSession(request("/", { cookie: first }))).status).toBe("invalid");
    expect((await readSession(request("/", { cookie: second }))).status).toBe("invalid");
    const [{ n }] = (await db.execute(sql`SELECT count(*)::int AS n FROM sessions s JOIN users u ON u.id = s.user_id WHERE u.email = ${demoUser("checker").email}`)).rows as [{ n: number }];
    expect(n).toBe(0);
  });
});
