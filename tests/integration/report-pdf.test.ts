import { execFile } from "node:child_process";
import { mkdtemp, readdir, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { formatNumber, formatQuantity, fromSI } from "~/domain/units";
import { db } from "~/db/client.server";
import { cases, organisations, programmes, stepRevisions } from "~/db/schema";
import { ENGINE_VERSION } from "~/engine";
import { fontRuns } from "~/reports/pdf/fonts.server";
import type { ReportSnapshot } from "~/reports/snapshot";
import { buildCaseFile, caseInputs, resultsFor } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { flaggedCases } from "~/services/distribution.server";
import { effectiveMasses } from "~/services/masses.server";
import { renderReport } from "~/services/report-contents.server";
import { DEMO_CASE_INPUTS } from "~/demo/scenario";
import { seed } from "./helpers";
import { attributionOf } from "~/exchange";

const run = promisify(execFile);
const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

let snapshot: ReportSnapshot;
let pdf: Uint8Array;
let dir = "";
let pdfPath = "";
let pages: string[] = [];
const notes: string[] = [];

// Invented signers; the first name needs the latin-ext subset (Ł, Ż), the second only latin (é, Ø, å).
const CHECKER = "Łucja Żak";
const RELEASER = "Renée Ødegård";

async function buildSnapshot(): Promise<ReportSnapshot> {
  const [row] = await db
    .select({ c: cases, p: programmes, o: organisations })
    .from(cases)
    .innerJoin(programmes, eq(programmes.id, cases.programmeId))
    .innerJoin(organisations, eq(organisations.id, cases.organisationId))
    .where(eq(cases.reference, "TN-WL-001"));
  const { c, p, o } = row!;
  const steps = await getCaseSteps(c.id);
  const inputs = caseInputs(steps);
  const exchange = buildCaseFile(c.title, inputs);
  const { result, inputHash } = await resultsFor(c.id, exchange, null);
  // Flags come from every case the envelope includes, as the distribution step shows them.
  const { result: examined } = await resultsFor(c.id, buildCaseFile(c.title, inputs, "envelope"), null);
  const dispositions = inputs.distribution!.dispositions;
  const [loadsRev] = await db.select().from(stepRevisions).where(and(eq(stepRevisions.caseId, c.id), eq(stepRevisions.step, "loads"), eq(stepRevisions.revision, steps.loads.revision)));
  return {
    reportId: "00000000-0000-4000-8000-000000000001",
    reportNumber: "KF60-LR-0001",
    version: 1,
    issuedAt: "2026-12-01T09:30:00.000Z",
    organisation: o.name,
    programme: { code: p.code, name: p.name, aircraft: p.aircraft },
    case: { id: c.id, reference: c.reference, title: c.title, description: c.description },
    revisions: Object.fromEntries(Object.entries(steps).map(([k, st]) => [k, st.revision])),
    inputHash,
    engineVersion: ENGINE_VERSION,
    inputs: {
      basis: inputs.basis!,
      planform: inputs.planform!,
      sections: inputs.sections!,
      envelope: inputs.envelope!,
      distribution: inputs.distribution!,
      loads: inputs.loads!,
      masses: effectiveMasses(inputs),
    },
    exchange,
    result,
    flags: flaggedCases(examined).map((f) => ({ ...f, action: dispositions[f.id]?.action ?? "none", comment: dispositions[f.id]?.comment ?? "" })),
    signatures: [
      { step: "loads", name: CHECKER, role: "checker", meaning: "Checked: loads agree with the inputs", signedAt: "2026-11-30T16:05:12.000Z", revision: steps.loads.revision, revisionHash: loadsRev!.hash },
      { step: null, name: RELEASER, role: "quality", meaning: "Released for issue", signedAt: "2026-12-01T09:29:40.000Z", revision: null, revisionHash: inputHash },
    ],
  };
}

beforeAll(async () => {
  await seed();
  snapshot = await buildSnapshot();
  const started = performance.now();
  pdf = await renderReport(snapshot, { onProgress: (pct, note) => notes.push(`${pct} ${note}`) });
  notes.push(`render ${(performance.now() - started).toFixed(0)} ms`);
  dir = await mkdtemp(join(tmpdir(), "spanwright-report-"));
  pdfPath = join(dir, "report.pdf");
  await writeFile(pdfPath, pdf);
  const { stdout } = await run("pdftotext", ["-layout", "-enc", "UTF-8", pdfPath, "-"], { maxBuffer: 64 * 1024 * 1024 });
  // pdftotext ends every page with a form feed.
  pages = stdout.split("\f").slice(0, -1);
}, 120_000);

describe("the signed report PDF of the demo case", () => {
  it("is a PDF of several A4 pages with progress reported to 100", async () => {
    expect(Buffer.from(pdf.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
    const { stdout } = await run("pdfinfo", [pdfPath]);
    expect(stdout).toMatch(/Page size:\s+595\.28 x 841\.89 pts \(A4\)/);
    expect(pages.length).toBeGreaterThan(6);
    expect(notes.some((n) => n.startsWith("100 "))).toBe(true);
    process.stdout.write(`report: ${pages.length} pages, ${pdf.length} bytes, ${notes.at(-1)}; PDF and pages in ${dir}\n`);
  });

  it("holds the case title, report number and the critical root bending moment as printed", () => {
    const text = pages.join("\n");
    expect(text).toContain(snapshot.case.title);
    expect(text).toContain(snapshot.reportNumber);
    // The critical case picked here, not by the report's own function: the largest root bending moment in magnitude.
    let crit = snapshot.result.cases[0]!;
    for (const c of snapshot.result.cases) if (Math.abs(c.root.bending) > Math.abs(crit.root.bending)) crit = c;
    // The cover prints it with its unit; the root-loads table in the header's unit.
    expect(text).toContain(formatQuantity(snapshot.inputs.basis.units, "moment", crit.root.bending));
    const tableRow = new RegExp(`${escape(crit.id)}\\s.*${escape(formatNumber(fromSI(snapshot.inputs.basis.units, "moment", crit.root.bending)))}`);
    expect(text).toMatch(tableRow);
  });

  it("keeps every signer's name with its accents", () => {
    const text = pages.join("\n");
    for (const g of snapshot.signatures) expect(text).toContain(g.name);
    expect(text).toContain(CHECKER);
    expect(text).toContain(RELEASER);
  });

  it("cuts names into runs of the subset each character needs", () => {
    expect(fontRuns(CHECKER)).toEqual([
      { subset: "latin-ext", text: "Ł" },
      { subset: "latin", text: "ucja " },
      { subset: "latin-ext", text: "Ż" },
      { subset: "latin", text: "ak" },
    ]);
    expect(fontRuns(RELEASER)).toEqual([{ subset: "latin", text: RELEASER }]);
  });

  it("has the footer with report, version, input hash and page N of M on every page", () => {
    const total = pages.length;
    pages.forEach((page, i) => {
      expect(page).toContain(`Report ${snapshot.reportNumber} v${snapshot.version} · inputs ${snapshot.inputHash.slice(0, 16)} · page ${i + 1} of ${total}`);
    });
  });

  it("embeds Source Sans 3 and no other font", async () => {
    const { stdout } = await run("pdffonts", [pdfPath]);
    const rows = stdout.split("\n").slice(2).filter((l) => l.trim());
    expect(rows.length).toBeGreaterThan(1);
    for (const r of rows) {
      expect(r).toMatch(/^[A-Z]{6}\+SourceSans3-/);
      // Columns emb, sub, uni: embedded, subset, with a ToUnicode map (text stays searchable).
      expect(r).toMatch(/\syes\s+yes\s+yes\s/);
    }
  });

  it("renders the same bytes twice from the same snapshot", async () => {
    const again = await renderReport(structuredClone(snapshot));
    expect(again.length).toBe(pdf.length);
    expect(Buffer.compare(Buffer.from(again), Buffer.from(pdf))).toBe(0);
  });

  it("lists flagged cases with the reason and the disposition", async () => {
    // The demo case has no flagged case; an invented flag on a copy shows the table.
    const flagged = structuredClone(snapshot);
    const comment = "Invented disposition for this check: the case is kept to cover the stall boundary.";
    flagged.flags = [{ id: flagged.result.cases[0]!.id, reasons: ["cl exceeds the section clmax at 2 stations (y = 8.10–8.40 m); worst cl/clmax = 1.020 at y = 8.40 m"], action: "justify", comment }];
    const path = join(dir, "flagged.pdf");
    await writeFile(path, await renderReport(flagged));
    const { stdout } = await run("pdftotext", ["-enc", "UTF-8", path, "-"], { maxBuffer: 64 * 1024 * 1024 });
    const section = stdout.slice(stdout.indexOf("Flagged cases and their dispositions"));
    expect(section).toContain("kept, justified");
    expect(section).toContain(flagged.flags[0]!.id);
    // Table cells wrap and interleave in extracted text: the comment's words, in order.
    expect(section).toMatch(new RegExp(comment.split(" ").map(escape).join("[\\s\\S]*?")));
  });

  it("says in its method statement about which axis the loads are taken and what this case's solve used", () => {
    // Words wrap across lines in extracted text: compare with the white space folded.
    const text = pages.join("\n").replace(/\s+/g, " ");
    const method = text.slice(text.indexOf("As computed for this case"));
    expect(method.length).toBeGreaterThan(0);
    expect(method).toMatch(/torsion is its component along the axis \(nose up positive\), bending its component about the in-plane normal to the axis/);
    const m = snapshot.result.method;
    expect(method).toContain(`Vortex lattice, ${m.strips} strips per semispan`);
    expect(method).toContain(`With half the strips (${m.convergence.halfResolution})`);
    expect(method).toMatch(/Critical Mach number one Cp,min per section/);
  });

  it("lists the mass cases with the wing's own masses by hand-computed sums", () => {
    const text = pages.join("\n");
    const m = DEMO_CASE_INPUTS.masses;
    expect(text).toContain("Masses and balance");
    for (const mc of m.massCases) {
      // Both wings = 2 × (structure + Σ fill·mass of the items; items not named count fully), summed by hand.
      const fill = mc.fill as Record<string, number>;
      const items = m.items.reduce((sum, it) => sum + (fill[it.id] ?? 1) * it.kg, 0);
      const row = text.split("\n").find((l) => l.trimStart().startsWith(`${mc.id} `) && l.includes(formatQuantity("SI", "mass", mc.weight).replace(/ kg$/, "")));
      expect(row, mc.id).toBeDefined();
      expect(row!.replace(/\s+/g, " ")).toContain(formatNumber(2 * (m.structureKg + items), 4).replace(/ /g, " "));
    }
  });

  it("prints the balance of every trimmed case with tail load and wing lift summing to nz·W", () => {
    const text = pages.join("\n");
    expect(text).toContain("Balance per case");
    // One row: case, kind, mass case, nz, weight, tail load, wing lift, where the tail load came from.
    const num = "(-?\\d{1,3}(?: \\d{3})*(?:\\.\\d+)?)";
    const row = new RegExp(`^(W\\d+-\\S+)\\s+(manoeuvre|gust)\\s+(\\S+)\\s+${num}\\s+${num}\\s+${num}\\s+${num}\\s+(balance at|typed|none)`);
    const rows = text.split("\n").map((l) => row.exec(l.trim())).filter((m) => m !== null);
    expect(rows.length).toBeGreaterThan(10);
    const value = (t: string) => Number(t.replace(/ /g, ""));
    for (const m of rows) {
      // Vertical equilibrium of the aircraft (common practice, no source): wing lift + tail load = nz·W.
      const [nz, weight, tail, wing] = [value(m[4]!), value(m[5]!), value(m[6]!), value(m[7]!)];
      expect(Math.abs(wing + tail - nz * weight), m[0]).toBeLessThan(0.002 * Math.max(1, Math.abs(nz * weight)) + 0.01);
    }
    // Balanced from the masses step's inputs, not left at 0.
    expect(rows.some((m) => m[8] === "balance at" && value(m[6]!) !== 0)).toBe(true);
  });

  it("names the mass case of each root extreme of the envelope", () => {
    const text = pages.join("\n");
    const start = text.indexOf("Root envelope with the case and the mass case");
    expect(start).toBeGreaterThan(0);
    const ids = new Set<string>(DEMO_CASE_INPUTS.masses.massCases.map((m) => m.id));
    const root = snapshot.result.envelope[0]!;
    const massCaseOf = new Map(snapshot.exchange.cases.map((c) => [c.id, c.massCase]));
    const table = text.slice(start, start + 2000);
    for (const q of ["shear", "bending", "torsion"] as const) {
      // A rolling case's side is named after its id: "W2-roll-VC (loaded side)".
      const { id, side } = attributionOf(root[`${q}MaxCase`]);
      const mc = massCaseOf.get(id);
      expect(ids.has(mc!)).toBe(true);
      expect(table).toContain(id);
      if (side) expect(table).toContain(`(${side} side)`);
      expect(table).toContain(mc!);
    }
  });

  it("sets Pratt's K_g beside the rigid plunge response to the 25-chord gust it came from", () => {
    const text = pages.join("\n");
    expect(text).toContain("Gust response beside Pratt's formula");
    const rows = text.split("\n").map((l) => l.trim().split(/\s{2,}/)).filter((c) => c.length === 5 && / kg, \d+ m$/.test(c[0]!) && /^\d/.test(c[1]!));
    expect(rows.length).toBe(DEMO_CASE_INPUTS.masses.massCases.length * DEMO_CASE_INPUTS.basis.altitudes.length);
    for (const c of rows) {
      const [mu, kg, k] = [Number(c[1]), Number(c[2]), Number(c[3])];
      // K_g = 0.88μ/(5.3 + μ) (Pratt and Walker, NACA Report 1206; 14 CFR 23.341(c)), printed to four figures.
      expect(kg).toBeCloseTo((0.88 * mu) / (5.3 + mu), 3);
      // Report 1206 fitted K_g to this very response: they agree within a few per cent at these mass ratios (from memory).
      expect(Math.abs(k - kg) / kg).toBeLessThan(0.05);
    }
  });

  it("lists the flaps-extended cases with their kind, shows their V–n points and flap data, and says in its scope what they cover", () => {
    const text = pages.join("\n");
    const flapped = snapshot.exchange.cases.filter((c) => c.flaps);
    // 4 mass cases × 3 altitudes × the four points of 23.345(a) [M]: flaps-A, flaps-VF, flaps-gust±VF.
    expect(flapped).toHaveLength(DEMO_CASE_INPUTS.masses.massCases.length * DEMO_CASE_INPUTS.basis.altitudes.length * 4);
    for (const c of flapped) {
      const line = text.split("\n").find((l) => l.trimStart().startsWith(`${c.id} `));
      expect(line, c.id).toMatch(/^\s*\S+\s+(manoeuvre|gust), flaps\s/);
    }
    expect(text.replace(/\s+/g, " ")).toContain(`flaps extended in ${flapped.length} cases (14 CFR 23.345(a): n = 2.0 up to VF and gusts of 25 ft/s EAS at VF`);
    const f = DEMO_CASE_INPUTS.sections.flaps;
    expect(text.replace(/\s+/g, " ")).toContain(`Flaps extended from y = ${formatNumber(f.yFrom)} to ${formatNumber(f.yTo)} m: zero-lift angle changed by ${formatNumber(f.dAlphaL0)}°`);
    const vn = text.slice(text.indexOf("Corner and gust points"));
    for (const name of ["flaps-A", "flaps-VF", "flaps-gust+VF", "flaps-gust-VF"]) expect(text).toMatch(new RegExp(`\\n\\s*${escape(name)}\\s+[\\d.]+\\s+[\\d.]+\\s+14 CFR 23\\.345\\(a\\)`));
    expect(vn.length).toBeGreaterThan(0);
  });

  it("lists the rolling cases with their share and aileron deflection, the aileron data, their V–n points and an honest scope", () => {
    const text = pages.join("\n");
    const flat = text.replace(/\s+/g, " ");
    const rolling = snapshot.exchange.cases.filter((c) => c.roll);
    // 4 mass cases × 3 altitudes × (unsym-A of 23.349(a) [M], roll-VA, roll-VC, roll-VD of 23.455 [M]).
    expect(rolling).toHaveLength(DEMO_CASE_INPUTS.masses.massCases.length * DEMO_CASE_INPUTS.basis.altitudes.length * 4);
    for (const c of rolling) {
      const line = text.split("\n").find((l) => l.trimStart().startsWith(`${c.id} `));
      expect(line, c.id).toMatch(c.id.includes("unsym-A") ? /^\s*\S+\s+rolling, 75 %\s/ : /^\s*\S+\s+rolling, 100 %, δ [\d.]+°/);
    }
    expect(flat).toContain(`${rolling.length} rolling and unsymmetrical cases (14 CFR 23.349 and 23.455`);
    const a = DEMO_CASE_INPUTS.sections.aileron;
    expect(flat).toContain(`Aileron from y = ${formatNumber(a.yFrom)} to ${formatNumber(a.yTo)} m: section lift ${formatNumber(a.dClPerDeg)} and moment about the quarter chord ${formatNumber(a.dCmPerDeg)} per degree`);
    for (const name of ["unsym-A", "roll-VA", "roll-VC", "roll-VD"]) expect(text).toMatch(new RegExp(`\\n\\s*${escape(name)}\\s+[\\d.]+\\s+[\\d.]+\\s+14 CFR 23\\.(349|455)`));
    // What the simplified method leaves out, said in the scope.
    expect(flat).toContain("the inertia of the roll acceleration, the wing's flexibility");
    expect(flat).not.toContain("asymmetric, rolling, yawing or ground conditions");
  });

  it("gives each load case its speed (EAS) in the case table, which its rule text no longer carries", () => {
    const text = pages.join("\n");
    expect(text).toMatch(/EAS \[m\/s\]/);
    // At sea level EAS = TAS = M·a0, a0 = 340.294 m/s (ISA, ICAO Doc 7488 / U.S. Standard Atmosphere 1976).
    const seaLevel = snapshot.exchange.cases.filter((c) => c.altitude === 0 && /^W\d+-[A-Z]$/.test(c.id)).slice(0, 3);
    expect(seaLevel.length).toBeGreaterThan(0);
    for (const c of seaLevel) {
      const line = text.split("\n").find((l) => l.trimStart().startsWith(`${c.id} `))!;
      expect(line.split(/\s{2,}/).map((x) => x.trim()), c.id).toContain(formatNumber(c.mach * 340.294, 4));
    }
  });

  it("rasterises every page for a look", async () => {
    await run("pdftoppm", ["-png", "-r", "60", pdfPath, join(dir, "page")]);
    const pngs = (await readdir(dir)).filter((f) => f.endsWith(".png"));
    expect(pngs.length).toBe(pages.length);
  });
});

describe("the report of a case shown in US customary units", () => {
  // 1 ft = 0.3048 m, 1 lb = 0.45359237 kg (NIST SP 811, appendix B).
  const FT = 0.3048;
  let text = "";
  beforeAll(async () => {
    const us: ReportSnapshot = { ...snapshot, inputs: { ...snapshot.inputs, basis: { ...snapshot.inputs.basis, units: "US" } } };
    const file = join(dir, "report-us.pdf");
    await writeFile(file, await renderReport(us));
    text = (await run("pdftotext", ["-layout", "-enc", "UTF-8", file, "-"], { maxBuffer: 64 * 1024 * 1024 })).stdout;
  }, 120_000);

  it("states its units: the system chosen, and SI in which everything is stored and computed", () => {
    // A table cell may wrap anywhere ("m/ s"): compared without white space.
    expect(text.replace(/\s+/g, "")).toContain("UScustomary(ft,lb,lbf,lbf·ft,ktEAS)aschoseninthebasis;storedandcomputedinSI(m,kg,kN,kN·m,m/sEAS)");
  });

  it("names the V–n sets by weight in pounds and altitude in feet", () => {
    for (const h of DEMO_CASE_INPUTS.basis.altitudes) expect(text).toMatch(new RegExp(`\\d lb, ${Math.round(h / FT)} ft`));
    const captions = text.split("\n").filter((l) => /V–n diagram, |Corner and gust points, /.test(l));
    expect(captions.length).toBeGreaterThan(0);
    expect(captions.filter((l) => /\bkg\b|\d m\b/.test(l))).toEqual([]);
  });
});
