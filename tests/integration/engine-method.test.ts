import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases } from "~/db/schema";
import type { SectionsData } from "~/domain/step-data";
import { parseCase, parseSections, runCase, type CaseResult } from "~/exchange";
import { loader as distributionLoader } from "~/routes/cases/distribution";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { loader as loadsLoader } from "~/routes/cases/loads";
import { action as sectionsAction } from "~/routes/cases/sections";
import { exportCaseDocuments, resultsFor } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { cookieFor, form, request, run, seed } from "./helpers";

/*
 * The application's side of the engine's method choices (issue 11): the strips field of the method
 * panel, section polar files with Cp,min per angle, chordwise pressures per station, and the pages that
 * say what was used and about which axis the loads are taken. The numbers themselves are the engine's
 * (checked against published values in app/engine); here the check is that the application hands the
 * engine exactly what the engineer gave, as the command line would get it from the export.
 */

let caseId = "";
let title = "";
let engineer = "";

beforeAll(async () => {
  await seed();
  engineer = await cookieFor("engineer");
  const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  caseId = demo!.id;
  title = demo!.title;
});

const post = (fields: Record<string, string>) => request(`/cases/${caseId}/sections`, { method: "POST", cookie: engineer, body: form(fields) });
const revisionOf = async (step: "sections" | "envelope") => String((await getCaseSteps(caseId))[step].revision);
const savedSections = async () => (await getCaseSteps(caseId)).sections.data as SectionsData;

async function upload(name: string, text: string) {
  const body = new FormData();
  body.append("file", new File([text], name, { type: "text/csv" }));
  return run(sectionsAction, { request: request(`/cases/${caseId}/sections`, { method: "POST", cookie: engineer, body }), params: { caseId } });
}

/** Uploads a file, checks the preview came back, and accepts it into the sections step. */
async function uploadAndAccept(name: string, text: string) {
  const res = await upload(name, text);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const preview = (res.body as { preview: { uploadId: string } }).preview;
  const accepted = await run(sectionsAction, { request: post({ intent: "accept-upload", revision: await revisionOf("sections"), uploadId: preview.uploadId }), params: { caseId } });
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
  return preview;
}

/** The case's stored result, and what the engine answers for the exported pair of documents (the command line's input). */
async function resultAndCommandLine(): Promise<{ stored: CaseResult; fromExport: CaseResult }> {
  const { file, sections } = await exportCaseDocuments(caseId, title);
  const stored = (await resultsFor(caseId, file, null, sections)).result;
  const parsed = parseCase(JSON.parse(JSON.stringify(file)));
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  const checked = sections ? parseSections(JSON.parse(JSON.stringify(sections)), parsed.value) : undefined;
  if (checked && !checked.ok) throw new Error(JSON.stringify(checked.problems));
  return { stored, fromExport: JSON.parse(JSON.stringify(runCase(parsed.value, { sections: checked?.value }))) };
}

// An invented polar of the demo's sections: cl linear in α up to the stall, Cp,min growing with lift.
const ANGLES = [-4, -2, 0, 2, 4, 6, 8, 10, 12, 14, 16];
function polarCsv(): string {
  const lines = ["y,alpha,cl,cm,cpMin"];
  for (const [y, a0PerDeg, alphaL0, clMax] of [
    [0, 0.1056, -2.2, 1.72],
    [3.2, 0.1047, -2.0, 1.66],
    [8.7, 0.103, -1.6, 1.5],
  ] as const) {
    for (const a of ANGLES) {
      const linear = a0PerDeg * (a - alphaL0);
      const cl = Math.min(linear, clMax - 0.02 * Math.max(0, a - 13) ** 2);
      const cpMin = -0.35 - 0.45 * Math.max(cl, 0) - 0.9 * Math.max(cl, 0) ** 2 - 0.3 * Math.max(-cl, 0);
      lines.push(`${y},${a},${cl.toFixed(4)},-0.05,${cpMin.toFixed(4)}`);
    }
  }
  return lines.join("\n") + "\n";
}

