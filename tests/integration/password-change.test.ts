import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { signInWithPassword } from "~/auth/auth.server";
import { readSession } from "~/auth/session.server";
import { db } from "~/db/client.server";
import { auditLog, sessions, users } from "~/db/schema";
import { action as accountAction } from "~/routes/account";
import { cookieFor, demoUser, form, request, run, seed } from "./helpers";

/*
 * Issue 9, item 12: a person changes their own password, after their current one, and every other
 * session of theirs ends (whoever signed in elsewhere with the old password is signed out).
 */

const quality = demoUser("quality");
const change = (cookie: string, fields: Record<string, string>) => run(accountAction, { request: request("/account", { method: "POST", cookie, body: form(fields) }) });
const valid = async (cookie: string) => (await readSession(request("/account", { cookie }))).status === "valid";

beforeAll(async () => {
  await seed();
});

describe("changing one's own password", () => {
  it("needs the current password, refuses a weak or mistyped new one, and changes nothing then", async () => {
    const here = await cookieFor("quality");
    const [before] = await db.select().from(users).where(eq(users.email, quality.email));
    const wrong = await change(here, { current: "not-the-password", password: "a-brand-new-secret-2026", confirm: "a-brand-new-secret-2026" });
    expect(wrong.status).toBe(401);
    expect((wrong.body as { fieldErrors: Record<string, string[]> }).fieldErrors.current?.[0]).toMatch(/not correct/);
    const short = await change(here, { current: quality.password, password: "short", confirm: "short" });
    expect(short.status).toBe(400);
    expect((short.body as { fieldErrors: Record<string, string[]> }).fieldErrors.password?.[0]).toMatch(/at least 12/);
    const differ = await change(here, { current: quality.password, password: "a-brand-new-secret-2026", confirm: "a-brand-new-secret-2027" });
    expect((differ.body as { fieldErrors: Record<string, string[]> }).fieldErrors.confirm?.[0]).toMatch(/differ/);
    const [after] = await db.select().from(users).where(eq(users.email, quality.email));
    expect(after!.passwordHash).toBe(before!.passwordHash);
    const refused = await db.select().from(auditLog).where(eq(auditLog.action, "auth.password-change.password-refused"));
    expect(refused.map((r) => r.actorEmail)).toEqual([quality.email]);
  });

  it("changes it and ends every other session of the person, keeping this one", async () => {
    const here = await cookieFor("quality");
    const elsewhere = await cookieFor("quality");
    const other = await cookieFor("checker");
    const res = await change(here, { current: quality.password, password: "a-brand-new-secret-2026", confirm: "a-brand-new-secret-2026" });
    expect(res.status).toBe(200);
    expect((res.body as { message: string }).message).toMatch(/Signed out of [1-9]\d* other session/);
    expect(await valid(here)).toBe(true);
    expect(await valid(elsewhere)).toBe(false);
    expect(await valid(other)).toBe(true);
    const [u] = await db.select().from(users).where(eq(users.email, quality.email));
    expect(await db.select().from(sessions).where(eq(sessions.userId, u!.id))).toHaveLength(1);
    expect((await signInWithPassword({ email: quality.email, password: quality.password, address: "10.9.0.1", userAgent: "vitest" })).ok).toBe(false);
    expect((await signInWithPassword({ email: quality.email, password: "a-brand-new-secret-2026", address: "10.9.0.1", userAgent: "vitest" })).ok).toBe(true);
    const [entry] = await db.select().from(auditLog).where(eq(auditLog.action, "auth.password-change"));
    expect(entry).toMatchObject({ actorEmail: quality.email, after: { otherSessionsEnded: expect.any(Number) } });
  });
});
