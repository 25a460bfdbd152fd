import fs from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { programmes, users } from "~/db/schema";
import * as exchange from "~/exchange";
import type { CaseFileInput, SectionsFile } from "~/exchange";
import { stopBoss } from "~/jobs/boss.server";
import { loader as spanwiseLoader } from "~/routes/api/case-spanwise-methods";
import { importCase } from "~/services/case-import.server";
import { cookieFor, demoUser, request, routeArgs, seed } from "./helpers";

// The wing the comparison solves is built by the exchange's caseWingModel: watched here for the
// richer section data it is given.
vi.mock("~/exchange", async (importOriginal) => {
  const actual = await importOriginal<typeof exchange>();
  return { ...actual, caseWingModel: vi.fn(actual.caseWingModel) };
});

let caseId = "";
let cookie = "";
const CP_MIN_TABLE = [
  { cl: 0, cpMin: -0.4 },
  { cl: 0.5, cpMin: -0.7 },
  { cl: 1.2, cpMin: -1.6 },
];

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const document = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput;
  const stations = (document.wing as { stations: { y: number }[] }).stations;
  // Cp,min against lift at every wing station (invented values), as spanwright.sections/1 carries them.
  const sections: SectionsFile = { schema: "spanwright.sections/1", sections: stations.map((s) => ({ y: s.y, cpMinTable: CP_MIN_TABLE })) } as SectionsFile;
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  caseId = (await importCase({ organisationId: p!.organisationId, programmeId: p!.id, reference: "SPAN-SEC", title: "Spanwise methods with section data", document, sections, actor: { id: erin!.id, email: erin!.email } })).id;
}, 120_000);

afterAll(async () => {
  await stopBoss();
});

describe("the distribution page's comparison of spanwise methods", () => {
  it("solves the wing with the case's richer section data, as the case's own results do", async () => {
    const first = (JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as CaseFileInput).cases[0]!.id;
    vi.mocked(exchange.caseWingModel).mockClear();
    const res = (await spanwiseLoader((await routeArgs(request(`/api/cases/${caseId}/spanwise-methods?case=${first}`, { cookie }), { caseId })) as never)) as Response;
    expect(res.status).toBe(200);
    const calls = vi.mocked(exchange.caseWingModel).mock.calls;
    expect(calls.length).toBeGreaterThan(0);
    for (const [, , sections] of calls) expect(sections?.sections.some((s) => s.cpMinTable?.length === CP_MIN_TABLE.length)).toBe(true);
  });
});