// Invented chordwise pressures at two angles: a suction peak near the leading edge that grows with α.
function pressureCsv(ys: number[]): string {
  const x = [0, 0.0125, 0.025, 0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1];
  const lines = ["y,alpha,x,cpUpper,cpLower"];
  for (const y of ys) {
    for (const a of [0, 4]) {
      for (const v of x) {
        const upper = v === 0 ? 1 : -(0.45 + 0.12 * a) * Math.sqrt((1 - v) / (v + 0.05)) * 0.35 + 0.15 * v;
        const lower = v === 0 ? 1 : (0.05 + 0.02 * a) * (1 - v) - 0.15 * Math.sqrt(1 - v) * (1 - 0.1 * a) + 0.1 * v;
        lines.push(`${y},${a},${v},${upper.toFixed(5)},${lower.toFixed(5)}`);
      }
    }
  }
  return lines.join("\n") + "\n";
}

describe("section polar files with Cp,min per angle (they were refused)", () => {
  it("are accepted; each case's critical Mach number is then read at its own lift, as the exported documents give it", async () => {
    const preview = await uploadAndAccept("kf60-polars.csv", polarCsv());
    expect(preview).toBeDefined();
    const rows = (await savedSections()).rows;
    expect(rows.map((r) => r.cpMinTable?.length)).toEqual([expect.any(Number), expect.any(Number), expect.any(Number)]);
    expect(rows.every((r) => r.cpMinTable!.length >= 8)).toBe(true);
    const { stored, fromExport } = await resultAndCommandLine();
    expect(stored.method.criticalMach).toBe("cp-min-against-lift");
    expect(stored).toEqual(fromExport);
    // A stronger suction peak gives a lower critical Mach number (REFERENCES 1.4: Mcr falls as Cp0,min falls,
    // NACA Report 1135 with the chosen rule): the case of most lift has the lowest critical Mach number.
    const trimmed = stored.cases.filter((c) => c.machCritical !== null);
    const most = trimmed.reduce((a, b) => (b.cl > a.cl ? b : a));
    const least = trimmed.reduce((a, b) => (b.cl < a.cl && b.cl > 0 ? b : a));
    expect(most.machCritical!).toBeLessThan(least.machCritical!);
  });

  it("keep their Cp,min table through a typed edit of the coefficients", async () => {
    const before = await savedSections();
    const fields: Record<string, string> = { intent: "save", revision: await revisionOf("sections") };
    before.rows.forEach((r, i) => {
      Object.assign(fields, { [`rows.${i}.y`]: String(r.y), [`rows.${i}.a0`]: String(i === 0 ? 6.1 : r.a0), [`rows.${i}.alphaL0`]: String(r.alphaL0), [`rows.${i}.cmAc`]: String(r.cmAc), [`rows.${i}.clMax`]: String(r.clMax ?? ""), [`rows.${i}.cpMin`]: String(r.cpMin ?? ""), [`rows.${i}.cpMinCl`]: String(r.cpMinCl ?? "") });
    });
    const saved = await run(sectionsAction, { request: post(fields), params: { caseId } });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    const after = await savedSections();
    expect(after.rows[0]!.a0).toBe(6.1);
    expect(after.rows.map((r) => r.cpMinTable)).toEqual(before.rows.map((r) => r.cpMinTable));
  });
});

