import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { requireUser } from "~/auth/auth.server";
import { beginSsoSignature, completeSsoSignature } from "~/auth/signing.server";
import { db } from "~/db/client.server";
import { auditLog, caseSteps, cases, signatures, signingRequests, users } from "~/db/schema";
import { DEMO_USERS } from "~/demo/scenario";
import type { CurrentUser } from "~/domain/people";
import { loader as ssoStart } from "~/routes/auth/sso";
import { loader as ssoCallback } from "~/routes/auth/sso-callback";
import { action as reviewAction } from "~/routes/cases/review";
import { startOidcProvider, type RunningOidcProvider } from "~/server/dev-services/oidc";
import { saveStep } from "~/services/case-steps.server";
import { returnStep } from "~/services/review.server";
import { resetEnvCache } from "~/utils/env.server";
import { cookieFor, demoUser, form, request, run, scopeOf, seed } from "./helpers";

/*
 * Issue 9, items 1 and 7: every signature needs a fresh proof at the moment of signing. A company
 * sign-in of a minute ago no longer counts; signing with company sign-in is a new round trip to the
 * identity provider forcing it to authenticate the person again (prompt=login, max_age=0), checked
 * by auth_time and bound by nonce and a single-use request to that one signature and to what was
 * shown. Wrong signing passwords are throttled and every one is written to the audit trail.
 */

let provider: RunningOidcProvider;
let caseId = "";
const cookies: Record<string, string> = {};
const saved = { issuer: process.env.OIDC_ISSUER };

/** The cookies a response sets, as one Cookie header value (later ones win). */
function cookiesOf(headers: Headers, previous = ""): string {
  const jar = new Map(previous ? previous.split("; ").map((c) => c.split("=", 2) as [string, string]) : []);
  for (const line of headers.getSetCookie()) {
    const [pair] = line.split(";");
    const i = pair!.indexOf("=");
    jar.set(pair!.slice(0, i), pair!.slice(i + 1));
  }
  return [...jar].filter(([, v]) => v !== "").map(([k, v]) => `${k}=${v}`).join("; ");
}

/**
 * The person's browser at the identity provider: asks the authorization URL (with the provider's
 * own session cookie, if any); if the provider asks for a sign-in, answers its form with the
 * password. Returns the callback URL it sends back to and whether it asked.
 */
async function atProvider(authorizeUrl: string, idp: { cookie?: string }, password: string): Promise<{ callback: URL; asked: boolean }> {
  const first = await fetch(authorizeUrl, { redirect: "manual", headers: idp.cookie ? { Cookie: idp.cookie } : {} });
  if (first.status === 302) return { callback: new URL(first.headers.get("location")!), asked: false };
  expect(first.status).toBe(200);
  const params = new URL(authorizeUrl).searchParams;
  const body = new URLSearchParams(params);
  body.set("email", params.get("login_hint")!);
  body.set("password", password);
  const res = await fetch(`${provider.issuer}/authorize`, { method: "POST", body, redirect: "manual" });
  expect(res.status).toBe(302);
  idp.cookie = res.headers.get("set-cookie")!.split(";")[0];
  return { callback: new URL(res.headers.get("location")!), asked: true };
}

const review = (cookie: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie, body: form(fields) }), params: { caseId } });
const checkerIdp: { cookie?: string } = {};

async function currentOf(cookie: string): Promise<CurrentUser> {
  return requireUser(await scopeOf(request("/", { cookie })));
}

/** The checkers' signatures on the case (or one step of it); the engineer's "prepared" ones are made at each submission. */
const checks = (step?: string) => db.select().from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "checked"), ...(step ? [eq(signatures.step, step as never)] : [])));

async function stepStatus(step: string) {
  const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step as never)));
  return row!;
}

