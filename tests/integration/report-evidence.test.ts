import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, desc, eq, isNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { caseResults, cases, caseSteps, reportReruns, reports, ruleSensitivities, signatureVoids, signatures, users } from "~/db/schema";
import { ENGINE_VERSION } from "~/engine";
import { stopBoss } from "~/jobs/boss.server";
import type { RuleSensitivity, SpanwiseComparison } from "~/domain/comparisons";
import { STEPS } from "~/domain/steps";
import { RULE_LABELS } from "~/domain/vocabulary";
import { formatNumber, fromSI } from "~/domain/units";
import { attributionOf, parseCase, parseSections, rollingSideLabel, type CaseFileInput, type CaseResult } from "~/exchange";
import { spanwiseComparison } from "~/services/comparisons.server";
import { loader as ruleSensitivityLoader } from "~/routes/api/case-rule-sensitivity";
import { loader as spanwiseMethodsLoader } from "~/routes/api/case-spanwise-methods";
import { loader as comparisonPdfLoader } from "~/routes/api/case-report-comparison";
import { loader as exportLoader } from "~/routes/api/v1/case-export";
import { loader as compareLoader } from "~/routes/cases/report-compare";
import { loader as pdfLoader } from "~/routes/api/v1/report-pdf";
import { action as reportsAction, loader as reportsLoader } from "~/routes/cases/reports";
import { action as reviewAction } from "~/routes/cases/review";
import { runRerun } from "~/services/reproduction.server";
import { computeRuleSensitivity } from "~/services/rule-sensitivity.server";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { createReportRow, generateReport } from "~/services/reports.server";
import { cookieFor, demoUser, form, request, run, seed, routeArgs } from "./helpers";

/*
 * The issued report as evidence, read from outside with poppler (pdftotext, pdfdetach): what it
 * attaches, and that the attachment is the case as the export gives it.
 */

let caseId = "";
const cookies: Record<string, string> = {};
const sha = (b: string | Uint8Array) => createHash("sha256").update(b).digest("hex");
const review = (who: string, fields: Record<string, string>) => run(reviewAction, { request: request(`/cases/${caseId}/review`, { method: "POST", cookie: cookies[who], body: form(fields) }), params: { caseId } });

async function approveAll() {
  for (const s of STEPS) {
    const [row] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, s.key)));
    if (row!.status === "approved") continue;
    if (row!.status !== "submitted") expect((await review("engineer", { intent: "submit", step: s.key, password: demoUser("engineer").password })).status).toBe(200);
    expect((await review("checker", { intent: "approve", step: s.key, password: demoUser("checker").password })).status).toBe(200);
  }
  expect((await review("checker", { intent: "approve-case", password: demoUser("checker").password })).status).toBe(200);
}

/** Issues the next version of the demo case's report and returns its row and the PDF as downloaded. */
async function issue() {
  const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
  const row = await createReportRow({ caseId, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
  await generateReport(row.id);
  const [issued] = await db.select().from(reports).where(eq(reports.id, row.id));
  const res = (await pdfLoader((await routeArgs(request(`/api/v1/reports/${row.id}/pdf`, { cookie: cookies.quality }), { reportId: row.id })) as never)) as Response;
  expect(res.status).toBe(200);
  const bytes = new Uint8Array(await res.arrayBuffer());
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "sw-evidence-"));
  const file = path.join(dir, "report.pdf");
  fs.writeFileSync(file, bytes);
  return { row: issued!, bytes, dir, file, text: execFileSync("pdftotext", ["-layout", "-enc", "UTF-8", file, "-"], { encoding: "utf8", maxBuffer: 64 * 2 ** 20 }) };
}

let first: Awaited<ReturnType<typeof issue>>;

beforeAll(async () => {
  await seed();
  for (const who of ["engineer", "checker", "quality"]) cookies[who] = await cookieFor(who as never);
  const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = c!.id;
  await approveAll();
  first = await issue();
}, 180_000);

