import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, caseSteps } from "~/db/schema";
import { DEMO_CASE_INPUTS } from "~/demo/scenario";
import { action as basisAction, loader as basisLoader } from "~/routes/cases/basis";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { action as planformAction } from "~/routes/cases/planform";
import { action as sectionsAction } from "~/routes/cases/sections";
import { cookieFor, demoPlanformFields, demoSectionsFields, form, request, run, seed } from "./helpers";

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

describe("text stored with a generated case carries no unit, so it reads alike in either system", () => {
  // A quantity with a unit of either system ("52.3 m/s", "3200 kg", "6001 ft", "120 kt").
  const UNIT_NUMBER = /\d\s?(m|m\/s|kg|ft|lb|kt|N|lbf)\b/;

  it("generates the cases of a basis kept in US customary units with rule texts free of unit-bearing numbers, and the basis checks lead with psf", async () => {
    const d = DEMO_CASE_INPUTS;
    const post = (path: string, fields: Record<string, string>) => request(path, { method: "POST", cookie, body: form(fields) });
    expect((await run(planformAction, { request: post(`/cases/${caseId}/planform`, demoPlanformFields()), params: { caseId } })).status).toBe(200);
    expect((await run(sectionsAction, { request: post(`/cases/${caseId}/sections`, demoSectionsFields("0")), params: { caseId } })).status).toBe(200);
    const [basisRow] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
    // The demo basis typed in US units (1 lb = 0.45359237 kg, 1 kt = 1852/3600 m/s, 1 ft = 0.3048 m: NIST SP 811).
    const b = d.basis;
    const lb = (kg: number) => String(kg / 0.45359237);
    const kt = (ms: number) => String(ms / (1852 / 3600));
    const res = await run(basisAction, {
      request: post(`/cases/${caseId}/basis`, {
        revision: String(basisRow?.revision ?? 0),
        units: "US",
        category: b.category,
        regulations: b.regulations,
        mtow: lb(b.mtow),
        mzfw: lb(b.mzfw),
        minWeight: lb(b.minWeight),
        vs1: kt(b.vs1),
        va: kt(b.va),
        vb: kt(b.vb),
        vc: kt(b.vc),
        vd: kt(b.vd),
        altitudes: b.altitudes.map((h) => String(h / 0.3048)).join(", "),
        wingArea: String(b.wingArea / 0.3048 ** 2),
        clMax: String(b.clMax),
        clMaxNegative: String(b.clMaxNegative),
      }),
      params: { caseId },
    });
    expect(res.status).toBe(200);
    const page = await run(basisLoader, { request: request(`/cases/${caseId}/basis`, { cookie }), params: { caseId } });
    const loading = (page.body as { derived: { label: string; value: string }[] }).derived.find((r) => r.label === "Wing loading at MTOW")!;
    // W/S in lbf/ft² first (1 lbf/ft² = 47.88026 Pa, NIST SP 811 B.8), SI beside it.
    const psf = (b.mtow * 9.80665) / b.wingArea / 47.880259;
    expect(loading.value).toBe(`${psf.toFixed(1)} psf (${((b.mtow * 9.80665) / b.wingArea).toFixed(0)} N/m²)`);

    const env = await run(envelopeAction, { request: post(`/cases/${caseId}/envelope`, { intent: "generate", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "24" }), params: { caseId } });
    expect(env.status).toBe(200);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const generated = (row!.data as { cases: { id: string; rule: string }[] }).cases;
    expect(generated.length).toBeGreaterThan(10);
    expect(generated.filter((c) => UNIT_NUMBER.test(c.rule)).map((c) => `${c.id}: ${c.rule}`)).toEqual([]);
    // Each still names its paragraph and its weight.
    expect(generated.every((c) => /14 CFR 2[35]\.\d{3}/.test(c.rule) && / — /.test(c.rule))).toBe(true);
  });
});
