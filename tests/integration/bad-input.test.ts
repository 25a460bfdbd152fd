import fs from "node:fs";
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cases, programmes, stepComments } from "~/db/schema";
import { action as importAction } from "~/routes/api/v1/case-import";
import { action as analyzeAction } from "~/routes/api/v1/analyze";
import { action as previewAction } from "~/routes/api/planform-preview";
import { action as membersAction } from "~/routes/admin/members";
import { action as tokensAction } from "~/routes/account-tokens";
import { action as loginAction } from "~/routes/auth/login";
import { action as basisAction } from "~/routes/cases/basis";
import { action as envelopeAction } from "~/routes/cases/envelope";
import { action as newCaseAction } from "~/routes/cases/new";
import { loader as overviewLoader } from "~/routes/cases/overview";
import { action as planformAction } from "~/routes/cases/planform";
import { action as reviewAction, loader as reviewLoader } from "~/routes/cases/review";
import { action as sectionsAction } from "~/routes/cases/sections";
import { action as programmesAction } from "~/routes/programmes/list";
import { listKeys } from "~/services/storage.server";
import { cookieFor, form, request, routeArgs } from "./helpers";

/**
 * The bad-input corpus: for every form and API body, wrong types, missing and extra fields,
 * non-finite and huge numbers, impossible geometry and flight conditions, awkward CSV files and
 * oversized uploads. Each is refused with a 4xx that names the field, and the database (the row
 * count of every table) and storage (every object of both buckets) are exactly as before.
 */

type Handler = (args: never) => unknown;
const cookies: Record<string, string> = {};
let caseId = "";
let programmeId = "";
let demoCaseId = "";

async function snapshot() {
  const tables = await db.execute<{ schemaname: string; tablename: string }>(
    sql`SELECT schemaname, tablename FROM pg_tables WHERE schemaname NOT IN ('pg_catalog', 'information_schema') ORDER BY 1, 2`,
  );
  const rows: Record<string, number> = {};
  for (const t of tables.rows) {
    const r = await db.execute<{ n: string }>(sql.raw(`SELECT count(*) AS n FROM "${t.schemaname}"."${t.tablename}"`));
    rows[`${t.schemaname}.${t.tablename}`] = Number(r.rows[0]!.n);
  }
  const objects = {
    uploads: await listKeys(process.env.S3_BUCKET_UPLOADS ?? "spanwright-uploads"),
    reports: await listKeys(process.env.S3_BUCKET_REPORTS ?? "spanwright-reports"),
  };
  return { rows, objects };
}

/** Runs a handler and reads what it answered, whether returned or thrown, data() or a Response. */
async function answer(fn: Handler, req: Request, params: Record<string, string> = {}): Promise<{ status: number; text: string }> {
  let out: unknown;
  try {
    out = await fn((await routeArgs(req, params)) as never);
  } catch (thrown) {
    out = thrown;
  }
  if (out instanceof Response) return { status: out.status, text: await out.text() };
  if (out && typeof out === "object" && (out as { type?: string }).type === "DataWithResponseInit") {
    const d = out as { data: unknown; init: ResponseInit | null };
    return { status: d.init?.status ?? 200, text: JSON.stringify(d.data) };
  }
  if (out instanceof Error) throw out;
  return { status: 200, text: JSON.stringify(out) };
}

/**
 * Whether the answer names the field: a key of the form's fieldErrors, the path of an API problem,
 * or (for a body that could not be read at all) the API message.
 */
function namesField(text: string, field: string): boolean {
  const body = JSON.parse(text) as { fieldErrors?: Record<string, unknown>; problems?: { path?: string }[]; message?: string };
  if (body.fieldErrors && Object.keys(body.fieldErrors).includes(field)) return true;
  if (body.problems?.some((p) => String(p.path ?? "").includes(field))) return true;
  return !body.fieldErrors && !body.problems && typeof body.message === "string" && body.message.includes(field);
}

const post = (path: string, who: string, body: BodyInit, headers?: Record<string, string>) => request(path, { method: "POST", cookie: cookies[who], body, headers });
const json = (path: string, who: string, value: unknown) => post(path, who, typeof value === "string" ? value : JSON.stringify(value), { "Content-Type": "application/json" });

function planform(rows: string[][], extra: Record<string, string> = {}) {
  const out: Record<string, string> = { revision: "0", axisRoot: "0.35", axisTip: "0.35", ...extra };
  rows.forEach(([y, xLe, chord, twist], i) => Object.assign(out, { [`stations.${i}.y`]: y, [`stations.${i}.xLe`]: xLe, [`stations.${i}.chord`]: chord, [`stations.${i}.twist`]: twist }));
  return form(out);
}

