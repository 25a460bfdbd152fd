import { and, eq, inArray, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, reports } from "~/db/schema";
import { ISSUED_REPORT_STATUSES } from "~/domain/vocabulary";
import { stopBoss } from "~/jobs/boss.server";
import { loader as reportsLoader } from "~/routes/cases/reports";
import { cookieFor, request, rowTextOf, run, seed } from "./helpers";

// The reports page lists the case's reports and, from a second issued version on, what changed
// between the two newest: it reads their snapshots (input and result of each version) only then.

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed({ report: true });
  const [c] = await db.select({ id: cases.id }).from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  cookie = await cookieFor("engineer");
}, 240_000);
afterAll(stopBoss);

describe("the reports page of a case with one issued report", () => {
  it("lists it without reading its snapshot", async () => {
    const [stored] = await db
      .select({ size: sql<number>`length(${reports.snapshot}::text)` })
      .from(reports)
      .where(and(eq(reports.caseId, caseId), inArray(reports.status, [...ISSUED_REPORT_STATUSES])));
    let page: { status: number; body: unknown } | undefined;
    const received = await rowTextOf(async () => {
      page = await run(reportsLoader as never, { request: request(`/cases/${caseId}/reports`, { cookie }), params: { caseId } });
    });
    expect(page!.status).toBe(200);
    const body = page!.body as { reports: unknown[]; diff: unknown };
    expect(body.reports).toHaveLength(1);
    expect(body.diff).toBeNull();
    // Before: every issued version's snapshot on every request, though a change list needs two.
    expect(received).toBeLessThan(stored!.size / 10);
  });
});
