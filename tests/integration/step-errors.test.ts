import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases } from "~/db/schema";
import { startHttpApp, type HttpApp } from "./http-harness";
import { cookieFor, seed } from "./helpers";

// Each step page has its own error boundary: a refusal of the step is said inside the case frame
// (case header and step rail), and a case that cannot be shown is said by the case layout, inside
// the signed-in shell; neither falls through to the bare root page.

let app: HttpApp;
let caseId = "";

beforeAll(async () => {
  await seed();
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  app = await startHttpApp();
});
afterAll(async () => app?.close());

/** The visible text of a page, tags stripped, so a test reads what the person reads. */
const textOf = (html: string) => html.replace(/<script[\s\S]*?<\/script>/g, " ").replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

describe("errors of a case step page", () => {
  it("says a refused step inside the case frame: header and step rail stay, the status and the reason are given", async () => {
    // The administrator may read the case (case:read) but not its reports (report:read).
    const res = await app.get(`/cases/${caseId}/reports`, { Cookie: await cookieFor("admin") });
    expect(res.status).toBe(403);
    const text = textOf(await res.text());
    expect(text).toContain("TN-WL-001");
    expect(text).toContain("Wing loads, initial type certificate");
    expect(text).toMatch(/Overview 1 \. Basis .* 2 \. Planform/);
    expect(text).toContain("Not allowed");
    expect(text).toContain("does not allow this (needs report:read)");
    expect(text).toContain("Status 403");
  });

  it("answers another organisation's case with 404 inside the signed-in shell, naming nothing of the case", async () => {
    const res = await app.get(`/cases/${caseId}/basis`, { Cookie: await cookieFor("outsider") });
    expect(res.status).toBe(404);
    const text = textOf(await res.text());
    expect(text).toContain("Not found");
    expect(text).toContain("Case was not found, or you have no access to it.");
    expect(text).toContain("Status 404");
    expect(text).toContain("Northmoor Aerostructures");
    expect(text).not.toContain("TN-WL-001");
    expect(text).not.toContain("Wing loads, initial type certificate");
  });
});
