/**
 * The public JSON API (/api/v1) and personal API tokens. Route loaders and actions are called
 * directly; every API handler answers a real Response, read here as the client would read it.
 * Expected results of analysis are those of the command-line path (`runCase(parseCase(file))`, the
 * contract of /work/shared/CASE-EXCHANGE.md): these tests check that the API adds nothing and loses
 * nothing, not the numbers themselves (the engine tests check those against published sources).
 */
import { readFileSync } from "node:fs";
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { createApiToken, listApiTokens } from "~/auth/api-auth.server";
import { sha256Hex } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { apiTokens, auditLog, caseResults, caseSteps, cases, memberships, programmes, users } from "~/db/schema";
import { parseCase, parseSections, runCase, type CaseFile } from "~/exchange";
import { action as tokensAction, loader as tokensLoader } from "~/routes/account-tokens";
import { action as analyzeAction } from "~/routes/api/v1/analyze";
import { loader as caseLoader } from "~/routes/api/v1/case";
import { loader as exportLoader } from "~/routes/api/v1/case-export";
import { action as importAction, loader as importLoader } from "~/routes/api/v1/case-import";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { loader as casesLoader } from "~/routes/api/v1/cases";
import { loader as notFoundLoader } from "~/routes/api/v1/not-found";
import { loader as openApiLoader } from "~/routes/api/v1/openapi";
import { loader as apiDocsLoader } from "~/routes/api-docs";
import { cookieFor, demoUser, form, request, run, seed, routeArgs } from "./helpers";

const EXAMPLES = ["kf60-tern-wing", "kf60-tern-lifting-line", "kf60-tern-swept-variant", "kf60-tern-masses"] as const;
const example = (name: (typeof EXAMPLES)[number]) => JSON.parse(readFileSync(`docs/examples/${name}.json`, "utf8")) as Record<string, unknown>;

let kelvardProgrammeId = "";
let northmoorProgrammeId = "";
let kelvardCaseId = "";
let emptyKelvardCaseId = "";
let northmoorCaseId = "";
const tokens: Record<"engineer" | "checker" | "outsider", string> = { engineer: "", checker: "", outsider: "" };

async function tokenFor(label: keyof typeof tokens, name = `${label} script`) {
  const u = demoUser(label);
  const [row] = await db.select({ user: users, organisationId: memberships.organisationId }).from(users).innerJoin(memberships, eq(memberships.userId, users.id)).where(eq(users.email, u.email));
  return createApiToken({ userId: row!.user.id, organisationId: row!.organisationId, name, scope: "read-write", actor: { id: row!.user.id, email: row!.user.email } });
}

type Handler = (args: never) => Promise<Response>;

/** Calls an API handler as the router would and reads the answer. */
async function call(fn: Handler, path: string, init: RequestInit & { token?: string; cookie?: string; params?: Record<string, string> } = {}) {
  const headers = new Headers(init.headers);
  if (init.token) headers.set("Authorization", `Bearer ${init.token}`);
  const res = await fn((await routeArgs(request(path, { ...init, headers, cookie: init.cookie }), init.params ?? {})) as never);
  const text = await res.text();
  const type = res.headers.get("Content-Type") ?? "";
  return { status: res.status, headers: res.headers, text, body: type.includes("json") ? (JSON.parse(text) as Record<string, unknown>) : null };
}

const jsonPost = (body: unknown) => ({ method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });

/** Row count of every table of the application, to show that a refusal wrote nothing anywhere. */
async function rowCounts(): Promise<Record<string, number>> {
  const { rows } = await db.execute<{ table_name: string }>(sql`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY table_name`);
  const out: Record<string, number> = {};
  for (const { table_name } of rows) {
    const { rows: c } = await db.execute<{ n: string }>(sql`SELECT count(*) AS n FROM ${sql.identifier(table_name)}`);
    out[table_name] = Number(c[0]!.n);
  }
  return out;
}

beforeAll(async () => {
  await seed();
  const [kp] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [np] = await db.select().from(programmes).where(eq(programmes.code, "NA14"));
  kelvardProgrammeId = kp!.id;
  northmoorProgrammeId = np!.id;
  const byRef = async (ref: string) => (await db.select().from(cases).where(eq(cases.reference, ref)))[0]!.id;
  kelvardCaseId = await byRef("TN-WL-001");
  emptyKelvardCaseId = await byRef("TN-WL-002");
  northmoorCaseId = await byRef("SK-L-07");
  for (const label of Object.keys(tokens) as (keyof typeof tokens)[]) tokens[label] = (await tokenFor(label)).token;
});

