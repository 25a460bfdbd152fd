import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { DEMO_CASE_INPUTS } from "~/demo/scenario";
import { auditLog, cases, caseSteps, programmes, stepRevisions, uploads } from "~/db/schema";
import { parseCase, runCase } from "~/exchange";
import { action as basisAction } from "~/routes/cases/basis";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { action as planformAction } from "~/routes/cases/planform";
import { action as sectionsAction } from "~/routes/cases/sections";
import { loader as distributionLoader } from "~/routes/cases/distribution";
import { loader as caseDistributionLoader } from "~/routes/api/case-distribution";
import { exportCase, resultsFor } from "~/services/analysis.server";
import { listKeys } from "~/services/storage.server";
import { cookieFor, form, request, routeArgs, run, seed } from "./helpers";

let caseId = "";
let engineer = "";

async function counts() {
  return {
    steps: (await db.select().from(caseSteps)).length,
    revisions: (await db.select().from(stepRevisions)).length,
    uploads: (await db.select().from(uploads)).length,
    audit: (await db.select().from(auditLog)).length,
    objects: (await listKeys(process.env.S3_BUCKET_UPLOADS ?? "spanwright-uploads")).length,
  };
}

const post = (path: string, fields: Record<string, string | string[]>) => request(path, { method: "POST", cookie: engineer, body: form(fields) });

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  const [empty] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-002"));
  caseId = empty!.id;
});

const planformFields = (rows: string[][], revision = "0") => {
  const out: Record<string, string> = { revision, axisRoot: "0.35", axisTip: "0.35" };
  rows.forEach(([y, xLe, chord, twist], i) => Object.assign(out, { [`stations.${i}.y`]: y, [`stations.${i}.xLe`]: xLe, [`stations.${i}.chord`]: chord, [`stations.${i}.twist`]: twist }));
  return out;
};

describe("bad input is refused with the field named, and nothing is written", () => {
  it("refuses a negative chord", async () => {
    const before = await counts();
    const res = await run(planformAction, { request: post(`/cases/${caseId}/planform`, planformFields([["0", "0", "2", "0"], ["8", "0.5", "-1", "0"]])), params: { caseId } });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors["stations.1.chord"]?.[0]).toMatch(/Chord must be positive/);
    expect(await counts()).toEqual(before);
  });

  it("refuses stations whose y does not increase", async () => {
    const before = await counts();
    const res = await run(planformAction, { request: post(`/cases/${caseId}/planform`, planformFields([["0", "0", "2", "0"], ["5", "0.2", "1.5", "0"], ["4", "0.3", "1", "0"]])), params: { caseId } });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors["stations.2.y"]?.[0]).toMatch(/y must be greater than the station before/);
    expect(await counts()).toEqual(before);
  });

  it("refuses a load case at Mach 1", async () => {
    const before = await counts();
    const res = await run(envelopeAction, {
      request: post(`/cases/${caseId}/envelope`, {
        intent: "save",
        revision: "0",
        compressibility: "prandtl-glauert",
        spanwise: "vortex-lattice",
        stations: "40",
        "cases.0.id": "M1",
        "cases.0.kind": "manual",
        "cases.0.mach": "1.0",
        "cases.0.altitude": "0",
        "cases.0.weight": "6000",
        "cases.0.nz": "2.5",
      }),
      params: { caseId },
    });
    expect(res.status).toBe(400);
    expect((res.body as { fieldErrors: Record<string, string[]> }).fieldErrors["cases.0.mach"]?.[0]).toMatch(/below 1/);
    expect(await counts()).toEqual(before);
  });

  it.each([
    ["a missing column", "y,a0,alphaL0\n0,6.0,-2\n", /Missing column.*cmAc/],
    ["a cell that is not a number", "y,a0,alphaL0,cmAc\n0,6.0,-2,-0.05\n8,six,-1.5,-0.04\n", /Line 3, column a0: "six" is not a number/],
    ["a non-CSV file named .csv", "\u0000\u0001PK\u0003\u0004binary", /not CSV text/],
    ["a slope per degree", "y,a0,alphaL0,cmAc\n0,105,-2,-0.05\n", /per radian/],
  ])("refuses a CSV upload with %s, lists the problem, stores nothing", async (_label, text, message) => {
    const before = await counts();
    const body = new FormData();
    body.append("file", new File([text], "sections.csv", { type: "text/csv" }));
    const res = await run(sectionsAction, { request: request(`/cases/${caseId}/sections`, { method: "POST", cookie: engineer, body }), params: { caseId } });
    expect(res.status).toBe(400);
    const problems = ((res.body as { problems?: { line?: number; column?: string; message: string }[] }).problems ?? []).map((p) => `${p.line ? `Line ${p.line}` : "File"}${p.column ? `, column ${p.column}` : ""}: ${p.message}`);
    expect(problems.join("\n")).toMatch(message);
    expect(await counts()).toEqual(before);
  });

  it("refuses a stale save and keeps the other engineer's revision", async () => {
    const fields = planformFields([["0", "0", "2.1", "0"], ["8.7", "0.55", "0.95", "-3"]]);
    const first = await run(planformAction, { request: post(`/cases/${caseId}/planform`, fields), params: { caseId } });
    expect(first.status).toBe(200);
    const before = await counts();
    const stale = await run(planformAction, { request: post(`/cases/${caseId}/planform`, planformFields([["0", "0", "3", "0"], ["9", "0.5", "1", "0"]])), params: { caseId } });
    expect(stale.status).toBe(409);
    expect((stale.body as { fieldErrors: Record<string, string[]> }).fieldErrors.revision?.[0]).toMatch(/Not saved: .* saved this step \(revision 1\)/);
    expect(await counts()).toEqual(before);
    const [row] = await db.select().from(caseSteps).where(eq(caseSteps.caseId, caseId));
    expect((row!.data as { stations: { chord: number }[] }).stations[0]!.chord).toBe(2.1);
  });
});

