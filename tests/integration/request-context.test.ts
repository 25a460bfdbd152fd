import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { requireUser } from "~/auth/auth.server";
import { requireCase } from "~/auth/case-access.server";
import { db } from "~/db/client.server";
import { cases, sessions } from "~/db/schema";
import { startHttpApp, type HttpApp } from "./http-harness";
import { cookieFor, request, scopeOf, seed } from "./helpers";

// What the root middleware (auth/request-context.server.ts) promises: the loaders of one reading
// request share one read of the session, the case and its steps; a writing request reads afresh,
// because its loaders run after its action and must show what it changed.

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  cookie = await cookieFor("engineer");
});

const retitle = (title: string) => db.update(cases).set({ title }).where(eq(cases.id, caseId));

describe("reads shared through the request's context", () => {
  it("reads the case and its steps once per reading request, whoever asks, and afresh in the next request", async () => {
    await retitle("Before");
    const scope = await scopeOf(request(`/cases/${caseId}/basis`, { cookie }));
    const first = await requireCase(scope, caseId, "case:read");
    const steps = await first.readSteps();
    await retitle("After");
    const second = await requireCase(scope, caseId, "case:read");
    expect(second.case.title).toBe("Before");
    expect(await second.readSteps()).toBe(steps);
    const next = await requireCase(await scopeOf(request(`/cases/${caseId}/basis`, { cookie })), caseId, "case:read");
    expect(next.case.title).toBe("After");
  });

  it("gives the steps' states without their data, from the request's whole read of the steps when a loader made it", async () => {
    const scope = await scopeOf(request(`/cases/${caseId}/basis`, { cookie }));
    const page = await requireCase(scope, caseId, "case:read");
    const whole = await page.readSteps();
    expect(await page.readStepStates()).toBe(whole);
    const alone = await requireCase(await scopeOf(request(`/cases/${caseId}`, { cookie })), caseId, "case:read");
    const states = await alone.readStepStates();
    expect(states.basis).not.toHaveProperty("data");
    expect({ status: states.basis.status, revision: states.basis.revision }).toEqual({ status: whole.basis.status, revision: whole.basis.revision });
  });

  it("reads afresh each time in a writing request", async () => {
    await retitle("Before");
    const scope = await scopeOf(request(`/cases/${caseId}/basis`, { method: "POST", cookie, body: new FormData() }));
    expect((await requireCase(scope, caseId, "case:read")).case.title).toBe("Before");
    await retitle("After");
    expect((await requireCase(scope, caseId, "case:read")).case.title).toBe("After");
  });

  it("still checks the role and the organisation on every call, though the session is read once", async () => {
    const scope = await scopeOf(request(`/cases/${caseId}`, { cookie: await cookieFor("outsider") }));
    const refused = await requireCase(scope, caseId, "case:read").catch((e: unknown) => e);
    expect((refused as { init?: ResponseInit }).init?.status).toBe(404);
    const viewer = await scopeOf(request(`/cases/${caseId}`, { cookie: await cookieFor("quality") }));
    const forbidden = await requireCase(viewer, caseId, "case:edit").catch((e: unknown) => e);
    expect((forbidden as { init?: ResponseInit }).init?.status).toBe(403);
  });

  it("reads the session once per reading request: a session ended meanwhile counts from the next request", async () => {
    const own = await cookieFor("checker");
    const scope = await scopeOf(request("/cases", { cookie: own }));
    const current = await requireUser(scope);
    await db.delete(sessions).where(and(eq(sessions.id, current.sessionId), eq(sessions.userId, current.user.id)));
    expect((await requireUser(scope)).sessionId).toBe(current.sessionId);
    const later = await requireUser(await scopeOf(request("/cases", { cookie: own }))).catch((e: unknown) => e);
    expect((later as Response).status).toBe(302);
  });
});

describe("the web server", () => {
  let app: HttpApp;
  beforeAll(async () => {
    app = await startHttpApp();
  });
  afterAll(async () => app?.close());

  it("serves a case page whose loaders read through the context React Router gives each request", async () => {
    await retitle("Wing loads of the demo case");
    const res = await app.get(`/cases/${caseId}/basis`, { Cookie: cookie });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain("Wing loads of the demo case");
    expect(html).toContain("TN-WL-001");
  });
});