describe("personal API tokens", () => {
  it("are sw_ + 160 random bits in base32, stored only as their SHA-256, and audited", async () => {
    const { id, token } = await tokenFor("engineer", "format check");
    // 160 bits / 5 bits per base32 character = 32 characters (RFC 4648 §6 alphabet, lower case).
    expect(token).toMatch(/^sw_[a-z2-7]{32}$/);
    const [row] = await db.select().from(apiTokens).where(eq(apiTokens.id, id));
    expect(row!.tokenHash).toBe(sha256Hex(token));
    expect(JSON.stringify(row)).not.toContain(token.slice(3));
    expect(token.startsWith(row!.prefix)).toBe(true);
    const entries = await db.select().from(auditLog).where(and(eq(auditLog.action, "api-token.create"), eq(auditLog.entityId, id)));
    expect(entries).toHaveLength(1);
    expect(JSON.stringify(entries[0])).not.toContain(token.slice(3));
  });

  it("are created, listed and revoked from /account/tokens, the new token shown once", async () => {
    const cookie = await cookieFor("engineer");
    const created = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "create", name: "nightly export", scope: "read" }) }) });
    expect(created.status).toBe(200);
    const token = (created.body as { created: { token: string } }).created.token;
    expect(token).toMatch(/^sw_[a-z2-7]{32}$/);
    expect((await call(casesLoader, "/api/v1/cases", { token })).status).toBe(200);

    const listed = await run(tokensLoader, { request: request("/account/tokens", { cookie }) });
    const mine = (listed.body as { tokens: { id: string; name: string; prefix: string; lastUsedAt: Date | null; revokedAt: Date | null }[] }).tokens;
    const entry = mine.find((t) => t.name === "nightly export")!;
    expect(entry.lastUsedAt).not.toBeNull();
    expect(entry.revokedAt).toBeNull();
    expect(JSON.stringify(listed.body)).not.toContain(token);

    const revoked = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "revoke", tokenId: entry.id }) }) });
    expect(revoked.status).toBe(200);
    const after = await call(casesLoader, "/api/v1/cases", { token });
    expect(after.status).toBe(401);
    expect(after.body).toMatchObject({ error: "unauthorized" });
    expect((await db.select().from(auditLog).where(and(eq(auditLog.action, "api-token.revoke"), eq(auditLog.entityId, entry.id))))).toHaveLength(1);
  });

  it("carry a scope: a read-only token reads but cannot import, a read-write one can; the scope is listed and audited", async () => {
    const cookie = await cookieFor("engineer");
    const make = async (name: string, scope: string) => {
      const res = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "create", name, scope }) }) });
      expect(res.status).toBe(200);
      return (res.body as { created: { token: string; scope: string } }).created;
    };
    const readOnly = await make("scope read", "read");
    const readWrite = await make("scope write", "read-write");
    expect(readOnly.scope).toBe("read");
    const body = (reference: string) => jsonPost({ programmeId: kelvardProgrammeId, reference, case: example("kf60-tern-wing") });
    expect((await call(casesLoader, "/api/v1/cases", { token: readOnly.token })).status).toBe(200);
    const before = await rowCounts();
    const refused = await call(importAction, "/api/v1/cases/import", { token: readOnly.token, ...body("TN-SCOPE-1") });
    expect(refused.status).toBe(403);
    expect(refused.body).toMatchObject({ error: "insufficient-scope", message: expect.stringContaining("read-only") });
    // Only the token's last use was written.
    expect(await rowCounts()).toEqual(before);
    // A read-write token passes the scope check: what answers is the document (left empty here, so no case is made).
    const allowed = await call(importAction, "/api/v1/cases/import", { token: readWrite.token, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-SCOPE-2", case: {} }) });
    expect(allowed.status).toBe(422);

    const listed = await run(tokensLoader, { request: request("/account/tokens", { cookie }) });
    const rows = (listed.body as { tokens: { name: string; scope: string }[] }).tokens;
    expect(rows.find((t) => t.name === "scope read")!.scope).toBe("read");
    expect(rows.find((t) => t.name === "scope write")!.scope).toBe("read-write");
    const [audit] = await db.select().from(auditLog).where(eq(auditLog.action, "api-token.create")).orderBy(sql`id desc`).limit(1);
    expect(audit!.after).toMatchObject({ name: "scope write", scope: "read-write" });

    const missing = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "create", name: "no scope" }) }) });
    expect(missing.status).toBe(400);
    expect((missing.body as { fieldErrors: Record<string, string[]> }).fieldErrors.scope?.[0]).toMatch(/read only, or read and write/);
  });

  it("refuses an empty name on the form, and someone else's token on revoke", async () => {
    const cookie = await cookieFor("engineer");
    const empty = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "create", name: "  " }) }) });
    expect(empty.status).toBe(400);
    expect((empty.body as { fieldErrors: Record<string, string[]> }).fieldErrors.name?.[0]).toMatch(/Name the token/);
    const [outsiderToken] = await listApiTokens((await db.select().from(users).where(eq(users.email, demoUser("outsider").email)))[0]!.id);
    const other = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie, body: form({ intent: "revoke", tokenId: outsiderToken!.id }) }) });
    expect(other.status).toBe(404);
    expect((await call(casesLoader, "/api/v1/cases", { token: tokens.outsider })).status).toBe(200);
  });

  it("records the last use at most once a minute", async () => {
    const { id, token } = await tokenFor("engineer", "touch check");
    await call(casesLoader, "/api/v1/cases", { token });
    const [first] = await db.select().from(apiTokens).where(eq(apiTokens.id, id));
    expect(first!.lastUsedAt).not.toBeNull();
    await call(casesLoader, "/api/v1/cases", { token });
    const [second] = await db.select().from(apiTokens).where(eq(apiTokens.id, id));
    expect(second!.lastUsedAt!.getTime()).toBe(first!.lastUsedAt!.getTime());
  });

  it("stop working when the person is disabled", async () => {
    const { token } = await tokenFor("checker", "disabled check");
    const email = demoUser("checker").email;
    await db.update(users).set({ disabled: true }).where(eq(users.email, email));
    try {
      expect((await call(casesLoader, "/api/v1/cases", { token })).status).toBe(401);
    } finally {
      await db.update(users).set({ disabled: false }).where(eq(users.email, email));
    }
  });
});

