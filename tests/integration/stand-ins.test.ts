import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { action as membersAction } from "~/routes/admin/members";
import { loader as mailboxLoader } from "~/routes/dev/mailbox";
import { resetEnvCache } from "~/utils/env.server";
import { cookieFor, form, request, run, seed } from "./helpers";

/**
 * The local stand-ins of `npm start` let nobody in (issue 9, item 1): the mailbox shows mail only
 * to a signed-in person, only their own (an administrator also their organisation's), and only in
 * local mode. (The sign-in stand-in's own credential is tested in services.test.ts; signatures
 * needing a fresh proof in signing.test.ts.)
 */

const invited = `mailbox.probe.${Date.now()}@kelvard-fenlow.example`;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  await seed();
  for (const who of ["engineer", "admin", "outsider"] as const) cookies[who] = await cookieFor(who);
  const res = await run(membersAction, { request: request("/admin", { method: "POST", cookie: cookies.admin, body: form({ intent: "invite", email: invited, roles: ["engineer"] }) }) });
  expect(res.status).toBe(200);
});

const saved = { origin: process.env.APP_ORIGIN, dir: process.env.MAIL_CAPTURE_DIR };
afterEach(() => {
  process.env.APP_ORIGIN = saved.origin;
  process.env.MAIL_CAPTURE_DIR = saved.dir;
  resetEnvCache();
});

type Box = { messages: { subject: string; to: string[]; text: string }[]; selected: { text: string } | null };
const open = (who: string | undefined, query = "") => run(mailboxLoader, { request: request(`/dev/mailbox${query}`, { cookie: who ? cookies[who] : undefined }) });

describe("the local mailbox", () => {
  it("sends a visitor without a session to sign in, showing no mail, whatever address is asked for", async () => {
    const res = await open(undefined, `?to=${encodeURIComponent(invited)}`);
    expect(res.status).toBe(302);
    expect(res.headers.get("Location")).toMatch(/^\/login\?/);
    expect(res.body).toBeNull();
  });

  it("shows a person only their own mail: an engineer cannot read an invitation to someone else", async () => {
    const res = await open("engineer", `?to=${encodeURIComponent(invited)}`);
    expect(res.status).toBe(200);
    const box = res.body as Box;
    expect(box.messages).toEqual([]);
    expect(box.selected).toBeNull();
    const all = (await open("engineer")).body as Box;
    expect(all.messages.every((m) => m.to.includes("erin.hale@kelvard-fenlow.example"))).toBe(true);
  });

  it("shows an administrator their organisation's mail, the invitation with its link included", async () => {
    const box = (await open("admin", `?to=${encodeURIComponent(invited)}`)).body as Box;
    expect(box.messages.map((m) => m.subject)).toEqual([expect.stringContaining("invited to Kelvard Fenlow Aircraft")]);
    expect(box.selected!.text).toMatch(/\/invite\/[a-z2-7]+/);
  });

  it("shows another organisation's administrator none of it", async () => {
    const box = (await open("outsider", `?to=${encodeURIComponent(invited)}`)).body as Box;
    expect(box.messages).toEqual([]);
  });

  it("does not exist outside local mode: with a real relay, or on an address others reach", async () => {
    process.env.MAIL_CAPTURE_DIR = "";
    resetEnvCache();
    expect((await open("admin")).status).toBe(404);
    process.env.MAIL_CAPTURE_DIR = saved.dir;
    process.env.APP_ORIGIN = "https://spanwright.kelvard-fenlow.example";
    resetEnvCache();
    expect((await open("admin")).status).toBe(404);
  });
});
