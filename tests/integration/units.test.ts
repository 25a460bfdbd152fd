import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, caseSteps } from "~/db/schema";
import { action as basisAction, loader as basisLoader } from "~/routes/cases/basis";
import { cookieFor, form, request, run, seed } from "./helpers";

let caseId = "";
let cookie = "";

beforeAll(async () => {
  await seed();
  cookie = await cookieFor("engineer");
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = c!.id;
});

describe("US customary display, SI storage", () => {
  it("stores a basis typed in lb, kt and ft² in SI, and shows it back as typed", async () => {
    // Exact unit definitions (REFERENCES.md §8): 1 lb = 0.45359237 kg, 1 kt = 1852/3600 m/s, 1 ft = 0.3048 m.
    const res = await run(basisAction, {
      request: request(`/cases/${caseId}/basis`, {
        method: "POST",
        cookie,
        body: form({
          revision: "0",
          units: "US",
          category: "part23-normal",
          regulations: "14 CFR 23.337",
          mtow: "14000",
          mzfw: "13000",
          minWeight: "9500",
          vs1: "82",
          va: "150",
          vc: "214",
          vd: "292",
          altitudes: "0, 10000, 20000",
          wingArea: "297",
          clMax: "1.45",
          clMaxNegative: "-0.9",
        }),
      }),
      params: { caseId },
    });
    expect(res.status).toBe(200);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
    const b = row!.data as Record<string, number | number[]>;
    expect(b.mtow).toBeCloseTo(14000 * 0.45359237, 9);
    expect(b.vc).toBeCloseTo(214 * (1852 / 3600), 9);
    expect(b.wingArea).toBeCloseTo(297 * 0.3048 ** 2, 9);
    expect(b.altitudes).toEqual([0, 10000 * 0.3048, 20000 * 0.3048].map((v) => expect.closeTo(v, 9)));
    const shown = await run(basisLoader, { request: request(`/cases/${caseId}/basis`, { cookie }), params: { caseId } });
    expect((shown.body as { values: Record<string, unknown> }).values).toMatchObject({ mtow: 14000, vc: 214, wingArea: 297, altitudes: "0, 10000, 20000" });
  });
});
