/**
 * Rolling conditions end to end: the sections step's aileron (refusals name the field and write nothing), the
 * rolling and unsymmetrical cases generated from a commuter basis and traced to 14 CFR 23.349 and 23.455, the
 * exported exchange document with wing.aileron and cases[].roll, the stored result with both sides of each rolling
 * case, and the envelope naming the case and side of each extreme. Paragraph values (75 % of the airload on the
 * other side in condition A, 2/3·n1, full deflection at VA and the same rate of roll at VC) are from memory [M];
 * the load factor is the formula of 14 CFR 23.337(a)(1), the equilibrium and strip-theory figures worked by hand.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { DEMO_CASE_INPUTS } from "~/demo/scenario";
import { cases, caseSteps } from "~/db/schema";
import { attributionOf, parseCase, runCase } from "~/exchange";
import { action as basisAction, loader as basisLoader } from "~/routes/cases/basis";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { action as planformAction } from "~/routes/cases/planform";
import { action as sectionsAction } from "~/routes/cases/sections";
import { exportCase, resultsFor } from "~/services/analysis.server";
import { stepsFromCaseFile } from "~/services/case-import.server";
import { cookieFor, demoBasisFields, demoPlanformFields, demoSectionsFields, form, request, run, seed, stepWriteCounts } from "./helpers";

const G0 = 9.80665;
const LB = 0.45359237;
let caseId = "";
let engineer = "";

const post = (path: string, fields: Record<string, string>) => request(path, { method: "POST", cookie: engineer, body: form(fields) });

const d = DEMO_CASE_INPUTS;
const aileron = d.sections.aileron;

function sectionsFields(revision: string, extra: Record<string, string> = {}) {
  return { ...demoSectionsFields(revision, { aileron: aileron }), ...extra };
}

function basisFields(revision: string) {
  return demoBasisFields(revision);
}

async function stepRow(step: "envelope" | "sections") {
  const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step)));
  return row!;
}

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  const [empty] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = empty!.id;
  const planform = demoPlanformFields();
  expect((await run(planformAction, { request: post(`/cases/${caseId}/planform`, planform), params: { caseId } })).status).toBe(200);
});

describe("aileron inputs refused with the field named, nothing written", () => {
  it.each([
    ["an aileron ending before it starts", { "aileron.yTo": "5" }, "aileron.yTo", /Aileron to y must be greater than aileron from y/],
    ["a lift increment beyond 0.2 per degree", { "aileron.dClPerDeg": "0.5" }, "aileron.dClPerDeg", /between 0 and 0\.2/],
    ["a nose-up moment for a down-going aileron", { "aileron.dCmPerDeg": "0.01" }, "aileron.dCmPerDeg", /between −0\.05 and 0/],
    ["no deflection at VA", { "aileron.deltaAtVa": "" }, "aileron.deltaAtVa", /Aileron deflection at VA/],
  ])("sections: %s", async (_label, change, field, message) => {
    const before = await stepWriteCounts();
    const res = await run(sectionsAction, { request: post(`/cases/${caseId}/sections`, sectionsFields("0", change)), params: { caseId } });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors[field]?.join(" ")).toMatch(message);
    expect(await stepWriteCounts()).toEqual(before);
  });
});

describe("the rolling conditions of a commuter basis", () => {
  it("saves the aileron with the sections; the basis says which rolling conditions reach the envelope", async () => {
    expect((await run(sectionsAction, { request: post(`/cases/${caseId}/sections`, sectionsFields("0")), params: { caseId } })).status).toBe(200);
    expect(((await stepRow("sections")).data as { aileron: unknown }).aileron).toEqual(aileron);
    expect((await run(basisAction, { request: post(`/cases/${caseId}/basis`, basisFields("0")), params: { caseId } })).status).toBe(200);
    const page = await run(basisLoader, { request: request(`/cases/${caseId}/basis`, { cookie: engineer }), params: { caseId } });
    const check = (page.body as { derived: { label: string; value: string; rule: string }[] }).derived.find((r) => r.label === "Rolling conditions")!;
    expect(check.value).toMatch(/condition A \(75 %.*aileron from y = 5\.4 m to 8\.2 m, 17° at VA/);
    expect(check.rule).toMatch(/14 CFR 23\.349, 23\.455/);
  });

  it("generates unsym-A with 75 % on the other side at n1, and the aileron cases at VA, VC, VD at 2/3·n1 (23.349, 23.455)", async () => {
    const res = await run(envelopeAction, { request: post(`/cases/${caseId}/envelope`, { intent: "generate", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "24" }), params: { caseId } });
    expect(res.status).toBe(200);
    const generated = ((await stepRow("envelope")).data as { cases: { id: string; kind: string; nz: number; weight: number; rule: string; roll?: { fraction: number; aileron: number } }[] }).cases;
    const rolling = generated.filter((c) => c.roll);
    // 3 design weights × 3 altitudes × (unsym-A, roll-VA, roll-VC, roll-VD).
    expect(rolling).toHaveLength(36);
    expect(rolling.every((c) => c.kind === "rolling")).toBe(true);
    expect(generated.filter((c) => !c.roll).every((c) => c.kind !== "rolling")).toBe(true);
    // 23.337(a)(1) [M], commuter: n1 = 2.1 + 24 000/(W + 10 000), W the MTOW in lb, need not exceed 3.8.
    const n1 = Math.min(3.8, 2.1 + 24000 / (d.basis.mtow / LB + 10000));
    const unsym = generated.find((c) => c.id === "W1-unsym-A")!;
    expect(unsym.roll).toEqual({ fraction: 0.75, aileron: 0 });
    expect(Math.abs(unsym.nz - n1)).toBeLessThan(1.1e-4);
    expect(unsym.rule).toMatch(/14 CFR 23\.349\(a\).*75 %/);
    const va = generated.find((c) => c.id === "W1-roll-VA")!;
    expect(Math.abs(va.nz - (2 / 3) * n1)).toBeLessThan(1.1e-4);
    expect(va.roll).toEqual({ fraction: 1, aileron: 17 });
    // V_A where the stall line meets n1 at MTOW: V_S·√n1, V_S = √(2W/(ρ0·S·CLmax)); at V_C the same rate of roll, δ·V constant.
    const vA = Math.sqrt((2 * d.basis.mtow * G0) / (1.225 * d.basis.wingArea * d.basis.clMax)) * Math.sqrt(n1);
    expect(generated.find((c) => c.id === "W1-roll-VC")!.roll!.aileron).toBeCloseTo((17 * vA) / d.basis.vc, 6);
    expect(generated.find((c) => c.id === "W1-roll-VD")!.roll!.aileron).toBeCloseTo((17 * vA) / (3 * d.basis.vd), 6);
    expect(generated.find((c) => c.id === "W1-roll-VD")!.rule).toMatch(/14 CFR 23\.455.*23\.349\(b\)/);
  });

  it("exports wing.aileron and the rolling cases; the stored result has both sides, and the envelope names case and side", async () => {
    const [row] = await db.select().from(cases).where(eq(cases.id, caseId));
    const doc = await exportCase(caseId, row!.title);
    const parsed = parseCase(JSON.parse(JSON.stringify(doc)));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    expect(parsed.value.wing.aileron).toEqual(aileron);
    expect(parsed.value.cases.filter((c) => c.roll)).toHaveLength(36);
    const stored = await resultsFor(caseId, doc, null);
    expect(stored.result).toEqual(runCase(parsed.value));
    const result = stored.result;
    // No masses step, no tail load: the other side of unsym-A carries 75 % of nz·W/2 at the root (equilibrium).
    const c = parsed.value.cases.find((k) => k.id === "W1-unsym-A")!;
    const r = result.cases.find((k) => k.id === "W1-unsym-A")!;
    expect(r.root.shear).toBeCloseTo((c.nz! * c.weight!) / 2, 2);
    expect(r.roll!.other.root.shear).toBeCloseTo((0.75 * c.nz! * c.weight!) / 2, 2);
    // roll-VC: the down-going aileron adds q·Δcl·∫c over 5.4–8.2 m; the chord is linear from 1.8 m at 3.2 m to
    // 0.95 m at 8.7 m, so ∫c = 2.8 m × c(6.8 m) = 2.8 × (1.8 − 0.85·3.6/5.5) = 3.482182 m² (by hand).
    const vc = parsed.value.cases.find((k) => k.id === "W1-roll-VC")!;
    const rc = result.cases.find((k) => k.id === "W1-roll-VC")!;
    const dL = rc.dynamicPressure * aileron.dClPerDeg * vc.roll!.aileron * 3.482182;
    expect(rc.root.shear).toBeCloseTo((vc.nz! * vc.weight!) / 2 + dL, 1);
    expect(rc.roll!.other.root.shear).toBeCloseTo((vc.nz! * vc.weight!) / 2 - dL, 1);
    // The envelope takes both sides of every rolling case: no side's load lies outside it, and the extremes say which case and side.
    const byId = new Map(result.cases.map((k) => [k.id, k]));
    const named = new Set<string>();
    result.envelope.forEach((e, k) => {
      for (const q of ["shear", "bending", "torsion"] as const) {
        for (const rc of result.cases.filter((x) => x.roll)) {
          for (const side of [rc.stations![k]!, rc.roll!.other.stations![k]!]) {
            expect(side[q]).toBeLessThanOrEqual(e[`${q}Max`]);
            expect(side[q]).toBeGreaterThanOrEqual(e[`${q}Min`]);
          }
        }
        for (const label of [e[`${q}MaxCase`], e[`${q}MinCase`]]) {
          const { id, side } = attributionOf(label);
          const hit = byId.get(id)!;
          const value = side === "other" ? hit.roll!.other.stations![k]![q] : hit.stations![k]![q];
          expect(value).toBe(label === e[`${q}MaxCase`] ? e[`${q}Max`] : e[`${q}Min`]);
          if (side) named.add(side);
        }
      }
    });
    // The aileron's nose-down moment on the loaded side and its lift lost on the other make extremes of their own.
    expect([...named].sort()).toEqual(["loaded", "other"]);
    // Imported back, the aileron returns to the sections step and the rolling cases keep their sides' data.
    const steps = stepsFromCaseFile(parsed.value);
    expect((steps.sections as { aileron: unknown }).aileron).toEqual(aileron);
    expect((steps.envelope as { cases: { roll?: unknown }[] }).cases.filter((k) => k.roll)).toHaveLength(36);
  });
});