describe("authentication and access", () => {
  it("lists the organisation's cases with a token, and only them", async () => {
    const res = await call(casesLoader, "/api/v1/cases", { token: tokens.engineer });
    expect(res.status).toBe(200);
    const list = res.body!.cases as { id: string; reference: string; title: string; programme: { code: string }; status: string; updatedAt: string }[];
    expect(list.map((c) => c.reference).sort()).toEqual(["TN-WL-001", "TN-WL-002"]);
    expect(list[0]).toEqual(expect.objectContaining({ id: expect.any(String), title: expect.any(String), status: "draft", programme: expect.objectContaining({ code: "KF60" }) }));
    expect(Number.isNaN(Date.parse(list[0]!.updatedAt))).toBe(false);
  });

  it("accepts the browser's session cookie too", async () => {
    const res = await call(caseLoader, `/api/v1/cases/${kelvardCaseId}`, { cookie: await cookieFor("quality"), params: { caseId: kelvardCaseId } });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: kelvardCaseId, reference: "TN-WL-001", programme: { code: "KF60" } });
    const steps = res.body!.steps as { step: string; status: string; revision: number }[];
    expect(steps.map((s) => s.step)).toEqual(["basis", "planform", "sections", "masses", "envelope", "distribution", "loads"]);
  });

  it.each([
    ["no credentials", {}],
    ["a malformed Authorization header", { headers: { Authorization: "Token abc" } }],
    ["a token of the wrong shape", { token: "sw_short" }],
    ["an unknown token", { token: `sw_${"a".repeat(32)}` }],
    ["a session cookie that is not valid", { cookie: "sw_session=forged" }],
  ] as const)("answers 401 JSON with a Bearer challenge for %s, never a redirect", async (_what, init) => {
    const res = await call(casesLoader, "/api/v1/cases", init as never);
    expect(res.status).toBe(401);
    expect(res.headers.get("WWW-Authenticate")).toMatch(/^Bearer realm="spanwright"/);
    expect(res.body).toEqual({ error: "unauthorized", message: expect.any(String) });
  });

  it("answers another organisation's case exactly like an unknown one, and a malformed id with 404", async () => {
    const foreign = await call(caseLoader, `/api/v1/cases/${kelvardCaseId}`, { token: tokens.outsider, params: { caseId: kelvardCaseId } });
    const unknown = "00000000-0000-4000-8000-000000000000";
    const missing = await call(caseLoader, `/api/v1/cases/${unknown}`, { token: tokens.outsider, params: { caseId: unknown } });
    const malformed = await call(exportLoader, "/api/v1/cases/not-a-uuid/export", { token: tokens.outsider, params: { caseId: "not-a-uuid" } });
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(missing.body);
    expect(foreign.text).not.toContain("TN-WL");
    expect(malformed.status).toBe(404);
    expect(malformed.body).toMatchObject({ error: "not-found" });
    for (const fn of [exportLoader, resultsLoader]) {
      const res = await call(fn, `/api/v1/cases/${kelvardCaseId}/x`, { token: tokens.outsider, params: { caseId: kelvardCaseId } });
      expect(res.status).toBe(404);
    }
    expect((await call(caseLoader, `/api/v1/cases/${northmoorCaseId}`, { token: tokens.outsider, params: { caseId: northmoorCaseId } })).status).toBe(200);
  });

  it("refuses import to a role without case:create with 403 JSON", async () => {
    const before = await rowCounts();
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.checker, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-X-1", case: example("kf60-tern-wing") }) });
    expect(res.status).toBe(403);
    expect(res.body).toEqual({ error: "forbidden", message: expect.stringContaining("case:create") });
    expect(await rowCounts()).toEqual(before);
  });

  it("answers unknown paths and wrong methods with JSON", async () => {
    const unknown = await call(notFoundLoader, "/api/v1/nothing-here");
    expect(unknown.status).toBe(404);
    expect(unknown.body).toMatchObject({ error: "not-found" });
    const get = await call(importLoader, "/api/v1/cases/import", { token: tokens.engineer });
    expect(get.status).toBe(405);
    expect(get.headers.get("Allow")).toBe("POST");
    expect(get.body).toMatchObject({ error: "method-not-allowed" });
  });
});

