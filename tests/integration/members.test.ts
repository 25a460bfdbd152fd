import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { listCapturedMail } from "~/server/dev-services/mail";
import { db } from "~/db/client.server";
import { auditLog, invitations, memberships, users } from "~/db/schema";
import { action as membersAction } from "~/routes/admin/members";
import { action as inviteAction, loader as inviteLoader } from "~/routes/auth/invite";
import { cookieFor, demoUser, form, request, run, seed } from "./helpers";

beforeAll(async () => {
  await seed();
});

describe("invitations", () => {
  it("e-mails a one-time link that creates the account with the invited roles", async () => {
    const email = `new.checker.${Date.now()}@kelvard-fenlow.example`;
    const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: await cookieFor("admin"), body: form({ intent: "invite", email, roles: ["checker", "quality"] }) }) });
    expect(res.status).toBe(200);
    const [stored] = await db.select().from(invitations).where(eq(invitations.email, email));
    const mail = (await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: email }))[0];
    expect(mail?.subject).toContain("Kelvard Fenlow Aircraft");
    expect(mail?.html).toContain("<a href=");
    const token = /\/invite\/([a-z2-7]+)/.exec(mail!.text ?? "")![1]!;
    expect(stored!.tokenHash).not.toBe(token);

    const shown = await run(inviteLoader, { request: request(`/invite/${token}`), params: { token } });
    expect(shown.body).toMatchObject({ email, accountExists: false });

    const weak = await run(inviteAction, { request: request(`/invite/${token}`, { method: "POST", body: form({ name: "New Checker", password: "short", confirm: "short" }) }), params: { token } });
    expect(weak.status).toBe(400);
    expect((weak.body as { fieldErrors: Record<string, string[]> }).fieldErrors.password?.[0]).toMatch(/12 characters/);
    expect(await db.select().from(users).where(eq(users.email, email))).toHaveLength(0);

    const ok = await run(inviteAction, { request: request(`/invite/${token}`, { method: "POST", body: form({ name: "New Checker", password: "a-long-enough-secret", confirm: "a-long-enough-secret" }) }), params: { token } });
    expect(ok.status).toBe(302);
    expect(ok.headers.get("Location")).toBe("/checks");
    const [user] = await db.select().from(users).where(eq(users.email, email));
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, user!.id));
    expect(m!.roles.sort()).toEqual(["checker", "quality"]);

    const reused = await run(inviteLoader, { request: request(`/invite/${token}`), params: { token } });
    expect(reused.status).toBe(404);
  });

  it("refuses an invitation with no role, naming the field, and writes nothing", async () => {
    const before = (await db.select().from(invitations)).length;
    const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: await cookieFor("admin"), body: form({ intent: "invite", email: "x@kelvard-fenlow.example" }) }) });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors.roles).toBeDefined();
    expect((await db.select().from(invitations)).length).toBe(before);
  });

  it("keeps at least one administrator", async () => {
    const [admin] = await db.select().from(users).where(eq(users.email, demoUser("admin").email));
    const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: await cookieFor("admin"), body: form({ intent: "set-roles", userId: admin!.id, roles: ["engineer"] }) }) });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors.roles?.[0]).toMatch(/at least one administrator/);
  });

  it("does not let an administrator change another organisation's member", async () => {
    const [outsider] = await db.select().from(users).where(eq(users.email, demoUser("outsider").email));
    const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: await cookieFor("admin"), body: form({ intent: "set-roles", userId: outsider!.id, roles: ["checker"] }) }) });
    expect(res.status).toBe(404);
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, outsider!.id));
    expect(m!.roles).toEqual(["engineer", "admin"]);
  });
  it("throttles and audits guesses at an existing account's password through an invitation link (issue 9, item 7)", async () => {
    // Northmoor invites Marek, who already has an account: whoever holds the link must give his password.
    const email = demoUser("checker").email;
    const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: await cookieFor("outsider"), body: form({ intent: "invite", email, roles: ["checker"] }) }) });
    expect(res.status).toBe(200);
    const mail = (await listCapturedMail(process.env.MAIL_CAPTURE_DIR!, { to: email })).find((m) => m.subject.includes("Northmoor"));
    const token = /\/invite\/([a-z2-7]+)/.exec(mail!.text ?? "")![1]!;
    const [inv] = await db.select().from(invitations).where(eq(invitations.email, email));
    const guess = (password: string) => run(inviteAction, { request: request(`/invite/${token}`, { method: "POST", body: form({ password }) }), params: { token } });
    const answers: number[] = [];
    for (let i = 0; i < 12 && !answers.includes(429); i++) answers.push((await guess(`guess-${i}`)).status);
    expect(answers.at(-1)).toBe(429);
    expect(answers.slice(0, -1).every((s) => s === 401)).toBe(true);
    // Held back now, even with the right password; the invitation is still open and nothing joined.
    expect((await guess(demoUser("checker").password)).status).toBe(429);
    const [marek] = await db.select().from(users).where(eq(users.email, email));
    expect(await db.select().from(memberships).where(and(eq(memberships.userId, marek!.id), eq(memberships.organisationId, inv!.organisationId)))).toHaveLength(0);
    const refused = await db.select().from(auditLog).where(and(eq(auditLog.action, "auth.invitation.password-refused"), eq(auditLog.entityId, inv!.id)));
    expect(refused).toHaveLength(answers.length - 1);
    expect(refused.every((r) => r.organisationId === inv!.organisationId && r.actorEmail === email)).toBe(true);
  });
});
