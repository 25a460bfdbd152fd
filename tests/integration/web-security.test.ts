import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { cases, programmes, signInAttempts } from "~/db/schema";
import { DEMO_USERS } from "~/demo/scenario";
import { cookieFor, seed } from "./helpers";
import { startHttpApp, type HttpApp } from "./http-harness";

/**
 * The real Express application of app/server/http.ts serving the app through React Router in
 * production mode, over HTTP on a free loopback port: a route forced to fail, the same-origin
 * check on writes, the headers on every answer, and sign-in throttling.
 */

let http: HttpApp;
let base = "";
let engineer = "";

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  http = await startHttpApp();
  base = http.base;
}, 120_000);

afterAll(async () => {
  await http?.close();
});

const get = (p: string, cookie?: string) => fetch(base + p, { headers: cookie ? { Cookie: cookie } : {}, redirect: "manual" });
const postForm = (p: string, fields: Record<string, string>, headers: Record<string, string>) =>
  fetch(base + p, { method: "POST", body: new URLSearchParams(fields), headers: { "Content-Type": "application/x-www-form-urlencoded", ...headers }, redirect: "manual" });

/** Stack frames with their file positions, SQL error words, connection strings and the test services' secrets. */
const INTERNALS = [/\bat\s+[\w.<>]+\s+\(/, /\.[cm]?[tj]sx?:\d+:\d+/, /relation "/, /does not exist/, /programmes_hidden/, /postgres(ql)?:\/\//, /S3RVER/, /ECONNREFUSED/];

describe("an unexpected failure in a route", () => {
  it("answers 500 with the error page, no stack trace or SQL, and is logged once", async () => {
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    await db.execute(sql`ALTER TABLE programmes RENAME TO programmes_hidden`);
    try {
      const page = await get("/programmes", engineer);
      const html = await page.text();
      const data = await get("/programmes.data", engineer);
      const dataText = await data.text();
      const api = await get("/api/v1/cases", engineer);
      const apiText = await api.text();

      expect(page.status).toBe(500);
      expect(html).toContain("Something went wrong");
      expect(page.headers.get("Content-Security-Policy")).toContain("frame-ancestors 'none'");
      expect(data.status).toBe(500);
      expect(api.status).toBe(500);
      expect(JSON.parse(apiText)).toEqual({ error: "internal", message: expect.stringContaining("logged") });
      for (const body of [html, dataText, apiText]) for (const pattern of INTERNALS) expect(body).not.toMatch(pattern);
      // One log line per failed request: the page, its data request and the API call.
      expect(logged).toHaveBeenCalledTimes(3);
      expect(String(logged.mock.calls[0]![0])).toContain("GET /programmes");
    } finally {
      await db.execute(sql`ALTER TABLE programmes_hidden RENAME TO programmes`);
      logged.mockRestore();
    }
  });

  it("answers a malformed URL escape with 400 and no stack", async () => {
    const res = await get("/cases/%E0%A4%A");
    expect(res.status).toBe(400);
    const text = await res.text();
    for (const pattern of INTERNALS) expect(text).not.toMatch(pattern);
  });
});

describe("cross-site request forgery", () => {
  const fields = () => ({ programmeId: "", reference: "CSRF-1", title: "Forged case" });

  it("refuses a write whose Origin or Referer is another site, with the session cookie, and writes nothing", async () => {
    const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
    const body = { ...fields(), programmeId: p!.id };
    const before = (await db.select().from(cases)).length;
    const forged: Record<string, string>[] = [{ Origin: "https://evil.example" }, { Referer: "https://evil.example/x" }, { Origin: "null" }, { Origin: base.replace("127.0.0.1", "localhost") }];
    for (const headers of forged) {
      const res = await postForm("/cases/new", body, { Cookie: engineer, ...headers });
      expect(res.status, JSON.stringify(headers)).toBe(403);
      expect(await res.text()).toContain("Cross-site request refused");
    }
    expect((await db.select().from(cases)).length).toBe(before);

    const own = await postForm("/cases/new", body, { Cookie: engineer, Origin: base });
    expect(own.status).toBe(302);
    expect((await db.select().from(cases)).length).toBe(before + 1);
  });

  it("lets reads through from anywhere (they change nothing) and still sends the headers", async () => {
    const res = await fetch(base + "/login", { headers: { Origin: "https://evil.example" } });
    expect(res.status).toBe(200);
    const csp = res.headers.get("Content-Security-Policy")!;
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
    expect(nonce).toBeTruthy();
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    const html = await res.text();
    for (const tag of html.match(/<script\b[^>]*>/g) ?? []) if (!/\bsrc=/.test(tag)) expect(tag).toContain(`nonce="${nonce}"`);
    expect(res.headers.get("Referrer-Policy")).toBe("same-origin");
    expect(res.headers.get("X-Frame-Options")).toBe("DENY");
    expect(res.headers.get("X-Content-Type-Options")).toBe("nosniff");
    // Isolation from other sites' windows and embedding: the OWASP Secure Headers Project's recommended values (from memory).
    expect(res.headers.get("Cross-Origin-Opener-Policy")).toBe("same-origin");
    expect(res.headers.get("Cross-Origin-Resource-Policy")).toBe("same-origin");
  });
});

describe("sign-in over HTTP", () => {
  it("sets httpOnly SameSite=Lax session and device cookies; after a stranger's failures it holds unknown browsers back (429, Retry-After) but not the owner's", async () => {
    const u = DEMO_USERS.find((d) => d.label === "quality")!;
    const ok = await postForm("/login", { email: u.email, password: u.password }, { Origin: base });
    expect(ok.status).toBe(302);
    const cookies = ok.headers.getSetCookie();
    const session = cookies.find((c) => c.startsWith("sw_session="))!;
    const device = cookies.find((c) => c.startsWith("sw_device="))!;
    for (const c of [session, device]) {
      expect(c).toMatch(/HttpOnly/i);
      expect(c).toMatch(/SameSite=Lax/i);
    }

    // Someone else's wrong guesses at this account, as recorded.
    await db.insert(signInAttempts).values(Array.from({ length: 12 }, () => ({ purpose: "sign-in" as const, email: u.email, address: "203.0.113.9", device: false, succeeded: false })));
    const refused = await postForm("/login", { email: u.email, password: u.password }, { Origin: base });
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get("Retry-After"))).toBeGreaterThan(60);
    expect(await refused.text()).toContain("Too many failed sign-in attempts");
    const owner = await postForm("/login", { email: u.email, password: u.password }, { Origin: base, Cookie: device.split(";")[0]! });
    expect(owner.status).toBe(302);
  });
});
