import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, programmes } from "~/db/schema";
import { loader as adminLoader } from "~/routes/admin/members";
import { loader as auditLoader } from "~/routes/audit";
import { loader as caseLoader } from "~/routes/cases/overview";
import { action as newCaseAction, loader as newCaseLoader } from "~/routes/cases/new";
import { loader as checksLoader } from "~/routes/checks";
import { loader as programmeLoader } from "~/routes/programmes/detail";
import { action as programmesAction } from "~/routes/programmes/list";
import { loader as casesLoader } from "~/routes/cases/list";
import { cookieFor, form, request, run, seed } from "./helpers";

let kelvardProgrammeId = "";
let kelvardCaseId = "";
let northmoorCaseId = "";

beforeAll(async () => {
  await seed();
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  kelvardProgrammeId = p!.id;
  const [c] = await db.select().from(cases).where(and(eq(cases.programmeId, p!.id), eq(cases.reference, "TN-WL-001")));
  kelvardCaseId = c!.id;
  const [n] = await db.select().from(cases).where(eq(cases.reference, "SK-L-07"));
  northmoorCaseId = n!.id;
});

describe("organisation isolation", () => {
  it("answers another organisation's programme and case by URL with 404 and no data", async () => {
    const cookie = await cookieFor("outsider");
    const p = await run(programmeLoader, { request: request(`/programmes/${kelvardProgrammeId}`, { cookie }), params: { programmeId: kelvardProgrammeId } });
    expect(p.status).toBe(404);
    expect(JSON.stringify(p.body)).not.toContain("KF-60");
    const c = await run(caseLoader, { request: request(`/cases/${kelvardCaseId}`, { cookie }), params: { caseId: kelvardCaseId } });
    expect(c.status).toBe(404);
    expect(JSON.stringify(c.body)).not.toContain("TN-WL-001");
  });

  it("lists only the person's own organisation's cases", async () => {
    const kelvard = await run(casesLoader, { request: request("/cases", { cookie: await cookieFor("engineer") }) });
    const refs = (kelvard.body as { cases: { reference: string }[] }).cases.map((c) => c.reference);
    expect(refs).toContain("TN-WL-001");
    expect(refs).not.toContain("SK-L-07");
    const mine = await run(caseLoader, { request: request(`/cases/${northmoorCaseId}`, { cookie: await cookieFor("outsider") }), params: { caseId: northmoorCaseId } });
    expect(mine.status).toBe(200);
  });

  it("treats a malformed id as not found rather than a server error", async () => {
    const res = await run(caseLoader, { request: request("/cases/not-a-uuid", { cookie: await cookieFor("engineer") }), params: { caseId: "not-a-uuid" } });
    expect(res.status).toBe(404);
  });

  it("refuses a case created under another organisation's programme", async () => {
    const cookie = await cookieFor("outsider");
    const before = (await db.select().from(cases)).length;
    const res = await run(newCaseAction, {
      request: request("/cases/new", { method: "POST", cookie, body: form({ programmeId: kelvardProgrammeId, reference: "X-1", title: "Intrusion" }) }),
    });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors.programmeId).toBeDefined();
    expect((await db.select().from(cases)).length).toBe(before);
  });
});

describe("roles", () => {
  it("sends anonymous visitors to sign in", async () => {
    const res = await run(casesLoader, { request: request("/cases") });
    expect(res.status).toBe(302);
    expect(res.headers.get("Location")).toBe("/login?redirectTo=%2Fcases");
  });

  it.each([
    ["checker", newCaseLoader, "/cases/new"],
    ["quality", newCaseLoader, "/cases/new"],
    ["engineer", adminLoader, "/admin"],
    ["checker", adminLoader, "/admin"],
    ["engineer", checksLoader, "/checks"],
    ["engineer", auditLoader, "/audit"],
    ["checker", auditLoader, "/audit"],
  ] as const)("refuses the %s on %s with 403", async (label, loader, path) => {
    const res = await run(loader, { request: request(path, { cookie: await cookieFor(label) }) });
    expect(res.status).toBe(403);
  });

  it.each([
    ["engineer", newCaseLoader, "/cases/new"],
    ["admin", adminLoader, "/admin"],
    ["checker", checksLoader, "/checks"],
    ["quality", auditLoader, "/audit"],
  ] as const)("lets the %s use %s", async (label, loader, path) => {
    const res = await run(loader, { request: request(path, { cookie: await cookieFor(label) }) });
    expect(res.status).toBe(200);
  });

  it("lets only administrators create programmes", async () => {
    const body = () => form({ code: "KF80", name: "KF-80 study", aircraft: "KF-80", description: "" });
    const engineer = await run(programmesAction, { request: request("/programmes", { method: "POST", cookie: await cookieFor("engineer"), body: body() }) });
    expect(engineer.status).toBe(403);
    const admin = await run(programmesAction, { request: request("/programmes", { method: "POST", cookie: await cookieFor("admin"), body: body() }) });
    expect(admin.status).toBe(200);
    expect(await db.select().from(programmes).where(eq(programmes.code, "KF80"))).toHaveLength(1);
  });
});