beforeAll(async () => {
  await seed();
  provider = await startOidcProvider({ port: 0, users: DEMO_USERS.map((u) => ({ email: u.email, name: u.name, password: u.password })) });
  process.env.OIDC_ISSUER = provider.issuer;
  resetEnvCache();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  for (const who of ["engineer", "quality"] as const) cookies[who] = await cookieFor(who);
  // The checker signs in with company sign-in: through the app's own routes and the provider.
  const start = await run(ssoStart, { request: request(`/auth/sso?email=${encodeURIComponent(demoUser("checker").email)}`) });
  expect(start.status).toBe(302);
  const flow = cookiesOf(start.headers);
  const { callback } = await atProvider(start.headers.get("Location")!, checkerIdp, demoUser("checker").password);
  const back = await run(ssoCallback, { request: request(`${callback.pathname}${callback.search}`, { cookie: flow }) });
  expect(back.status).toBe(302);
  cookies.checker = cookiesOf(back.headers);
  expect(cookies.checker).toMatch(/sw_session=/);
  for (const step of ["basis", "planform", "sections"]) expect((await review(cookies.engineer!, { intent: "submit", step, password: demoUser("engineer").password })).status).toBe(200);
});

afterAll(async () => {
  await provider.stop();
  process.env.OIDC_ISSUER = saved.issuer;
  resetEnvCache();
});

