import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { requireUser, signInWithPassword } from "~/auth/auth.server";
import { BASE_DELAY_MS, delayAfter, FREE_FAILURES, MAX_DELAY_MS } from "~/auth/throttle.server";
import { readSession, SESSION_IDLE_MS } from "~/auth/session.server";
import { db } from "~/db/client.server";
import { sessions, signInAttempts, users } from "~/db/schema";
import { action as logoutAction } from "~/routes/auth/logout";
import { action as loginAction } from "~/routes/auth/login";
import { cookieFor, demoUser, form, request, run, scopeOf, seed } from "./helpers";

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
});

describe("throttling without lock-out (issue 9, item 5)", () => {
  /** A stranger's failed attempts on an account, `ago` ms back, as the attempts table records them. */
  async function strangerFailures(email: string, n: number, ago = 0, address = "198.51.100.7") {
    const at = new Date(Date.now() - ago);
    await db.insert(signInAttempts).values(Array.from({ length: n }, () => ({ purpose: "sign-in" as const, email, address, device: false, succeeded: false, at })));
  }
  const signIn = (label: Parameters<typeof demoUser>[0], opts: { password?: string; address?: string; cookieHeader?: string } = {}) =>
    signInWithPassword({ email: demoUser(label).email, password: opts.password ?? demoUser(label).password, address: opts.address ?? "10.20.0.1", userAgent: "vitest", cookieHeader: opts.cookieHeader });

  it("delays, never blocks: each failure beyond the free ones doubles the wait, capped", () => {
    expect([0, 1, 2, 3].map((n) => delayAfter(n, FREE_FAILURES.account))).toEqual([0, 0, 0, 0]);
    expect([4, 5, 6, 7].map((n) => delayAfter(n, FREE_FAILURES.account))).toEqual([BASE_DELAY_MS, 2 * BASE_DELAY_MS, 4 * BASE_DELAY_MS, 8 * BASE_DELAY_MS]);
    expect(delayAfter(1000, FREE_FAILURES.account)).toBe(MAX_DELAY_MS);
  });

  it("holds an unknown browser back after a stranger's failures, saying how long, but lets the owner's known browser in", async () => {
    // The owner signed in from this browser before: it carries the device cookie.
    const first = await signIn("admin");
    if (!first.ok) throw new Error("first sign-in failed");
    expect(first.deviceCookie).toMatch(/^sw_device=[^;]+;.*HttpOnly/i);
    const device = first.deviceCookie!.split(";")[0]!;

    await strangerFailures(demoUser("admin").email, 12);
    const held = await signIn("admin", { address: "10.20.0.2" });
    expect(held).toMatchObject({ ok: false, status: 429 });
    if (held.ok) return;
    expect(held.retryAfterSeconds).toBeGreaterThan(60);
    expect(held.message).toMatch(/Too many failed sign-in attempts\. Wait \d+ minutes/);

    const known = await signIn("admin", { cookieHeader: device });
    expect(known.ok).toBe(true);
  });

  it("lets anyone in again once the delay has passed: failures older than the wait hold nobody back", async () => {
    await strangerFailures(demoUser("outsider").email, 40, MAX_DELAY_MS + 1000);
    expect((await signIn("outsider", { address: "10.20.0.3" })).ok).toBe(true);
  });

  it("gives a known browser its own allowance: wrong passwords there are delayed too, after more of them", async () => {
    const first = await signIn("checker");
    const device = first.ok ? first.deviceCookie!.split(";")[0]! : "";
    for (let i = 0; i < FREE_FAILURES.device; i++) expect(await signIn("checker", { password: `wrong-${i}`, cookieHeader: device })).toMatchObject({ ok: false, status: 401 });
    // One more failure makes the next attempt wait; recorded as just now, so the wait has not passed.
    await db.insert(signInAttempts).values({ purpose: "sign-in", email: demoUser("checker").email, address: "10.20.0.1", device: true, succeeded: false });
    expect(await signIn("checker", { cookieHeader: device })).toMatchObject({ ok: false, status: 429 });
    // A device cookie of another account is no exemption.
    const other = await signIn("engineer");
    expect(other.ok).toBe(true);
  });

  it("counts a client address across accounts, with the same growing delay", async () => {
    for (let i = 0; i < 14; i++) await strangerFailures(`guess${i}@nowhere.example`, 1, 0, "10.9.9.9");
    expect(await signIn("engineer", { address: "10.9.9.9" })).toMatchObject({ ok: false, status: 429 });
    expect((await signIn("engineer", { address: "10.9.9.10" })).ok).toBe(true);
  });
});

describe("sessions", () => {
  it("accepts a valid cookie and refuses a tampered one with a redirect that clears it", async () => {
    const cookie = await cookieFor("checker");
    const state = await readSession(request("/cases", { cookie }));
    expect(state.status).toBe("valid");
    const tampered = cookie.slice(0, -1) + (cookie.endsWith("a") ? "b" : "a");
    const refused = await requireUser(await scopeOf(request("/cases", { cookie: tampered }))).catch((e: unknown) => e);
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