describe("the report names who signed it", () => {
  it("lists the preparer, the checker and the approver, each signature with its name, role, meaning, date and hash", async () => {
    const live = (await db.select({ s: signatures }).from(signatures).leftJoin(signatureVoids, eq(signatureVoids.signatureId, signatures.id)).where(and(eq(signatures.caseId, caseId), isNull(signatureVoids.id), isNull(signatures.reportId)))).map((r) => r.s);
    const text = first.text;
    const flat = text.replace(/\s+/g, "");
    const erin = demoUser("engineer").name;
    const marek = demoUser("checker").name;
    // The sign-off: Erin prepared all seven steps, Marek checked them and approved the case for issue.
    expect(text).toMatch(new RegExp(`Prepared by\\s+${erin} \\(engineer\\), ${STEPS.length} steps`));
    expect(text).toMatch(new RegExp(`Checked by\\s+${marek} \\(checker\\), ${STEPS.length} steps`));
    expect(text).toMatch(new RegExp(`Approved for issue by\\s+${marek} \\(checker\\)`));
    const meanings = live.map((g) => g.meaning).sort();
    expect(meanings.filter((m) => m === "prepared")).toHaveLength(STEPS.length);
    expect(meanings.filter((m) => m === "checked")).toHaveLength(STEPS.length);
    expect(meanings.filter((m) => m === "approved for issue")).toHaveLength(1);
    // Every signature's row: the full hash printed (a table cell may wrap it), beside its meaning.
    for (const g of live) expect(flat, `${g.meaning} ${g.step}`).toContain(g.revisionHash);
    expect(text).toMatch(new RegExp(`${erin}\\s+engineer\\s+prepared\\s+\\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2}:\\d{2} UTC`));
    expect(text).toMatch(new RegExp(`${marek}\\s+checker\\s+checked\\s+\\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2}:\\d{2} UTC`));
  });
});

describe("the input snapshot travels with the report", () => {
  it("attaches the case, byte for byte as the export gives it, and prints its SHA-256", async () => {
    // pdfdetach (poppler-utils) lists and extracts the PDF's embedded files, as any reader would.
    const list = execFileSync("pdfdetach", ["-list", first.file], { encoding: "utf8" });
    const stem = first.row.reportNumber.replace(/[^A-Za-z0-9._-]+/g, "_");
    expect(list).toContain(`${stem}.case.json`);
    expect(list).toContain(`${stem}.result.json`);
    const out = path.join(first.dir, "attached");
    fs.mkdirSync(out);
    execFileSync("pdfdetach", ["-saveall", "-o", out, first.file]);
    const attached = fs.readFileSync(path.join(out, `${stem}.case.json`));
    const res = (await exportLoader((await routeArgs(request(`/api/v1/cases/${caseId}/export`, { cookie: cookies.engineer }), { caseId })) as never)) as Response;
    expect(res.status).toBe(200);
    const exportBytes = new Uint8Array(await res.arrayBuffer());
    expect(sha(attached)).toBe(sha(exportBytes));
    expect(Buffer.from(attached).equals(Buffer.from(exportBytes))).toBe(true);
    // A document the command line accepts as it is.
    expect(parseCase(JSON.parse(attached.toString("utf8"))).ok).toBe(true);
    // The printed hash is that of the attached bytes, on the cover and in the attachments section.
    const printed = first.text.split(sha(attached)).length - 1;
    expect(printed).toBeGreaterThanOrEqual(2);
  });

  it("attaches the results as computed, every number equal to the snapshot's", () => {
    const stem = first.row.reportNumber.replace(/[^A-Za-z0-9._-]+/g, "_");
    const result = JSON.parse(fs.readFileSync(path.join(first.dir, "attached", `${stem}.result.json`), "utf8"));
    expect(result).toEqual((first.row.snapshot as { result: unknown }).result);
  });
});