describe("POST /api/v1/analyze", () => {
  it.each(EXAMPLES)("answers %s exactly as the command line computes it", async (name) => {
    const file = example(name);
    const parsed = parseCase(file);
    if (!parsed.ok) throw new Error(`example ${name} does not parse`);
    const res = await call(analyzeAction, "/api/v1/analyze", { token: tokens.checker, ...jsonPost(file) });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
    expect(res.body!.schema).toBe("spanwright.result/1");
  });

  it("answers 422 naming every bad field, and writes nothing anywhere", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: Record<string, unknown>[] }; cases: Record<string, unknown>[] } & Record<string, unknown>;
    file.cases[0]!.mach = 1.0;
    file.wing.stations[1]!.chord = -0.4;
    file.wing.stations[0]!.flapChord = 0.3;
    file.wing.stations[2]!.y = file.wing.stations[1]!.y;
    const before = await rowCounts();
    const res = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost(file) });
    expect(res.status).toBe(422);
    expect(res.body!.error).toBe("invalid-case");
    const problems = res.body!.problems as { path: string; message: string }[];
    const paths = problems.map((p) => p.path);
    // Each rule as CASE-EXCHANGE.md states it: 0 ≤ M < 1, chord > 0, extra fields are an error, y strictly increasing.
    expect(paths).toEqual(expect.arrayContaining(["cases[0].mach", "wing.stations[1].chord", "wing.stations[0].flapChord", "wing.stations[2].y"]));
    expect(problems.find((p) => p.path === "cases[0].mach")!.message).toMatch(/below 1/);
    expect(problems.find((p) => p.path === "wing.stations[1].chord")!.message).toMatch(/greater than 0/);
    expect(problems.find((p) => p.path === "wing.stations[0].flapChord")!.message).toMatch(/not a field/);
    expect(problems.find((p) => p.path === "wing.stations[2].y")!.message).toMatch(/increasing/);
    expect(res.body!.message).toContain("cases[0].mach");
    expect(await rowCounts()).toEqual(before);
  });

  it("takes richer section data beside the case ({ case, sections }) as the command line's --sections does, and names a bad field of either", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: { y: number }[] } } & Record<string, unknown>;
    const table = [{ cl: -0.5, cpMin: -0.5 }, { cl: 0.5, cpMin: -0.6 }, { cl: 1.5, cpMin: -2.2 }];
    const sections = { schema: "spanwright.sections/1", sections: file.wing.stations.map((s) => ({ y: s.y, cpMinTable: table })) };
    const parsed = parseCase(file);
    const checked = parsed.ok ? parseSections(sections, parsed.value) : null;
    if (!parsed.ok || !checked?.ok) throw new Error("fixture must parse");
    const res = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost({ case: file, sections }) });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value, { sections: checked.value }))));
    expect((res.body!.method as { criticalMach: string }).criticalMach).toBe("cp-min-against-lift");
    const bad = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost({ case: file, sections: { ...sections, sections: [{ y: 1.234, cpMinCl: 0.3 }] }, colour: 1 }) });
    expect(bad.status).toBe(422);
    expect((bad.body!.problems as { path: string }[]).map((p) => p.path)).toEqual(["colour"]);
    const badSections = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost({ case: file, sections: { ...sections, sections: [{ y: 1.234, cpMinCl: 0.3 }] } }) });
    expect(badSections.status).toBe(422);
    expect((badSections.body!.problems as { path: string }[])[0]!.path).toBe("sections:sections[0].y");
  });

  it("takes mass items, mass cases and tail loads as the command line does, and names a bad one", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: { y: number }[]; mass?: Record<string, unknown> }; cases: Record<string, unknown>[] } & Record<string, unknown>;
    const semispan = file.wing.stations[file.wing.stations.length - 1]!.y;
    file.wing.mass = { kg: 200, items: [{ id: "nacelle", kg: 310, x: 0.4, y: 0.3 * semispan }, { id: "tank", kg: 420, x: 0.9, yFrom: 0.1 * semispan, yTo: 0.6 * semispan }] };
    file.massCases = [{ id: "zero-fuel", fill: { tank: 0 } }];
    const trimmed = file.cases.filter((c) => c.weight !== undefined);
    trimmed[0]!.massCase = "zero-fuel";
    trimmed[0]!.tailLoad = -4200;
    const parsed = parseCase(file);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    const res = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost(file) });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));

    trimmed[0]!.massCase = "reserve";
    const before = await rowCounts();
    const bad = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost(file) });
    expect(bad.status).toBe(422);
    const problems = bad.body!.problems as { path: string; message: string }[];
    expect(problems.find((p) => p.path === `cases[${file.cases.indexOf(trimmed[0]!)}].massCase`)!.message).toMatch(/names no mass case/);
    expect(await rowCounts()).toEqual(before);
  });

  it("takes the aileron and rolling cases as the command line does, and names a bad one", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: { y: number }[]; aileron?: Record<string, unknown> }; cases: Record<string, unknown>[] } & Record<string, unknown>;
    const semispan = file.wing.stations[file.wing.stations.length - 1]!.y;
    file.wing.aileron = { yFrom: 0.6 * semispan, yTo: 0.95 * semispan, dClPerDeg: 0.045, deltaAtVa: 18 };
    const trimmed = file.cases.filter((c) => c.weight !== undefined);
    trimmed[0]!.roll = { fraction: 0.75, aileron: 12 };
    const parsed = parseCase(file);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    const res = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost(file) });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
    expect((res.body!.cases as { roll?: unknown }[]).filter((c) => c.roll)).toHaveLength(1);

    trimmed[0]!.roll = { fraction: 1.5, aileron: 12 };
    const before = await rowCounts();
    const bad = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, ...jsonPost(file) });
    expect(bad.status).toBe(422);
    const problems = bad.body!.problems as { path: string; message: string }[];
    expect(problems.find((p) => p.path === `cases[${file.cases.indexOf(trimmed[0]!)}].roll.fraction`)!.message).toMatch(/above 0 and at most 1/);
    expect(await rowCounts()).toEqual(before);
  });

  it("refuses a body that is not JSON with 400 and one over 20 MB with 413", async () => {
    const bad = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, method: "POST", headers: { "Content-Type": "application/json" }, body: "{ not json" });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ error: "invalid-json" });
    const big = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, method: "POST", headers: { "Content-Type": "application/json" }, body: `{"pad":"${"x".repeat(21 * 1024 * 1024)}"}` });
    expect(big.status).toBe(413);
    expect(big.body).toMatchObject({ error: "too-large" });
    const declared = await call(analyzeAction, "/api/v1/analyze", { token: tokens.engineer, method: "POST", headers: { "Content-Type": "application/json", "Content-Length": String(30 * 1024 * 1024) }, body: "{}" });
    expect(declared.status).toBe(413);
  });
});

