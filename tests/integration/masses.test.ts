/**
 * The masses step and what it drives: the step's refusals (nothing written), units, the envelope
 * generated per mass case, the balance's tail loads in the exchange document, the loads breakdown, and
 * the cases saved before the masses step existed. Expected loads are beam statics worked from the inputs
 * (common practice, no source); the engine's own formulas are checked against published sources in
 * app/engine/*.test.ts.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { DEMO_CASE_INPUTS } from "~/demo/scenario";
import { cases, caseSteps } from "~/db/schema";
import { balanceTailLoad, dynamicPressure, solveMach, wingAerodynamicCentre, wingPitchingMoment } from "~/engine";
import { parseCase, runCase, wingModelOf } from "~/exchange";
import { loader as caseLoadsLoader } from "~/routes/api/case-loads-breakdown";
import { action as basisAction } from "~/routes/cases/basis";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { action as massesAction, loader as massesLoader } from "~/routes/cases/masses";
import { action as planformAction } from "~/routes/cases/planform";
import { action as sectionsAction } from "~/routes/cases/sections";
import { exportCase } from "~/services/analysis.server";
import { cookieFor, demoPlanformFields, form, request, run, seed, routeArgs, stepWriteCounts } from "./helpers";

const G0 = 9.80665;
let caseId = "";
let engineer = "";
let checker = "";

const post = (path: string, fields: Record<string, string>, cookie = engineer) => request(path, { method: "POST", cookie, body: form(fields) });

/** The masses form as the page posts it: items and mass cases as dotted fields, fills keyed by item id. */
function massesFields(m: typeof DEMO_CASE_INPUTS.masses, revision: string, extra: Record<string, string> = {}): Record<string, string> {
  const out: Record<string, string> = { revision, structureKg: String(m.structureKg), cmBody: String(m.balance.cmBody), tailArm: String(m.balance.tailArm), sourceKind: "typed", sourceFile: "" };
  m.items.forEach((it, i) => {
    const p = `items.${i}.`;
    Object.assign(out, { [`${p}id`]: it.id, [`${p}label`]: it.label, [`${p}kg`]: String(it.kg), [`${p}x`]: String(it.x) });
    if ("y" in it) out[`${p}y`] = String(it.y);
    else Object.assign(out, { [`${p}yFrom`]: String(it.yFrom), [`${p}yTo`]: String(it.yTo) });
  });
  m.massCases.forEach((mc, i) => {
    const p = `massCases.${i}.`;
    Object.assign(out, { [`${p}id`]: mc.id, [`${p}label`]: mc.label, [`${p}weight`]: String(mc.weight), [`${p}cg`]: String(mc.cg * 100) });
    for (const [id, v] of Object.entries(mc.fill)) out[`${p}fill.${id}`] = String(v);
  });
  return { ...out, ...extra };
}

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  checker = await cookieFor("checker");
  const [empty] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = empty!.id;
  const d = DEMO_CASE_INPUTS;
  const planform = demoPlanformFields();
  expect((await run(planformAction, { request: post(`/cases/${caseId}/planform`, planform), params: { caseId } })).status).toBe(200);
  const sections: Record<string, string> = { intent: "save", revision: "0" };
  d.sections.rows.forEach((r, i) => Object.assign(sections, Object.fromEntries(Object.entries(r).map(([k, v]) => [`rows.${i}.${k}`, String(v)]))));
  expect((await run(sectionsAction, { request: post(`/cases/${caseId}/sections`, sections), params: { caseId } })).status).toBe(200);
  const b = d.basis;
  const basis = { revision: "0", units: "SI", category: b.category, regulations: b.regulations, altitudes: b.altitudes.join(", "), ...Object.fromEntries((["mtow", "mzfw", "minWeight", "vs1", "va", "vb", "vc", "vd", "wingArea", "clMax", "clMaxNegative"] as const).map((k) => [k, String(b[k])])) };
  expect((await run(basisAction, { request: post(`/cases/${caseId}/basis`, basis), params: { caseId } })).status).toBe(200);
});