type Snapshot = { exchange: CaseFileInput; result: CaseResult; sensitivity: RuleSensitivity; spanwise: SpanwiseComparison[] };
const json = async (loader: (args: never) => unknown, path: string) => {
  const res = (await loader((await routeArgs(request(path, { cookie: cookies.engineer }), { caseId })) as never)) as Response;
  expect(res.status).toBe(200);
  return res.json();
};
const kNm = (si: number) => formatNumber(fromSI("SI", "moment", si), 5);

/**
 * Checks that the cases named are the root-critical ones, found here from every case's root loads:
 * each extreme (largest and smallest root shear, bending and torsion) is reached by one of them
 * (cases tie, e.g. two trimmed cases at one nz·W carry one root shear), and each of them reaches one.
 */
function expectRootCritical(named: string[], result: CaseResult, key: (label: string) => string = (label) => label) {
  // A rolling case has two sides, each an entry of the envelope under its own label.
  const sides = result.cases.flatMap((c) => (c.roll ? [{ label: rollingSideLabel(c.id, "loaded"), root: c.root }, { label: rollingSideLabel(c.id, "other"), root: c.roll.other.root }] : [{ label: c.id, root: c.root }]));
  const reaches = new Set<string>();
  for (const q of ["shear", "bending", "torsion"] as const) {
    const values = sides.map((c) => c.root[q]);
    for (const extreme of [Math.max(...values), Math.min(...values)]) {
      const hits = sides.filter((c) => Math.abs(c.root[q] - extreme) <= 1e-9 * Math.abs(extreme)).map((c) => key(c.label)).filter((id) => named.includes(id));
      expect(hits.length, `${q} ${extreme}`).toBeGreaterThan(0);
      hits.forEach((id) => reaches.add(id));
    }
  }
  expect([...reaches].sort()).toEqual([...new Set(named)].sort());
}

describe("rule sensitivity", () => {
  it("gives the critical cases' root loads under each rule with the spread, on the distribution page", async () => {
    // Solved by the job worker (tests/integration/rule-sensitivity.test.ts): its handler run here.
    const ask = async () => (await ruleSensitivityLoader((await routeArgs(request(`/api/cases/${caseId}/rule-sensitivity`, { cookie: cookies.engineer }), { caseId })) as never)) as Response;
    expect((await ask()).status).toBe(202);
    const [queued] = await db.select().from(ruleSensitivities).where(eq(ruleSensitivities.caseId, caseId));
    await computeRuleSensitivity(caseId, queued!.inputHash);
    const answer = await ask();
    expect(answer.status).toBe(200);
    const body = (await answer.json()) as { units: string; sensitivity: RuleSensitivity };
    const snap = first.row.snapshot as unknown as Snapshot;
    const s = body.sensitivity;
    expectRootCritical(s.cases.map((c) => c.id), snap.result);
    for (const c of s.cases) {
      expect(c.rules.map((r) => r.rule)).toEqual(["prandtl-glauert", "karman-tsien", "laitone"]);
      for (const q of ["shear", "bending", "torsion"] as const) {
        const values = c.rules.map((r) => r.root[q]);
        expect(c.spread[q]).toBeCloseTo(Math.max(...values) - Math.min(...values), 9);
      }
      // Equilibrium: a trimmed case's wing carries nz·W whatever the rule, so its root shear does not move (statics, common practice, no source);
      // nor does a rolling side's, whose aileron increments are taken as entered under every rule.
      const { id, side } = attributionOf(c.id);
      const own = snap.result.cases.find((k) => k.id === id)!;
      const ownRoot = side === "other" ? own.roll!.other.root : own.root;
      if (snap.exchange.cases.find((k) => k.id === id)!.nz !== undefined) expect(c.spread.shear / Math.abs(ownRoot.shear)).toBeLessThan(1e-9);
    }
    // The rules do change the loads somewhere: bending or torsion spreads are not all nil.
    expect(s.cases.some((c) => c.relative.torsion > 1e-4)).toBe(true);
  });

  it("prints the same table in the report, frozen at issue", () => {
    const snap = first.row.snapshot as unknown as Snapshot;
    expect(first.text).toContain("Sensitivity to the compressibility rule");
    const lines = first.text.split("\n");
    for (const c of snap.sensitivity.cases) {
      expect(first.text).toContain(c.id);
      for (const r of c.rules) {
        // The rule's row carries its root bending and torsion as the report prints loads (the rule's
        // name may wrap in its cell: its first word is on the row).
        const row = lines.find((l) => l.includes(RULE_LABELS[r.rule].split(" ")[0]!) && l.includes(kNm(r.root.bending)) && l.includes(kNm(r.root.torsion)));
        expect(row, `${c.id} ${r.rule}`).toBeDefined();
      }
    }
  });
});