describe("import and export", () => {
  it.each(EXAMPLES)("imports %s and exports it back unchanged", async (name) => {
    const file = example(name);
    const parsed = parseCase(file);
    if (!parsed.ok) throw new Error(`example ${name} does not parse`);
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: `RT-${name}`, case: file }) });
    expect(res.status).toBe(201);
    const id = res.body!.id as string;
    expect(res.headers.get("Location")).toBe(`/api/v1/cases/${id}`);
    const detail = await call(caseLoader, `/api/v1/cases/${id}`, { token: tokens.engineer, params: { caseId: id } });
    const steps = Object.fromEntries((detail.body!.steps as { step: string; status: string; revision: number }[]).map((s) => [s.step, s]));
    expect(steps.basis).toMatchObject({ status: "empty", revision: 0 });
    for (const k of ["planform", "sections", "masses", "envelope"]) expect(steps[k]).toMatchObject({ status: "draft", revision: 1 });
    expect(steps.loads).toMatchObject({ status: "empty", revision: 0 });

    const exported = await call(exportLoader, `/api/v1/cases/${id}/export`, { token: tokens.engineer, params: { caseId: id } });
    expect(exported.status).toBe(200);
    const again = parseCase(exported.body);
    if (!again.ok) throw new Error(`export of ${name} does not parse: ${JSON.stringify(again.problems)}`);
    const expected: CaseFile = parsed.value;
    // Everything comes back exactly as it went in (CASE-EXCHANGE.md: export and import "without loss").
    expect(again.value).toEqual(expected);
  });

  it("imports a case with its richer section data and exports both back unchanged; the results use them", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: { y: number }[] } } & Record<string, unknown>;
    const x = [0, 0.01, 0.05, 0.15, 0.3, 0.5, 0.7, 0.9, 1];
    const cp = (a: number) => ({ alpha: a, x, cpUpper: x.map((v) => -0.6 * (1 + a / 4) * Math.sqrt(1 - v) + 0.1 * v), cpLower: x.map((v) => 0.3 * (1 - v) - 0.05 * a * (1 - v)) });
    const sections = {
      schema: "spanwright.sections/1",
      sections: file.wing.stations.map((s, i) => ({ y: s.y, cpMinTable: [{ cl: 0, cpMin: -0.45 }, { cl: 1, cpMin: -1.2 - 0.1 * i }], ...(i === 0 ? { pressures: [cp(0), cp(4)] } : {}) })),
    };
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "RT-SECTIONS", case: file, sections }) });
    expect(res.status).toBe(201);
    const id = res.body!.id as string;
    const exported = await call(exportLoader, `/api/v1/cases/${id}/export`, { token: tokens.engineer, params: { caseId: id } });
    const again = parseCase(exported.body);
    const parsed = parseCase(file);
    if (!again.ok || !parsed.ok) throw new Error("must parse");
    expect(again.value).toEqual(parsed.value);
    expect(exported.headers.get("Link")).toContain("part=sections");
    const part = await call(exportLoader, `/api/v1/cases/${id}/export?part=sections`, { token: tokens.engineer, params: { caseId: id } });
    expect(part.status).toBe(200);
    expect(part.body).toEqual(sections);
    const results = await call(resultsLoader, `/api/v1/cases/${id}/results`, { token: tokens.engineer, params: { caseId: id } });
    expect((results.body!.method as { criticalMach: string; sectionScaling: string }).criticalMach).toBe("cp-min-against-lift");
    const checked = parseSections(sections, parsed.value);
    if (!checked.ok) throw new Error("must parse");
    expect(results.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value, { sections: checked.value }))));
    // A case without richer data has no sections part.
    const plain = await call(exportLoader, `/api/v1/cases/${kelvardCaseId}/export?part=sections`, { token: tokens.engineer, params: { caseId: kelvardCaseId } });
    expect(plain.status).toBe(404);
  });

  it("takes the bare document with the target in the query", async () => {
    const res = await call(importAction, `/api/v1/cases/import?programmeId=${kelvardProgrammeId}&reference=TN-WL-BARE&title=Bare%20import`, { token: tokens.engineer, ...jsonPost(example("kf60-tern-swept-variant")) });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ reference: "TN-WL-BARE", title: "Bare import", status: "draft" });
    const entries = await db.select().from(auditLog).where(eq(auditLog.entityId, res.body!.id as string));
    expect(entries.map((e) => e.action).sort()).toEqual(["case.import", "step.envelope.save", "step.masses.save", "step.planform.save", "step.sections.save"]);
  });

  it("answers 422 naming every bad field of the document and of the request, and writes nothing", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: Record<string, unknown>[] }; cases: Record<string, unknown>[] } & Record<string, unknown>;
    file.cases[1]!.mach = 1.2;
    file.wing.stations[0]!.sweep = 3;
    const before = await rowCounts();
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-BAD-1", case: file }) });
    expect(res.status).toBe(422);
    expect((res.body!.problems as { path: string }[]).map((p) => p.path)).toEqual(expect.arrayContaining(["cases[1].mach", "wing.stations[0].sweep"]));
    const target = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: "nope", reference: " ", extra: 1, case: example("kf60-tern-wing") }) });
    expect(target.status).toBe(422);
    expect((target.body!.problems as { path: string }[]).map((p) => p.path)).toEqual(expect.arrayContaining(["programmeId", "reference", "extra"]));
    expect(await rowCounts()).toEqual(before);
  });

  it("applies the steps' own rules too, naming the document's field (twist within ±20°, case id characters)", async () => {
    const file = example("kf60-tern-wing") as { wing: { stations: Record<string, unknown>[] }; cases: Record<string, unknown>[] } & Record<string, unknown>;
    file.wing.stations[1]!.twist = -25;
    file.cases[0]!.id = "cruise 1g";
    const before = await rowCounts();
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-BAD-2", case: file }) });
    expect(res.status).toBe(422);
    const problems = res.body!.problems as { path: string; message: string }[];
    expect(problems.find((p) => p.path === "wing.stations[1].twist")?.message).toMatch(/±20/);
    expect(problems.find((p) => p.path === "cases[0].id")?.message).toMatch(/letters, digits/);
    expect(await rowCounts()).toEqual(before);
  });

  it("refuses a reference already used in the programme (409) and another organisation's programme (404)", async () => {
    const before = await rowCounts();
    const dup = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-WL-001", case: example("kf60-tern-wing") }) });
    expect(dup.status).toBe(409);
    expect(dup.body).toMatchObject({ error: "conflict", message: expect.stringContaining("TN-WL-001") });
    const foreign = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: northmoorProgrammeId, reference: "TN-X-2", case: example("kf60-tern-wing") }) });
    expect(foreign.status).toBe(404);
    expect(await rowCounts()).toEqual(before);
  });

  it("answers 409 with a message when the case's steps are not saved", async () => {
    const res = await call(exportLoader, `/api/v1/cases/${emptyKelvardCaseId}/export`, { token: tokens.engineer, params: { caseId: emptyKelvardCaseId } });
    expect(res.status).toBe(409);
    expect(res.body).toEqual({ error: "conflict", message: expect.stringMatching(/planform, sections, envelope/) });
    const results = await call(resultsLoader, `/api/v1/cases/${emptyKelvardCaseId}/results`, { token: tokens.engineer, params: { caseId: emptyKelvardCaseId } });
    expect(results.status).toBe(409);
  });
});