describe("a signature's fresh proof", () => {
  it("is not a company sign-in of a minute ago: approving without a password is refused and nothing is signed", async () => {
    const res = await review(cookies.checker!, { intent: "approve", step: "basis" });
    expect(res.status).toBe(401);
    expect((res.body as { message: string }).message).toMatch(/password/);
    expect(await checks()).toHaveLength(0);
  });

  it("with company sign-in, is a new round trip that makes the provider ask again, and signs exactly once", async () => {
    const asked = await review(cookies.checker!, { intent: "approve", step: "basis", confirm: "sso", comment: "Checked against the G-1 paper." });
    expect(asked.status).toBe(302);
    const authorize = new URL(asked.headers.get("Location")!);
    expect(authorize.origin).toBe(provider.issuer);
    expect(authorize.searchParams.get("prompt")).toBe("login");
    expect(authorize.searchParams.get("max_age")).toBe("0");
    expect(authorize.searchParams.get("nonce")).toMatch(/^[0-9a-f]{64}$/);
    // The provider still holds the checker's sign-in of a moment ago, yet asks for the password again.
    const { callback, asked: providerAsked } = await atProvider(authorize.toString(), checkerIdp, demoUser("checker").password);
    expect(providerAsked).toBe(true);
    const cookie = cookiesOf(asked.headers, cookies.checker);
    const done = await run(ssoCallback, { request: request(`${callback.pathname}${callback.search}`, { cookie }) });
    expect(done.status).toBe(302);
    expect(done.headers.get("Location")).toBe(`/cases/${caseId}/review?signature=signed`);
    const sigs = await checks();
    expect(sigs).toMatchObject([{ step: "basis", meaning: "checked", confirmedBy: "sso", signerName: "Marek Oduya" }]);
    // The same answer again signs nothing more: the code and the request are used up.
    const again = await run(ssoCallback, { request: request(`${callback.pathname}${callback.search}`, { cookie }) });
    expect(again.headers.get("Location")).toMatch(/signature=expired/);
    expect(await checks()).toHaveLength(1);
  });

  it("refuses an answer that is not a fresh authentication, not for this request, or not for this session, and audits it", async () => {
    const current = await currentOf(cookies.checker!);
    const [linked] = await db.select().from(users).where(eq(users.id, current.user.id));
    const begin = async () => {
      const { url } = await beginSsoSignature(current, { intent: "approve", caseId, step: "planform" });
      const [req] = await db.select().from(signingRequests).where(eq(signingRequests.userId, current.user.id)).orderBy(desc(signingRequests.createdAt)).limit(1);
      return { nonce: new URL(url).searchParams.get("nonce")!, requestId: req!.id, at: Math.floor(req!.createdAt.getTime() / 1000) };
    };
    const flowOf = (b: { nonce: string; requestId: string }) => ({ kind: "signature" as const, state: "s", codeVerifier: "v", ...b });
    const identity = (authTime: number | null) => ({ sub: linked!.ssoSubject!, email: current.user.email, authTime });

    const stale = await begin();
    // The provider answered from its old session (auth_time an hour before the request).
    expect((await completeSsoSignature(current, flowOf(stale), identity(stale.at - 3600))).outcome).toBe("not-fresh");
    const noTime = await begin();
    expect((await completeSsoSignature(current, flowOf(noTime), identity(null))).outcome).toBe("not-fresh");
    const other = await begin();
    expect((await completeSsoSignature(current, flowOf({ ...other, nonce: "f".repeat(64) }), identity(other.at))).outcome).toBe("mismatch");
    const someoneElse = await begin();
    expect((await completeSsoSignature(current, flowOf(someoneElse), { ...identity(someoneElse.at), sub: "user-somebody-else" })).outcome).toBe("mismatch");
    // Another session of the same person cannot complete it.
    const elsewhere = await begin();
    const otherSession = await currentOf(await cookieFor("checker"));
    expect((await completeSsoSignature(otherSession, flowOf(elsewhere), identity(elsewhere.at))).outcome).toBe("expired");

    expect((await stepStatus("planform")).status).toBe("submitted");
    expect(await checks("planform")).toHaveLength(0);
    const refusals = await db.select().from(auditLog).where(and(eq(auditLog.entityId, caseId), eq(auditLog.action, "auth.signature.sso-refused")));
    expect(refusals.length).toBeGreaterThanOrEqual(4);
  });

  it("signs only what the person was shown: a step changed during the round trip is not signed", async () => {
    const current = await currentOf(cookies.checker!);
    const [linked] = await db.select().from(users).where(eq(users.id, current.user.id));
    const { url } = await beginSsoSignature(current, { intent: "approve", caseId, step: "planform" });
    const [req] = await db.select().from(signingRequests).where(eq(signingRequests.userId, current.user.id)).orderBy(desc(signingRequests.createdAt)).limit(1);
    // Meanwhile the step is returned, edited and submitted again. (Planform: the next step in the
    // order of approval, so that the only reason to refuse is the change.)
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    await returnStep({ caseId, step: "planform", actor: current.user, comment: "Move the reference axis." });
    const row = await stepStatus("planform");
    const edited = structuredClone(row.data!) as { axisRoot: number };
    edited.axisRoot -= 0.01;
    await saveStep({ caseId, step: "planform", baseRevision: row.revision, data: edited, actor: { id: erin!.id, email: erin!.email } });
    expect((await review(cookies.engineer!, { intent: "submit", step: "planform", password: demoUser("engineer").password })).status).toBe(200);
    const at = Math.floor(req!.createdAt.getTime() / 1000);
    const done = await completeSsoSignature(current, { kind: "signature", state: "s", codeVerifier: "v", nonce: new URL(url).searchParams.get("nonce")!, requestId: req!.id }, { sub: linked!.ssoSubject!, email: current.user.email, authTime: at });
    expect(done.outcome).toBe("changed");
    expect(await checks("planform")).toHaveLength(0);
  });

  it("by password, cannot be guessed: wrong passwords are held back with growing delays, each one audited, and nothing is signed", async () => {
    const before = await db.select().from(auditLog).where(eq(auditLog.action, "auth.signature.password-refused"));
    const answers: number[] = [];
    for (let i = 0; i < 12 && !answers.includes(429); i++) answers.push((await review(cookies.checker!, { intent: "approve", step: "planform", password: `guess-${i}` })).status);
    expect(answers.at(-1)).toBe(429);
    expect(answers.slice(0, -1).every((s) => s === 401)).toBe(true);
    expect(answers.length).toBeGreaterThanOrEqual(5);
    // Held back: even the right password waits now.
    const held = await review(cookies.checker!, { intent: "approve", step: "planform", password: demoUser("checker").password });
    expect(held.status).toBe(429);
    expect((held.body as { message: string }).message).toMatch(/Too many wrong passwords/);
    const after = await db.select().from(auditLog).where(and(eq(auditLog.action, "auth.signature.password-refused"), eq(auditLog.actorEmail, demoUser("checker").email)));
    expect(after.length - before.length).toBe(answers.length - 1);
    expect(after.at(-1)!.after).toMatchObject({ what: "check the planform step", address: "127.0.0.1" });
    expect(await checks("planform")).toHaveLength(0);
  });
});