describe("spanwise methods overlaid", () => {
  it("shows the vortex lattice, the lifting line and Schrenk for the demo's unswept wing, Schrenk carrying the same lift", async () => {
    const snap = first.row.snapshot as unknown as Snapshot;
    const trimmed = snap.exchange.cases.find((k) => k.nz !== undefined)!;
    const body = (await json(spanwiseMethodsLoader, `/api/cases/${caseId}/spanwise-methods?case=${encodeURIComponent(trimmed.id)}`)) as { comparison: SpanwiseComparison };
    const ways = body.comparison.ways;
    expect(ways.map((w) => `${w.way}:${w.valid}`)).toEqual(["vortex-lattice:true", "lifting-line:true", "schrenk:true"]);
    const [vlm, ll, schrenk] = ways as Extract<SpanwiseComparison["ways"][number], { valid: true }>[];
    // A trimmed case: every method carries the same wing lift, so the same root shear (statics).
    expect(ll!.root.shear).toBeCloseTo(vlm!.root.shear, 3);
    expect(schrenk!.root.shear).toBeCloseTo(vlm!.root.shear, 3);
    // The vortex lattice here is the case's own method: its root loads are the case's results.
    const own = snap.result.cases.find((k) => k.id === trimmed.id);
    // The case's results may come through the Mach grid, whose stated accuracy is 1e-4 relative
    // (docs/engine.md); the comparison solves at the case's own Mach number directly.
    if (own) expect(Math.abs(vlm!.root.bending - own.root.bending)).toBeLessThan(1e-4 * Math.abs(own.root.bending));
  });

  it("leaves the lifting line and Schrenk out of a wing swept 25°, saying why", async () => {
    const swept = JSON.parse(fs.readFileSync("docs/examples/kf60-tern-swept-variant.json", "utf8")) as CaseFileInput;
    const c = spanwiseComparison(swept, swept.cases[0]!.id);
    const ll = c.ways.find((w) => w.way === "lifting-line")!;
    const schrenk = c.ways.find((w) => w.way === "schrenk")!;
    expect(ll.valid).toBe(false);
    expect(!ll.valid && ll.reason).toMatch(/limited to 15° of quarter-chord sweep/);
    expect(!schrenk.valid && schrenk.reason).toMatch(/unswept wings.*25\.0°/);
    expect(c.ways.find((w) => w.way === "vortex-lattice")!.valid).toBe(true);
  });

  it("prints the methods, their root loads and differences in the report", () => {
    const snap = first.row.snapshot as unknown as Snapshot;
    expect(first.text).toContain("Spanwise methods compared");
    // The spanwise comparison is of a case's symmetric condition: a rolling side counts as its case.
    expectRootCritical(snap.spanwise.map((c) => c.caseId), snap.result, (label) => attributionOf(label).id);
    for (const c of snap.spanwise) {
      for (const w of c.ways) if (w.valid) expect(first.text).toContain(kNm(w.root.bending));
    }
    expect(first.text).toMatch(/Lifting line/);
    expect(first.text).toMatch(/Schrenk approximation/);
  });
});