describe("GET /api/v1/cases/:caseId/results", () => {
  it("answers the stored spanwright.result/1, equal to running the exported case, and CSV on request", async () => {
    const imported = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-WL-RES", case: example("kf60-tern-wing") }) });
    const id = imported.body!.id as string;
    const res = await call(resultsLoader, `/api/v1/cases/${id}/results`, { token: tokens.checker, params: { caseId: id } });
    expect(res.status).toBe(200);
    const exported = await call(exportLoader, `/api/v1/cases/${id}/export`, { token: tokens.checker, params: { caseId: id } });
    const parsed = parseCase(exported.body);
    if (!parsed.ok) throw new Error("export does not parse");
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
    const stored = await db.select().from(caseResults).where(eq(caseResults.caseId, id));
    expect(stored).toHaveLength(1);
    expect(stored[0]!.inputHash).toBe(res.headers.get("X-Spanwright-Input-Sha256"));

    const csv = await call(resultsLoader, `/api/v1/cases/${id}/results?format=csv`, { token: tokens.checker, params: { caseId: id } });
    expect(csv.status).toBe(200);
    expect(csv.headers.get("Content-Type")).toMatch(/^text\/csv/);
    expect(csv.headers.get("Content-Disposition")).toBe('attachment; filename="TN-WL-RES-results.csv"');
    const lines = csv.text.trim().split("\n");
    expect(lines[0]).toBe("case,y,chord,cl,cm,lift,shear,bending,torsion");
    expect(lines.length).toBe(1 + 5 * 40);
    // Served from storage the second time: still one stored result.
    expect(await db.select().from(caseResults).where(eq(caseResults.caseId, id))).toHaveLength(1);

    const badFormat = await call(resultsLoader, `/api/v1/cases/${id}/results?format=xml`, { token: tokens.checker, params: { caseId: id } });
    expect(badFormat.status).toBe(400);
    expect(badFormat.body).toMatchObject({ error: "bad-request" });
  });

  // RFC 9110 §8.8.3 and §13.1.2: an entity tag names one representation; If-None-Match with that tag
  // is answered 304 Not Modified without a body. Cache-Control no-store (RFC 9111 §5.2.2.5) keeps
  // browsers and proxies from keeping a copy; a client that keeps one itself revalidates by its tag.
  it("names each representation with an entity tag, answers 304 to a client that holds it, and a new tag once the input changes", async () => {
    const imported = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-WL-TAG", case: example("kf60-tern-wing") }) });
    const id = imported.body!.id as string;
    const url = `/api/v1/cases/${id}/results`;
    const first = await call(resultsLoader, url, { token: tokens.checker, params: { caseId: id } });
    const again = await call(resultsLoader, url, { token: tokens.checker, params: { caseId: id } });
    expect(again.text).toBe(first.text);
    const tag = first.headers.get("ETag");
    expect(tag).toMatch(/^"[^"]+"$/);
    expect(again.headers.get("ETag")).toBe(tag);
    expect(first.headers.get("Cache-Control")).toBe("no-store");
    const csv = await call(resultsLoader, `${url}?format=csv`, { token: tokens.checker, params: { caseId: id } });
    expect(csv.headers.get("ETag")).not.toBe(tag);

    const notModified = await call(resultsLoader, url, { token: tokens.checker, params: { caseId: id }, headers: { "If-None-Match": `"other", ${tag}` } });
    expect(notModified.status).toBe(304);
    expect(notModified.text).toBe("");
    expect(notModified.headers.get("ETag")).toBe(tag);
    const otherTag = await call(resultsLoader, url, { token: tokens.checker, params: { caseId: id }, headers: { "If-None-Match": '"other"' } });
    expect(otherTag.status).toBe(200);

    // A heavier aircraft: the same case file with every mass-driven load changed.
    const [masses] = await db.select().from(caseSteps).where(and(eq(caseSteps.caseId, id), eq(caseSteps.step, "masses")));
    const data = masses!.data as { structureKg: number };
    await db.update(caseSteps).set({ data: { ...data, structureKg: data.structureKg * 1.1 } }).where(eq(caseSteps.id, masses!.id));
    const changed = await call(resultsLoader, url, { token: tokens.checker, params: { caseId: id }, headers: { "If-None-Match": tag! } });
    expect(changed.status).toBe(200);
    expect(changed.headers.get("ETag")).not.toBe(tag);
    expect(changed.text).not.toBe(first.text);
  });
});