describe("chordwise pressures per station", () => {
  it("are added to the saved stations; with Kármán–Tsien the rule is then applied point by point there, and the result says so", async () => {
    const env = await run(envelopeAction, {
      request: request(`/cases/${caseId}/envelope`, { method: "POST", cookie: engineer, body: form({ intent: "generate", revision: await revisionOf("envelope"), compressibility: "karman-tsien", spanwise: "vortex-lattice", stations: "40" }) }),
      params: { caseId },
    });
    expect(env.status, JSON.stringify(env.body)).toBe(200);
    await uploadAndAccept("kf60-pressures.csv", pressureCsv([0, 3.2, 8.7]));
    const rows = (await savedSections()).rows;
    expect(rows.every((r) => r.pressures?.length === 2)).toBe(true);
    const { stored, fromExport } = await resultAndCommandLine();
    expect(stored.method.sectionScaling).toBe("point-by-point");
    expect(stored).toEqual(fromExport);
  });

  it("are refused for a station the section data do not have, naming it, and nothing changes", async () => {
    const before = await getCaseSteps(caseId);
    const res = await upload("stray.csv", pressureCsv([5]));
    const preview = (res.body as { preview: { uploadId: string } }).preview;
    const accepted = await run(sectionsAction, { request: post({ intent: "accept-upload", revision: String(before.sections.revision), uploadId: preview.uploadId }), params: { caseId } });
    expect(accepted.status).toBe(400);
    expect(JSON.stringify(accepted.body)).toMatch(/stations at y = 5 m, which the section data do not have/);
    expect((await getCaseSteps(caseId)).sections.revision).toBe(before.sections.revision);
  });

  it("can be removed: the rule then scales at each section's Cp,min again", async () => {
    const removed = await run(sectionsAction, { request: post({ intent: "remove-pressures", revision: await revisionOf("sections") }), params: { caseId } });
    expect(removed.status, JSON.stringify(removed.body)).toBe(200);
    expect((await savedSections()).rows.some((r) => r.pressures)).toBe(false);
    const { stored } = await resultAndCommandLine();
    expect(stored.method.sectionScaling).toBe("at-cp-min");
  });
});

describe("the vortex-lattice strips of the method panel", () => {
  const generate = async (extra: Record<string, string>) =>
    run(envelopeAction, {
      request: request(`/cases/${caseId}/envelope`, { method: "POST", cookie: engineer, body: form({ intent: "generate", revision: await revisionOf("envelope"), compressibility: "karman-tsien", spanwise: "vortex-lattice", stations: "40", ...extra }) }),
      params: { caseId },
    });

  it("are refused outside 8–2000 and with the lifting line, naming the field, and nothing is saved", async () => {
    const before = await revisionOf("envelope");
    const few = await generate({ strips: "4" });
    expect(few.status).toBe(400);
    expect((few.body as { fieldErrors: Record<string, string[]> }).fieldErrors.strips?.[0]).toMatch(/At least 8 strips/);
    const line = await generate({ strips: "80", spanwise: "lifting-line" });
    expect(line.status).toBe(400);
    expect((line.body as { fieldErrors: Record<string, string[]> }).fieldErrors.strips?.[0]).toMatch(/vortex lattice only/);
    expect(await revisionOf("envelope")).toBe(before);
  });

  it("are used and reported: the result, the export and the distribution page say how many, with the convergence estimate", async () => {
    expect((await generate({ strips: "120" })).status).toBe(200);
    const { file } = await exportCaseDocuments(caseId, title);
    expect(file.method?.strips).toBe(120);
    const { stored, fromExport } = await resultAndCommandLine();
    expect(stored.method.strips).toBe(120);
    expect(stored.method.convergence.halfResolution).toBe(60);
    expect(stored).toEqual(fromExport);
    const page = await run(distributionLoader, { request: request(`/cases/${caseId}/distribution`, { cookie: engineer }), params: { caseId } });
    expect(page.status).toBe(200);
    expect((page.body as { page: { method: CaseResult["method"] } }).page.method).toEqual(stored.method);
  });
});

describe("the loads page states the axis convention", () => {
  it("names the reference axis, its sweep, and how bending and torsion are resolved about it", async () => {
    const page = await run(loadsLoader, { request: request(`/cases/${caseId}/loads`, { cookie: engineer }), params: { caseId } });
    const text = (page.body as { axisConvention: string }).axisConvention;
    // The demo's axis runs from 35 % of the 2.1 m root chord (x = 0.735 m) to 35 % of the 0.95 m tip chord at
    // x_LE = 0.55 m (x = 0.8825 m), 8.7 m outboard: atan(0.1475/8.7) = 0.97° aft (plane geometry).
    expect(text).toMatch(/from 35 % of the root chord to 35 % of the tip chord \(swept 1\.0° aft\)/);
    expect(text).toMatch(/torsion is its component along the axis/);
    expect(text).toMatch(/bending its component about the in-plane normal to the axis/);
  });
});