describe("richer section data travel with the report too", () => {
  it("attaches them as spanwright.sections/1, byte for byte as the export's sections part gives them", async () => {
    // Give the case Cp,min against lift (invented values) and issue the next version.
    const steps = await getCaseSteps(caseId);
    const saved = steps.sections.data as { rows: { y: number; cpMin?: number }[] };
    const rows = saved.rows.map((r) => ({ ...r, cpMinTable: [{ cl: 0, cpMin: -0.4 }, { cl: 0.5, cpMin: (r.cpMin ?? -0.6) - 0.02 }, { cl: 1.2, cpMin: -1.6 }] }));
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    await saveStep({ caseId, step: "sections", baseRevision: steps.sections.revision, data: { ...saved, rows }, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
    await approveAll();
    const second = await issue();
    const stem = second.row.reportNumber.replace(/[^A-Za-z0-9._-]+/g, "_");
    expect(execFileSync("pdfdetach", ["-list", second.file], { encoding: "utf8" })).toContain(`${stem}.sections.json`);
    const out = path.join(second.dir, "attached");
    fs.mkdirSync(out);
    execFileSync("pdfdetach", ["-saveall", "-o", out, second.file]);
    const attached = fs.readFileSync(path.join(out, `${stem}.sections.json`));
    const res = (await exportLoader((await routeArgs(request(`/api/v1/cases/${caseId}/export?part=sections`, { cookie: cookies.engineer }), { caseId })) as never)) as Response;
    expect(res.status).toBe(200);
    expect(Buffer.from(attached).equals(Buffer.from(new Uint8Array(await res.arrayBuffer())))).toBe(true);
    // The command line the report prints reads them, and the result says it used them.
    const caseDoc = parseCase(JSON.parse(fs.readFileSync(path.join(out, `${stem}.case.json`), "utf8")));
    if (!caseDoc.ok) throw new Error("the attached case must parse");
    expect(parseSections(JSON.parse(attached.toString("utf8")), caseDoc.value).ok).toBe(true);
    expect(second.text).toContain(`--sections ${stem}.sections.json`);
    const result = JSON.parse(fs.readFileSync(path.join(out, `${stem}.result.json`), "utf8")) as { method: { criticalMach: string } };
    expect(result.method.criticalMach).toBe("cp-min-against-lift");
  }, 180_000);
});

describe("report to report", () => {
  let third: Awaited<ReturnType<typeof issue>>;
  let massBefore = 0;
  let massAfter = 0;
  const compare = async (query: string) => {
    const res = await compareLoader((await routeArgs(request(`/cases/${caseId}/reports/compare?${query}`, { cookie: cookies.checker }), { caseId })) as never);
    return res as Awaited<ReturnType<typeof compareLoader>>;
  };

  beforeAll(async () => {
    // A heavier wing structure (invented: +15 %) changes the inertia relief, so the loads move.
    const steps = await getCaseSteps(caseId);
    const masses = steps.masses.data as { structureKg: number };
    massBefore = masses.structureKg;
    massAfter = Math.round(massBefore * 1.15);
    const [erin] = await db.select().from(users).where(eq(users.email, demoUser("engineer").email));
    await saveStep({ caseId, step: "masses", baseRevision: steps.masses.revision, data: { ...masses, structureKg: massAfter }, actor: { id: erin!.id, email: erin!.email, name: erin!.name } });
    await approveAll();
    third = await issue();
  }, 240_000);

  it("compares any two issued versions on the page: each changed input by step and field, the envelope at each station", async () => {
    const view = await compare(`from=${first.row.id}&to=${third.row.id}`);
    expect(view.problem).toBeNull();
    const c = view.comparison!;
    expect([c.from.version, c.to.version]).toEqual([first.row.version, third.row.version]);
    // Version 1 → 3 spans both edits: the sections' Cp,min tables (version 2) and the structural mass (version 3).
    expect(c.inputs).toContainEqual({ step: "masses", field: "structureKg", before: String(massBefore), after: String(massAfter) });
    expect(c.inputs.some((x) => x.step === "sections" && x.field.endsWith("cpMinTable"))).toBe(true);
    expect(new Set(c.inputs.map((x) => x.step))).toEqual(new Set(["sections", "masses"]));
    // Every station's extremes are those of the two issued results, as stored.
    const a = (first.row.snapshot as unknown as Snapshot).result.envelope;
    const b = (third.row.snapshot as unknown as Snapshot).result.envelope;
    expect(c.interpolated).toBe(false);
    expect(c.stations).toHaveLength(b.length);
    c.stations.forEach((st, i) => {
      expect(st.y).toBe(b[i]!.y);
      for (const k of ["shearMax", "shearMin", "bendingMax", "bendingMin", "torsionMax", "torsionMin"] as const) {
        expect(st.before[k]).toBe(a[i]![k]);
        expect(st.after[k]).toBe(b[i]![k]);
      }
    });
    // More structure, more relief: the positive root bending falls (statics, common practice, no source).
    expect(c.stations[0]!.after.bendingMax).toBeLessThan(c.stations[0]!.before.bendingMax);
    // Chosen the other way round, the earlier version is still "from".
    expect((await compare(`from=${third.row.id}&to=${first.row.id}`)).comparison!.from.version).toBe(first.row.version);
  });

  it("says what is wrong with a version that is not an issued report of the case, naming the field", async () => {
    const view = await compare(`from=${first.row.id}&to=00000000-0000-4000-8000-000000000000`);
    expect(view.problem).toMatch(/^to: /);
    expect((await compare(`from=${first.row.id}&to=${first.row.id}`)).problem).toMatch(/two different versions/);
  });

  it("prints the changes from the previous version in the next report", () => {
    const snap = third.row.snapshot as unknown as Snapshot & { comparison: { from: { version: number }; inputs: { field: string }[] } };
    expect(snap.comparison.from.version).toBe(third.row.version - 1);
    expect(snap.comparison.inputs.map((x) => x.field)).toEqual(["structureKg"]);
    expect(third.text).toContain("Changes from the previous version");
    // Fields are named in words with their unit (app/domain/input-fields.ts), values as stored.
    const line = third.text.split("\n").find((l) => l.includes("Semispan structural mass [kg]"));
    expect(line).toMatch(new RegExp(`${massBefore}\\s+${massAfter}`));
    expect(first.text).toContain("This is the first issued version of the report");
  });

  it("gives the comparison of any two versions as a PDF that says it is not a report", async () => {
    const res = (await comparisonPdfLoader((await routeArgs(request(`/api/cases/${caseId}/report-comparison?from=${first.row.id}&to=${third.row.id}`, { cookie: cookies.quality }), { caseId })) as never)) as Response;
    expect(res.status).toBe(200);
    expect(res.headers.get("Content-Type")).toBe("application/pdf");
    const file = path.join(third.dir, "comparison.pdf");
    fs.writeFileSync(file, new Uint8Array(await res.arrayBuffer()));
    const text = execFileSync("pdftotext", ["-layout", "-enc", "UTF-8", file, "-"], { encoding: "utf8" });
    expect(text).toContain(first.row.reportNumber);
    expect(text).toContain(third.row.reportNumber);
    expect(text).toContain("not a report, unsigned");
    expect(text).toContain("Semispan structural mass [kg]");
    expect(text).toMatch(/Cp,min against lift/);
    const refused = (await comparisonPdfLoader((await routeArgs(request(`/api/cases/${caseId}/report-comparison?from=${first.row.id}&to=${first.row.id}`, { cookie: cookies.quality }), { caseId })) as never)) as Response;
    expect(refused.status).toBe(400);
  });
});

describe("reproduction: re-run this report", () => {
  afterAll(async () => {
    await stopBoss();
  });

  /** Every number in a JSON value, counted here (not by the product). */
  const numbers = (v: unknown): number => (typeof v === "number" ? 1 : Array.isArray(v) ? v.reduce<number>((n, x) => n + numbers(x), 0) : v && typeof v === "object" ? Object.values(v).reduce<number>((n, x) => n + numbers(x), 0) : 0);
  const rerunOf = async (reportId: string) => {
    const res = await run(reportsAction, { request: request(`/cases/${caseId}/reports`, { method: "POST", cookie: cookies.checker, body: form({ intent: "rerun", reportId }) }), params: { caseId } });
    expect(res.status).toBe(200);
    const [row] = await db.select().from(reportReruns).where(eq(reportReruns.reportId, reportId)).orderBy(desc(reportReruns.createdAt)).limit(1);
    expect(row!.status).toBe("queued");
    // The job's handler, as the worker runs it.
    await runRerun(row!.id);
    const [done] = await db.select().from(reportReruns).where(eq(reportReruns.id, row!.id));
    return done!;
  };

  it("recomputes every number of an issued report from its stored inputs and finds them identical", async () => {
    // The steps have moved on since this version: the case no longer stores the result of its input
    // (stored results of earlier inputs are pruned), and the report is re-run from its snapshot alone.
    expect(await db.select({ id: caseResults.id }).from(caseResults).where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, first.row.inputHash!)))).toEqual([]);
    const done = await rerunOf(first.row.id);
    expect(done.status).toBe("done");
    const snap = first.row.snapshot as unknown as Snapshot;
    const recomputed = done.result as unknown as Snapshot;
    // Every number compared here, by the test: the results, the rule sensitivity and the spanwise methods.
    expect({ ...recomputed.result, engine: null }).toEqual({ ...snap.result, engine: null });
    expect(recomputed.sensitivity).toEqual(snap.sensitivity);
    expect(recomputed.spanwise).toEqual(snap.spanwise);
    expect(done.compared).toBe(numbers(snap.result) + numbers(snap.sensitivity) + numbers(snap.spanwise));
    expect(done.identical).toBe(true);
    expect(done.differing).toBe(0);
    expect(done.engineVersion).toBe(ENGINE_VERSION);
    // The reports page says so, with both engine versions.
    const page = (await reportsLoader((await routeArgs(request(`/cases/${caseId}/reports`, { cookie: cookies.quality }), { caseId })) as never)) as Awaited<ReturnType<typeof reportsLoader>>;
    const shown = page.reruns[first.row.id]!;
    expect(shown).toMatchObject({ status: "done", identical: true, engineVersion: ENGINE_VERSION, issuedEngine: first.row.engineVersion });
    expect(page.rerunning).toBe(false);
  }, 180_000);

  it("re-runs a report whose inputs carry richer section data, with them", async () => {
    const [latest] = await db.select().from(reports).where(eq(reports.caseId, caseId)).orderBy(desc(reports.version)).limit(1);
    const done = await rerunOf(latest!.id);
    expect(done.identical).toBe(true);
    expect(done.compared).toBeGreaterThan(1000);
  }, 180_000);

  it("refuses a report that is not issued, naming the field, and writes nothing", async () => {
    const before = await db.select().from(reportReruns);
    const res = await run(reportsAction, { request: request(`/cases/${caseId}/reports`, { method: "POST", cookie: cookies.checker, body: form({ intent: "rerun", reportId: "00000000-0000-4000-8000-000000000000" }) }), params: { caseId } });
    expect(res.status).toBe(404);
    expect(JSON.stringify(res.body)).toContain("reportId");
    expect(await db.select().from(reportReruns)).toHaveLength(before.length);
  });
});