describe("the masses step refuses bad input with the field named, and writes nothing", () => {
  const bad: [string, Record<string, string>, string, RegExp][] = [
    ["a negative mass", { "items.0.kg": "-5" }, "items.0.kg", /Mass must be 0 or more/],
    ["a spread mass whose end lies before its start", { "items.2.yTo": "0.1" }, "items.2.yTo", /y to must be greater than y from/],
    ["an item beyond the tip", { "items.0.y": "9.5" }, "items.0.y", /outside the wing \(semispan 8\.7 m\)/],
    ["a fill factor above 1", { "massCases.1.fill.tank-inner": "1.5" }, "massCases.1.fill.tank-inner", /between 0 and 1/],
    ["a centre of gravity far off the MAC", { "massCases.0.cg": "400" }, "massCases.0.cg", /centre of gravity lies between −50 and 150 % MAC/],
    ["two mass cases of one id", { "massCases.1.id": "MTOW-full" }, "massCases.1.id", /used twice/],
    ["half a balance", { cmBody: "" }, "cmBody", /Give both the wing–body Cm increment and the tail arm/],
  ];
  it.each(bad)("%s", async (_label, change, field, message) => {
    const before = await stepWriteCounts();
    const res = await run(massesAction, { request: post(`/cases/${caseId}/masses`, massesFields(DEMO_CASE_INPUTS.masses, "0", change)), params: { caseId } });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors[field]?.join(" ")).toMatch(message);
    expect(await stepWriteCounts()).toEqual(before);
  });

  it("refuses a checker", async () => {
    const before = await stepWriteCounts();
    const res = await run(massesAction, { request: post(`/cases/${caseId}/masses`, massesFields(DEMO_CASE_INPUTS.masses, "0"), checker), params: { caseId } });
    expect(res.status).toBe(403);
    expect(await stepWriteCounts()).toEqual(before);
  });
});