describe("the seeded demo case", () => {
  it("exports a valid document whose stored results equal running it", async () => {
    const exported = await call(exportLoader, `/api/v1/cases/${kelvardCaseId}/export`, { token: tokens.engineer, params: { caseId: kelvardCaseId } });
    expect(exported.status).toBe(200);
    expect(exported.headers.get("Content-Disposition")).toBe('inline; filename="TN-WL-001.case.json"');
    const parsed = parseCase(exported.body);
    if (!parsed.ok) throw new Error(`export does not parse: ${JSON.stringify(parsed.problems)}`);
    const res = await call(resultsLoader, `/api/v1/cases/${kelvardCaseId}/results`, { token: tokens.engineer, params: { caseId: kelvardCaseId } });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(runCase(parsed.value))));
  });
});

describe("the API page", () => {
  it("shows the exchange format as a document (headings, field tables, examples) and command lines for this server's origin", () => {
    const page = apiDocsLoader();
    expect(page.exchangeFormat).toContain("<h1>The exchange format");
    expect(page.exchangeFormat).toMatch(/<table>[\s\S]*<th>field<\/th>/);
    expect(page.exchangeFormat).toContain(`<pre tabindex="0"><code`); // scrollable code blocks reachable by keyboard
    expect(page.exchangeFormat).not.toContain("| field |");
    const origin = process.env.APP_ORIGIN ?? "http://127.0.0.1:3000";
    expect(page.endpoints.every((e) => e.curl.includes(`${origin}/api/v1/`))).toBe(true);
  });
});