function envelope(mach: string, altitude: string) {
  return form({ intent: "save", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "40", "cases.0.id": "X1", "cases.0.kind": "manual", "cases.0.mach": mach, "cases.0.altitude": altitude, "cases.0.weight": "6000", "cases.0.nz": "2.5" });
}

function csvUpload(content: BlobPart, name = "sections.csv") {
  const fd = new FormData();
  fd.append("file", new File([content], name, { type: "text/csv" }));
  return fd;
}

const example = () => JSON.parse(fs.readFileSync("docs/examples/kf60-tern-wing.json", "utf8")) as Record<string, unknown> & { wing: { stations: Record<string, unknown>[] }; loadCases?: unknown };

beforeAll(async () => {
  const { seed } = await import("./helpers");
  await seed();
  for (const who of ["engineer", "checker", "admin"]) cookies[who] = await cookieFor(who as never);
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  programmeId = p!.id;
  const [empty] = await db.select().from(cases).where(and(eq(cases.programmeId, p!.id), eq(cases.reference, "TN-WL-002")));
  caseId = empty!.id;
  const [demo] = await db.select().from(cases).where(and(eq(cases.programmeId, p!.id), eq(cases.reference, "TN-WL-001")));
  demoCaseId = demo!.id;
}, 60_000);

/** [label, handler, request factory, field the answer must name, route params] */
type Bad = [string, Handler, () => Request, string, Record<string, string>?];

const step = (name: string) => `/cases/${caseId}/${name}`;
const good = [["0", "0", "2", "0"], ["8", "0.5", "1", "-1"]];

