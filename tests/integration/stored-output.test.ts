import fs from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, programmes, users } from "~/db/schema";
import { MAX_STORED_STATION_ROWS, type EnvelopeData } from "~/domain/step-data";
import { DomainError } from "~/domain/errors";
import type { CaseFileInput } from "~/exchange";
import { stopBoss } from "~/jobs/boss.server";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { importCase } from "~/services/case-import.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { cookieFor, demoUser, form, request, run, seed } from "./helpers";

// A stored result with station tables ("full") for every case of a large sweep would not fit one
// PostgreSQL jsonb value (at most 255 MB, PostgreSQL documentation, "JSON Types") nor one JavaScript
// string: before this rule a 100 000-case import in full was accepted and its sweep failed as it was
// stored ("RangeError: Invalid string length"), leaving the pages waiting.
const base = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
const sweep = (count: number, output: "full" | "summary"): CaseFileInput => ({
  ...base,
  method: { ...base.method, stations: 40, output },
  cases: Array.from({ length: count }, (_, i) => ({ id: `S${i + 1}`, mach: 0.3 + 0.05 * (i % 9), altitude: 1000 * (i % 5), weight: 60000, nz: -1 + (i % 45) / 10 })),
});
const OVER = Math.floor(MAX_STORED_STATION_ROWS / 40) + 1;

let programmeId = "";
let organisationId = "";
let actor = { id: "", email: "" };
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  programmeId = p!.id;
  organisationId = p!.organisationId;
  actor = { id: erin!.id, email: erin!.email };
}, 120_000);

afterAll(async () => {
  await stopBoss();
});

describe("full output is refused where the stored result could not hold it", () => {
  it("refuses the import naming method.output and its rule, and writes nothing", async () => {
    const before = (await db.select().from(cases)).length;
    const refusal = await importCase({ organisationId, programmeId, reference: "FULL-BIG", title: "Too big in full", document: sweep(OVER, "full"), actor }).catch((e: unknown) => e);
    expect(refusal).toBeInstanceOf(DomainError);
    const problems = (refusal as DomainError).problems ?? [];
    expect(problems.map((p) => p.path)).toContain("method.output");
    expect(problems.find((p) => p.path === "method.output")!.message).toMatch(/station rows.*choose summary output/);
    expect((await db.select().from(cases)).length).toBe(before);
  }, 120_000);

  it("imports the same sweep as a summary, and a method saved on the envelope page keeps it a summary", async () => {
    const { id: caseId } = await importCase({ organisationId, programmeId, reference: "SUMMARY-BIG", title: "Big as a summary", document: sweep(OVER, "summary"), actor });
    const stored = (await getCaseSteps(caseId)).envelope;
    expect((stored.data as unknown as EnvelopeData).output).toBe("summary");
    // Before: the page's method save rebuilt the step without its output, which fell back to "full".
    const saved = await run(envelopeAction, {
      request: request(`/cases/${caseId}/envelope`, { method: "POST", cookie, body: form({ intent: "method", revision: String(stored.revision), compressibility: "prandtl-glauert", spanwise: "lifting-line", stations: "40" }) }),
      params: { caseId },
    });
    expect(saved.status).toBe(200);
    const after = (await getCaseSteps(caseId)).envelope;
    expect(after.revision).toBe(stored.revision + 1);
    expect((after.data as unknown as EnvelopeData).output).toBe("summary");
    expect((after.data as unknown as EnvelopeData).compressibility).toBe("prandtl-glauert");
  }, 180_000);
});