describe("GET /api/v1/openapi.json", () => {
  it("is public, valid JSON, OpenAPI 3.1 with every path and the exchange schemas", async () => {
    const res = await call(openApiLoader as Handler, "/api/v1/openapi.json");
    expect(res.status).toBe(200);
    const doc = JSON.parse(res.text) as { openapi: string; paths: Record<string, Record<string, unknown>>; components: { schemas: Record<string, { properties?: Record<string, unknown>; required?: string[] }> } };
    expect(doc.openapi).toBe("3.1.0");
    expect(Object.keys(doc.paths).sort()).toEqual(
      ["/api/v1/analyze", "/api/v1/analyze/jobs/{jobId}", "/api/v1/cases", "/api/v1/cases/import", "/api/v1/cases/{caseId}", "/api/v1/cases/{caseId}/export", "/api/v1/cases/{caseId}/results", "/api/v1/openapi.json"].sort(),
    );
    // Token scopes: import needs read-write; everything else takes either.
    const ops = doc.paths as Record<string, Record<string, { security?: { bearer?: string[] }[]; description?: string; "x-limits"?: Record<string, number> }>>;
    expect(ops["/api/v1/cases/import"]!.post!.security).toEqual([{ bearer: ["read-write"] }, { cookie: [] }]);
    expect((doc as unknown as { security: unknown }).security).toEqual([{ bearer: ["read"] }, { bearer: ["read-write"] }, { cookie: [] }]);
    expect(JSON.stringify((doc as unknown as { components: { securitySchemes: unknown } }).components.securitySchemes)).toContain("read-write");
    // The analysis limits, named and numbered.
    expect(ops["/api/v1/analyze"]!.post!["x-limits"]).toMatchObject({ wingStations: 200, outputStations: 400, casesAnsweredAtOnce: 500, casesPerRequest: 20000 });
    expect(ops["/api/v1/analyze"]!.post!.description).toContain("at most 200 wing stations");
    expect(doc.paths["/api/v1/analyze"]).toHaveProperty("post");
    expect(doc.paths["/api/v1/cases/import"]).toHaveProperty("post");
    const caseFile = doc.components.schemas.CaseFile!;
    expect(Object.keys(caseFile.properties!)).toEqual(expect.arrayContaining(["schema", "title", "wing", "method", "cases"]));
    expect(caseFile.required).toEqual(expect.arrayContaining(["schema", "wing", "cases"]));
    expect(Object.keys(doc.components.schemas.CaseResult!.properties!)).toEqual(["schema", "engine", "method", "wing", "cases", "envelope"]);
    // Every $ref points at a component that exists.
    const refs = [...res.text.matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)].map((m) => m[1]!);
    for (const r of refs) expect(doc.components.schemas).toHaveProperty(r);
  });
});

describe("case steps stored by an import", () => {
  it("carry the mass items, the mass cases (weight from their cases) and each case's mass case and tail load", async () => {
    const file = example("kf60-tern-masses") as {
      wing: { mass: { kg: number; items: { id: string; kg: number }[] } };
      massCases: { id: string; fill: Record<string, number> }[];
      cases: { id: string; weight?: number; massCase?: string; tailLoad?: number }[];
    };
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-WL-MASS", case: file }) });
    expect(res.status).toBe(201);
    const rows = await db.select().from(caseSteps).where(eq(caseSteps.caseId, res.body!.id as string));
    const byStep = Object.fromEntries(rows.map((r) => [r.step, r.data as Record<string, unknown>]));
    const masses = byStep.masses as { structureKg: number; items: { id: string; label: string }[]; massCases: { id: string; weight?: number; cg?: number; fill: Record<string, number> }[] };
    expect(masses.structureKg).toBe(file.wing.mass.kg);
    expect(masses.items.map((i) => i.id)).toEqual(file.wing.mass.items.map((i) => i.id));
    expect(masses.massCases.map((m) => m.fill)).toEqual(file.massCases.map((m) => m.fill));
    // Each mass case's weight is that of its cases (all of one weight), in kg; the CG is not in the format.
    const zfw = masses.massCases.find((m) => m.id === "MZFW")!;
    expect(zfw.weight! * 9.80665).toBeCloseTo(file.cases.find((c) => c.massCase === "MZFW")!.weight!, 6);
    expect(zfw.cg).toBeUndefined();
    const envCases = byStep.envelope!.cases as { id: string; massCase?: string; tailLoad?: number }[];
    expect(envCases.map((c) => [c.massCase, c.tailLoad])).toEqual(file.cases.map((c) => [c.massCase, c.tailLoad]));
  });

  it("are the planform, sections, masses and envelope the document describes", async () => {
    const res = await call(importAction, "/api/v1/cases/import", { token: tokens.engineer, ...jsonPost({ programmeId: kelvardProgrammeId, reference: "TN-WL-STEPS", case: example("kf60-tern-lifting-line") }) });
    const rows = await db.select().from(caseSteps).where(eq(caseSteps.caseId, res.body!.id as string));
    const byStep = Object.fromEntries(rows.map((r) => [r.step, r.data as Record<string, unknown>]));
    const file = example("kf60-tern-lifting-line") as { wing: { stations: { y: number; chord: number }[]; mass: { kg: number } }; cases: { id: string }[] };
    expect(Object.keys(byStep).sort()).toEqual(["envelope", "masses", "planform", "sections"]);
    expect((byStep.planform!.stations as { chord: number }[]).map((s) => s.chord)).toEqual(file.wing.stations.map((s) => s.chord));
    expect(byStep.masses).toEqual({ structureKg: file.wing.mass.kg, items: [], massCases: [], source: { kind: "import" } });
    const envCases = byStep.envelope!.cases as { id: string; kind: string; rule: string }[];
    expect(envCases.map((c) => c.id)).toEqual(file.cases.map((c) => c.id));
    expect(envCases.every((c) => c.kind === "manual" && c.rule === "imported")).toBe(true);
  });
});