describe("a case worked through its steps", () => {
  it("accepts a good CSV upload, keeps the file in S3 with its SHA-256, and uses it on acceptance", async () => {
    const csv = "\uFEFFy;a0;alphaL0;cmAc;clMax;cpMin\n0;6,05;-2,2;-0,055;1,7;-0,62\n8,7;5,9;-1,6;-0,04;1,5;-0,55\n";
    const body = new FormData();
    body.append("file", new File([csv], "tern-sections.csv", { type: "text/csv" }));
    const res = await run(sectionsAction, { request: request(`/cases/${caseId}/sections`, { method: "POST", cookie: engineer, body }), params: { caseId } });
    expect(res.status).toBe(200);
    const preview = (res.body as { preview: { uploadId: string; sha256: string; rows: { y: number; a0: number }[] } }).preview;
    expect(preview.rows).toEqual([expect.objectContaining({ y: 0, a0: 6.05 }), expect.objectContaining({ y: 8.7, a0: 5.9 })]);
    const [stored] = await db.select().from(uploads).where(eq(uploads.id, preview.uploadId));
    expect(stored!.sha256).toBe(preview.sha256);
    expect(await listKeys("spanwright-uploads", `cases/${caseId}/`)).toContain(stored!.key);
    const accepted = await run(sectionsAction, { request: post(`/cases/${caseId}/sections`, { intent: "accept-upload", revision: "0", uploadId: preview.uploadId }), params: { caseId } });
    expect(accepted.body).toMatchObject({ ok: true, revision: 1 });
    expect(accepted.status).toBe(200);
  });

  it("generates load cases from the basis and answers the same results as the command-line engine", async () => {
    const b = DEMO_CASE_INPUTS.basis;
    const basis = await run(basisAction, {
      request: post(`/cases/${caseId}/basis`, {
        revision: "0",
        units: "SI",
        category: b.category,
        regulations: b.regulations,
        mtow: String(b.mtow),
        mzfw: String(b.mzfw),
        minWeight: String(b.minWeight),
        vs1: String(b.vs1),
        va: String(b.va),
        vc: String(b.vc),
        vd: String(b.vd),
        altitudes: b.altitudes.join(", "),
        wingArea: String(b.wingArea),
        clMax: String(b.clMax),
        clMaxNegative: String(b.clMaxNegative),
      }),
      params: { caseId },
    });
    expect(basis.status).toBe(200);
    const env = await run(envelopeAction, { request: post(`/cases/${caseId}/envelope`, { intent: "generate", revision: "0", compressibility: "karman-tsien", spanwise: "vortex-lattice", stations: "30" }), params: { caseId } });
    expect(env.status).toBe(200);
    const [envelopeRow] = (await db.select().from(caseSteps).where(eq(caseSteps.caseId, caseId))).filter((s) => s.step === "envelope");
    const generated = (envelopeRow!.data as { cases: { id: string; rule: string; kind: string }[] }).cases;
    // 14 CFR 23.337, 23.341 and 23.349 name every generated case's origin (3 weights × 3 altitudes × 10 points:
    // the corners, the gusts and the unsymmetrical condition A; no aileron in these sections, so no aileron cases).
    expect(generated).toHaveLength(90);
    expect(generated.every((c) => /14 CFR 23\.3\d\d/.test(c.rule))).toBe(true);

    const dist = await run(distributionLoader, { request: request(`/cases/${caseId}/distribution`, { cookie: engineer }), params: { caseId } });
    expect(dist.status).toBe(200);
    const first = encodeURIComponent(generated[0]!.id);
    const shown = (await caseDistributionLoader((await routeArgs(request(`/api/cases/${caseId}/distribution?case=${first}`, { cookie: engineer }), { caseId })) as never)) as Response;
    expect(shown.status).toBe(200);
    expect(((await shown.json()) as { rules: unknown[] }).rules).toHaveLength(3);

    const [row] = await db.select().from(cases).where(eq(cases.id, caseId));
    const exported = await exportCase(caseId, row!.title);
    const stored = await resultsFor(caseId, exported, null);
    const parsed = parseCase(JSON.parse(JSON.stringify(exported)));
    if (!parsed.ok) throw new Error("export does not parse");
    // The application's stored result is exactly what the engine answers for the exported file.
    expect(stored.result).toEqual(runCase(parsed.value));
  });
});

describe("the programme of an imported-looking case", () => {
  it("keeps steps of other organisations' cases out of reach", async () => {
    const outsider = await cookieFor("outsider");
    const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
    expect(p).toBeDefined();
    const res = await run(planformAction, { request: request(`/cases/${caseId}/planform`, { method: "POST", cookie: outsider, body: form(planformFields([["0", "0", "2", "0"], ["8", "0.5", "1", "0"]], "1")) }), params: { caseId } });
    expect(res.status).toBe(404);
  });
});