const CORPUS: Bad[] = [
  // Planform form
  ["planform: chord is text", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["8", "0.5", "wide", "0"]])), "stations.1.chord"],
  ["planform: axis missing", planformAction, () => post(step("planform"), "engineer", (() => { const f = planform(good); f.delete("axisTip"); return f; })()), "axisTip"],
  ["planform: chord NaN", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["8", "0.5", "NaN", "0"]])), "stations.1.chord"],
  ["planform: y Infinity", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["Infinity", "0.5", "1", "0"]])), "stations.1.y"],
  ["planform: y beyond double range (1e400)", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["1e400", "0.5", "1", "0"]])), "stations.1.y"],
  ["planform: zero chord", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["8", "0.5", "0", "0"]])), "stations.1.chord"],
  ["planform: negative chord", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["8", "0.5", "-1", "0"]])), "stations.1.chord"],
  ["planform: stations not increasing", planformAction, () => post(step("planform"), "engineer", planform([good[0]!, ["5", "0.2", "1.5", "0"], ["4", "0.3", "1", "0"]])), "stations.2.y"],
  ["planform: one station only", planformAction, () => post(step("planform"), "engineer", planform([good[0]!])), "stations"],
  ["planform: JSON body that is an array", planformAction, () => json(step("planform"), "engineer", [1, 2, 3]), "form"],
  ["planform: unreadable JSON", planformAction, () => json(step("planform"), "engineer", "{not json"), "form"],
  // Envelope form
  ["envelope: Mach 1", envelopeAction, () => post(step("envelope"), "engineer", envelope("1.0", "0")), "cases.0.mach"],
  ["envelope: Mach 1.4", envelopeAction, () => post(step("envelope"), "engineer", envelope("1.4", "0")), "cases.0.mach"],
  ["envelope: negative Mach", envelopeAction, () => post(step("envelope"), "engineer", envelope("-0.2", "0")), "cases.0.mach"],
  ["envelope: altitude above the atmosphere model", envelopeAction, () => post(step("envelope"), "engineer", envelope("0.3", "150000")), "cases.0.altitude"],
  ["envelope: altitude far below sea level", envelopeAction, () => post(step("envelope"), "engineer", envelope("0.3", "-20000")), "cases.0.altitude"],
  ["envelope: unknown solver", envelopeAction, () => post(step("envelope"), "engineer", (() => { const f = envelope("0.3", "0"); f.set("spanwise", "magic"); return f; })()), "spanwise"],
  // Basis form
  ["basis: weight is text", basisAction, () => post(step("basis"), "engineer", form({ revision: "0", units: "SI", category: "nonsense", regulations: "", mtow: "heavy" })), "mtow"],
  ["basis: category unknown", basisAction, () => post(step("basis"), "engineer", form({ revision: "0", units: "SI", category: "nonsense", regulations: "CS-23", mtow: "6350" })), "category"],
  // Sections form and CSV upload
  ["sections: typed a0 is text", sectionsAction, () => post(step("sections"), "engineer", form({ intent: "save", revision: "0", "rows.0.y": "0", "rows.0.a0": "steep", "rows.0.alphaL0": "-2", "rows.0.cmAc": "-0.05" })), "rows.0.a0"],
  ["sections: CSV of 100 000 rows", sectionsAction, () => post(step("sections"), "engineer", csvUpload("y,a0,alphaL0,cmAc\n" + Array.from({ length: 100_000 }, (_, i) => `${i * 0.0001},6,-2,-0.05`).join("\n"))), "file"],
  ["sections: a PNG named .csv", sectionsAction, () => post(step("sections"), "engineer", csvUpload(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]))), "file"],
  ["sections: Latin-1 bytes named .csv", sectionsAction, () => post(step("sections"), "engineer", csvUpload(new Uint8Array([0x79, 0x2c, 0xe9, 0x0a]))), "file"],
  ["sections: oversized upload", sectionsAction, () => { const big = "y,a0,alphaL0,cmAc\n" + "0,6,-2,-0.05\n".repeat(200_000); const fd = csvUpload(big); return post(step("sections"), "engineer", fd, { "Content-Length": String(big.length + 200) }); }, "file"],
  ["sections: empty file", sectionsAction, () => post(step("sections"), "engineer", csvUpload("")), "file"],
  ["sections: accept an upload that does not exist", sectionsAction, () => post(step("sections"), "engineer", form({ intent: "accept-upload", revision: "0", uploadId: "00000000-0000-4000-8000-000000000000" })), "uploadId"],
  // New case, programme, members, tokens, sign-in
  ["new case: reference with spaces and markup", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId: "", reference: "<b>TN 1</b>", title: "x" })), "reference"],
  ["new case: programme id of the wrong type", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId: "12", reference: "TN-9", title: "A title" })), "programmeId"],
  ["new case: title too long", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId, reference: "TN-9", title: "t".repeat(161) })), "title"],
  ["programme: code missing", programmesAction, () => post("/programmes", "admin", form({ name: "A name", aircraft: "KF-60" })), "code"],
  ["members: invitation to a malformed address", membersAction, () => post("/admin", "admin", form({ intent: "invite", email: "not-an-address", roles: "engineer" })), "email"],
  ["members: unknown role", membersAction, () => post("/admin", "admin", form({ intent: "invite", email: "new.person@kelvard-fenlow.example", roles: "superuser" })), "roles.0"],
  ["tokens: name missing", tokensAction, () => post("/account/tokens", "engineer", form({ intent: "create", name: "   " })), "name"],
  ["sign-in: e-mail of the wrong type", loginAction, () => json("/login", "anonymous", { email: 42, password: ["x"] }), "email"],
  // Review form
  ["review: comment of only spaces", reviewAction, () => post(`/cases/${caseId}/review`, "checker", form({ intent: "comment", step: "planform", body: "   " })), "body"],
  ["review: unknown step", reviewAction, () => post(`/cases/${caseId}/review`, "checker", form({ intent: "comment", step: "fuselage", body: "Hello" })), "step"],
  ["review: comment too long", reviewAction, () => post(`/cases/${caseId}/review`, "checker", form({ intent: "comment", step: "planform", body: "x".repeat(4001) })), "body"],
  // Public API bodies
  ["import: body is an array", importAction, () => json("/api/v1/cases/import", "engineer", []), "(body)"],
  ["import: extra field", importAction, () => json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-X-1", case: example(), admin: true }), "admin"],
  ["import: reference missing", importAction, () => json("/api/v1/cases/import", "engineer", { programmeId, case: example() }), "reference"],
  ["import: NaN in the JSON text", importAction, () => json("/api/v1/cases/import", "engineer", `{"programmeId":"${"x"}","reference":"TN-X-2","case":{"mach":NaN}}`), "JSON"],
  ["import: chord beyond double range", importAction, () => { const c = example(); c.wing.stations[1]!.chord = "__HUGE__"; return json("/api/v1/cases/import", "engineer", JSON.stringify({ programmeId, reference: "TN-X-3", case: c }).replace('"__HUGE__"', "1e400")); }, "chord"],
  ["import: negative chord", importAction, () => { const c = example(); c.wing.stations[1]!.chord = -1; return json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-X-4", case: c }); }, "chord"],
  ["import: stations not increasing", importAction, () => { const c = example(); const s = c.wing.stations; s[2]!.y = s[0]!.y; return json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-X-5", case: c }); }, ".y"],
  ["import: extra field inside a station", importAction, () => { const c = example(); c.wing.stations[0]!.colour = "red"; return json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-X-6", case: c }); }, "colour"],
  ["import: not JSON at all", importAction, () => post("/api/v1/cases/import", "engineer", "<html></html>", { "Content-Type": "text/html" }), "JSON"],
  ["analyze: wrong type for the whole document", analyzeAction, () => json("/api/v1/analyze", "engineer", "42"), "document"],
  ["analyze: case file missing its wing", analyzeAction, () => { const c = example(); delete (c as Record<string, unknown>).wing; return json("/api/v1/analyze", "engineer", c); }, "wing"],
  // What an outside probe found (issue 9): row numbers far beyond a form's rows, NUL characters,
  // control and bidirectional override characters in names and titles.
  ["planform: a row number of a million (41 bytes that once built a million-slot array)", planformAction, () => post(step("planform"), "engineer", planform(good, { "stations.1000000.y": "1" })), "stations.1000000.y"],
  ["planform: the first row beyond the step's 60 stations", planformAction, () => post(step("planform"), "engineer", planform(good, { "stations.60.y": "1" })), "stations.60.y"],
  ["planform: a row number too long to be one", planformAction, () => post(step("planform"), "engineer", planform(good, { [`stations.${"9".repeat(40)}.y`]: "1" })), `stations.${"9".repeat(40)}.y`],
  ["planform: a field nested deeper than any form", planformAction, () => post(step("planform"), "engineer", planform(good, { "a.b.c.d.e.f": "1" })), "a.b.c.d.e.f"],
  ["sections: a row beyond the step's 60 rows", sectionsAction, () => post(step("sections"), "engineer", form({ intent: "save", revision: "0", "rows.0.y": "0", "rows.0.a0": "6", "rows.0.alphaL0": "-2", "rows.0.cmAc": "-0.05", "rows.500.y": "1" })), "rows.500.y"],
  ["envelope: a case row beyond the step's 2000 cases", envelopeAction, () => post(step("envelope"), "engineer", (() => { const f = envelope("0.3", "0"); f.set("cases.2000.id", "X2"); return f; })()), "cases.2000.id"],
  ["new case: a NUL character in the title", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId, reference: "TN-NUL-1", title: "Wing\u0000 loads" })), "title"],
  ["new case: a NUL character in the description, as JSON", newCaseAction, () => json("/cases/new", "engineer", { programmeId, reference: "TN-NUL-2", title: "Wing loads", description: "a\u0000b" }), "description"],
  ["review: a NUL character in a comment", reviewAction, () => post(`/cases/${caseId}/review`, "checker", form({ intent: "comment", step: "planform", body: "looks\u0000 fine" })), "body"],
  ["sign-in: a NUL character in the e-mail", loginAction, () => post("/login", "anonymous", form({ email: "erin.hale@kelvard-fenlow.example\u0000", password: "x" })), "email"],
  ["import: a NUL character in a load case id", importAction, () => { const c = example() as unknown as { cases: { id: string }[] }; c.cases[0]!.id = "M1\u0000"; return json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-NUL-3", case: c }); }, "case.cases.0.id"],
  ["new case: a right-to-left override in the title", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId, reference: "TN-BIDI-1", title: "Wing loads \u202Efdp.exe" })), "title"],
  ["new case: a line break in the title", newCaseAction, () => post("/cases/new", "engineer", form({ programmeId, reference: "TN-CTRL-1", title: "Wing\nloads" })), "title"],
  ["programme: an isolate character in the name", programmesAction, () => post("/programmes", "admin", form({ code: "BIDI-1", name: "Skua \u2067redesign", aircraft: "NA-14" })), "name"],
  ["programme: a control character in the aircraft", programmesAction, () => post("/programmes", "admin", form({ code: "CTRL-1", name: "Skua redesign", aircraft: "NA-14\u0007" })), "aircraft"],
  ["tokens: a bidirectional override in the name", tokensAction, () => post("/account/tokens", "engineer", form({ intent: "create", name: "nightly \u202Eexport" })), "name"],
  ["import: a bidirectional override in the title", importAction, () => json("/api/v1/cases/import", "engineer", { programmeId, reference: "TN-BIDI-2", title: "Wing \u202Eloads", case: example() }), "title"],
  ["planform preview: stations of the wrong type", previewAction, () => json("/api/planform-preview", "engineer", { stations: "many", axisRoot: 0.3, axisTip: 0.3 }), "stations"],
];

describe("bad input is refused with the field named, and nothing is written", () => {
  it.each(CORPUS)("%s", async (_label, fn, make, field, params) => {
    const before = await snapshot();
    const res = await answer(fn, make(), params ?? { caseId });
    expect(res.status, res.text.slice(0, 400)).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(namesField(res.text, field), `the answer names ${field}: ${res.text.slice(0, 400)}`).toBe(true);
    expect(await snapshot()).toEqual(before);
  });
});

describe("input that looks odd but is good is accepted", () => {
  it("accepts an otherwise good CSV that starts with a byte-order mark", async () => {
    const res = await answer(sectionsAction, post(step("sections"), "engineer", csvUpload("\uFEFFy,a0,alphaL0,cmAc\n0,6.05,-2.2,-0.055\n8.7,5.9,-1.6,-0.04\n")), { caseId });
    expect(res.status, res.text).toBe(200);
    expect(JSON.parse(res.text)).toMatchObject({ ok: true, preview: { rows: [{ y: 0 }, { y: 8.7 }] } });
  });

  it("accepts an otherwise good CSV separated by semicolons with decimal commas", async () => {
    const res = await answer(sectionsAction, post(step("sections"), "engineer", csvUpload("y;a0;alphaL0;cmAc\n0;6,05;-2,2;-0,055\n8,7;5,9;-1,6;-0,04\n")), { caseId });
    expect(res.status, res.text).toBe(200);
    expect(JSON.parse(res.text)).toMatchObject({ ok: true, preview: { rows: [{ y: 0, a0: 6.05 }, { y: 8.7, a0: 5.9 }] } });
  });

  it("refuses an extra form field, naming it, and stores nothing", async () => {
    const before = await db.execute<{ data: unknown }>(sql`SELECT data FROM case_steps WHERE case_id = ${caseId} AND step = 'planform'`).then((r) => r.rows);
    for (const extra of [{ role: "admin" }, { "stations.0.colour": "red" }] as Record<string, string>[]) {
      const res = await answer(planformAction, post(step("planform"), "engineer", planform(good, extra)), { caseId });
      expect(res.status, res.text).toBe(400);
      expect(res.text).toContain(Object.keys(extra)[0]!.split(".").pop()!);
    }
    const after = await db.execute<{ data: unknown }>(sql`SELECT data FROM case_steps WHERE case_id = ${caseId} AND step = 'planform'`).then((r) => r.rows);
    expect(after).toEqual(before);
  });

  it("keeps a Unicode case title and description intact, and HTML in them as plain text", async () => {
    const title = "Flügel — 翼根の荷重 ✓ Øresund";
    const description = `<script>alert("x")</script> & <b>bold</b>`;
    const res = await answer(newCaseAction, post("/cases/new", "engineer", form({ programmeId, reference: "TN-UNI-1", title, description })));
    expect(res.status).toBe(302);
    const [c] = await db.select().from(cases).where(eq(cases.reference, "TN-UNI-1"));
    expect(c!.title).toBe(title);
    expect(c!.description).toBe(description);
    const shown = await answer(overviewLoader, request(`/cases/${c!.id}`, { cookie: cookies.engineer }), { caseId: c!.id });
    expect(shown.text).toContain(title);
  });

  it("stores HTML in a review comment exactly as typed (the page escapes it; see tests/e2e/security.spec.ts)", async () => {
    const body = `<script>alert("review")</script><img src=x onerror=alert(1)>`;
    const res = await answer(reviewAction, post(`/cases/${demoCaseId}/review`, "checker", form({ intent: "comment", step: "planform", body })), { caseId: demoCaseId });
    expect(res.status, res.text).toBe(200);
    const stored = await db.select().from(stepComments).where(eq(stepComments.caseId, demoCaseId));
    expect(stored.map((c) => c.body)).toContain(body);
    const page = await answer(reviewLoader, request(`/cases/${demoCaseId}/review`, { cookie: cookies.checker }), { caseId: demoCaseId });
    expect(page.text).toContain(JSON.stringify(body).slice(1, -1));
  });
});