describe("a case with masses, mass cases and a balance", () => {
  it("stores the step in SI, and shows each mass case with its checks and the root relief per g", async () => {
    const res = await run(massesAction, { request: post(`/cases/${caseId}/masses`, massesFields(DEMO_CASE_INPUTS.masses, "0")), params: { caseId } });
    expect(res.status).toBe(200);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "masses")));
    const stored = row!.data as { items: { id: string; y?: number; yFrom?: number }[]; massCases: { id: string; cg: number; fill: Record<string, number> }[]; balance: { tailArm: number } };
    expect(stored.items.map((i) => i.id)).toEqual(["engine", "main-gear", "tank-inner", "tank-outer"]);
    expect(stored.massCases[0]!.cg).toBeCloseTo(0.28, 12);
    expect(stored.massCases[2]!.fill).toEqual({ "tank-inner": 0, "tank-outer": 0 });
    const page = await run(massesLoader, { request: request(`/cases/${caseId}/masses`, { cookie: engineer }), params: { caseId } });
    const overview = (page.body as { overview: { summaries: { id: string; itemsKg: number; checks: { ok: boolean }[] }[]; relief: { massCase: string; shear: number }[] } }).overview;
    // Zero fuel: engine 290 + gear 95 = 385 kg on one side; relief per g at the root (310 + 385)·g.
    expect(overview.summaries.find((s) => s.id === "MZFW")!.itemsKg).toBeCloseTo(385, 9);
    expect(overview.relief.find((r) => r.massCase === "MZFW")!.shear).toBeCloseTo((310 + 385) * G0, 6);
    expect(overview.summaries.every((s) => s.checks.every((c) => c.ok))).toBe(true);
  });

  it("generates the envelope per mass case, each case naming its mass case, with the VB gust points of a commuter", async () => {
    const env = await run(envelopeAction, { request: post(`/cases/${caseId}/envelope`, { intent: "generate", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "24" }), params: { caseId } });
    expect(env.status).toBe(200);
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
    const generated = (row!.data as { cases: { id: string; massCase?: string; weight: number; rule: string }[] }).cases;
    // 4 mass cases × 3 altitudes × 12 points (A, D, E, F, H, ± gusts at VB, VC, VD and the unsymmetrical
    // condition A of 23.349(a); the sections here give no aileron, so no aileron cases).
    expect(generated).toHaveLength(4 * 3 * 12);
    for (const mc of DEMO_CASE_INPUTS.masses.massCases) {
      const own = generated.filter((c) => c.massCase === mc.id);
      expect(own).toHaveLength(36);
      expect(own.every((c) => Math.abs(c.weight - mc.weight * G0) < 1e-6)).toBe(true);
    }
    expect(generated.filter((c) => c.id.endsWith("gust+VB")).every((c) => /23\.333\(c\)\(1\)\(iii\)/.test(c.rule))).toBe(true);
  });

  it("exports each trimmed case with its mass case and its balanced tail load, and the wing carries nz·W − P", async () => {
    const [row] = await db.select().from(cases).where(eq(cases.id, caseId));
    const doc = await exportCase(caseId, row!.title);
    const parsed = parseCase(JSON.parse(JSON.stringify(doc)));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    const file = parsed.value;
    expect(file.wing.mass?.items?.map((i) => i.id)).toEqual(["engine", "main-gear", "tank-inner", "tank-outer"]);
    expect(file.massCases?.map((m) => m.id)).toEqual(["MTOW-full", "MTOW-MZFW", "MZFW", "MIN-reserve"]);
    const c = file.cases.find((k) => k.id === "W1-A")!;
    expect(c.massCase).toBe("MTOW-full");
    // The tail load is the balance of the masses step at this case: equilibrium about the CG placed on the
    // wing's MAC (28 % for this mass case), the tail 6.4 m aft of the MAC quarter chord.
    const balanced = (k: typeof c, nz: number) => {
      const sol = solveMach(wingModelOf(file), k.mach, { spanwise: file.method.spanwise, rule: file.method.compressibility, stations: file.method.stations });
      const g = sol.geometry;
      const xAc = wingAerodynamicCentre(sol);
      return balanceTailLoad({
        weightN: k.weight!,
        nz,
        dynamicPressure: dynamicPressure(k.mach, k.altitude),
        area: g.area,
        mac: g.mac,
        xAc,
        cmAc: wingPitchingMoment(sol, 0, xAc),
        cmBody: -0.018,
        xCg: g.xLeMac + 0.28 * g.mac,
        xTail: g.xLeMac + 0.25 * g.mac + 6.4,
      }).tailLoad;
    };
    // More Mach numbers than the run solves directly: the wing's moments come from the run's checked Mach grid
    // (interpolation error within 1e-4 of the loads at CL = 1), so the tail load agrees to 1e-4 of nz·W.
    expect(Math.abs(c.tailLoad! - balanced(c, c.nz!)) / (c.nz! * c.weight!)).toBeLessThan(1e-4);
    // A gust case is balanced at 1 g: its increment is put on the wing.
    const gust = file.cases.find((k) => k.id === "W1-gust+VC")!;
    expect(Math.abs(gust.tailLoad! - balanced(gust, 1)) / gust.weight!).toBeLessThan(1e-4);
    const r = runCase(file);
    const i = file.cases.indexOf(c);
    // Beam statics at the root: (nz·W − P)/2 − nz·g·(structure + every item at full fill).
    const items = DEMO_CASE_INPUTS.masses.items.reduce((s, it) => s + it.kg, 0);
    expect(r.cases[i]!.root.shear).toBeCloseTo((c.nz! * c.weight! - c.tailLoad!) / 2 - c.nz! * G0 * (310 + items), 2);
  });

  it("breaks a case's loads into aerodynamic load and relief, for the loads page: net = aerodynamic − relief", async () => {
    const res = (await caseLoadsLoader((await routeArgs(request(`/api/cases/${caseId}/case-loads?case=W1-A`, { cookie: checker }), { caseId })) as never)) as Response;
    expect(res.status).toBe(200);
    const b = (await res.json()) as { massCase: string; nz: number; y: number[]; aero: Record<string, number[]>; relief: Record<string, number[]>; net: Record<string, number[]> };
    expect(b.massCase).toBe("MTOW-full");
    const items = DEMO_CASE_INPUTS.masses.items.reduce((s, it) => s + it.kg, 0);
    expect(b.relief.shear[0]).toBeCloseTo(b.nz * G0 * (310 + items), 6);
    b.y.forEach((_, k) => expect(b.aero.bending[k]! - b.relief.bending[k]!).toBeCloseTo(b.net.bending[k]!, 6));
    const missing = await run(caseLoadsLoader, { request: request(`/api/cases/${caseId}/case-loads?case=nope`, { cookie: checker }), params: { caseId } });
    expect(missing.status).toBe(404);
  });
});

describe("a case saved before the masses step existed", () => {
  it("keeps its structural mass from the loads step until the masses step is saved", async () => {
    const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
    await db.delete(caseSteps).where(and(eq(caseSteps.caseId, demo!.id), eq(caseSteps.step, "masses")));
    const [loads] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, demo!.id), eq(caseSteps.step, "loads")));
    await db.update(caseSteps).set({ data: { semispanMass: 285 } }).where(eq(caseSteps.id, loads!.id));
    const [env] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, demo!.id), eq(caseSteps.step, "envelope")));
    const envData = env!.data as { cases: Record<string, unknown>[] };
    await db.update(caseSteps).set({ data: { ...envData, cases: envData.cases.map(({ massCase: _m, ...c }) => c) } }).where(eq(caseSteps.id, env!.id));
    const doc = await exportCase(demo!.id, demo!.title);
    expect(doc.wing.mass).toEqual({ kg: 285, distribution: "chord" });
    expect(doc.massCases).toBeUndefined();
  });
});
