import fs from "node:fs";
import path from "node:path";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import routes from "~/routes";
import { db } from "~/db/client.server";
import { DEMO_USERS } from "~/demo/scenario";
import { cases, programmes, reports } from "~/db/schema";
import { buildCaseFile, caseInputs } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { cookieFor, request, run } from "./helpers";

/**
 * The authorisation matrix: every route module of app/routes.ts (walked, not listed by hand), its
 * loader and its action, for each kind of caller. The expected answers below are the policy,
 * written independently of app/auth/permissions.ts, so a change there that opens a hole fails here.
 * The answers actually observed are written into docs/security.md.
 */

type Caller = "anonymous" | "engineer" | "checker" | "quality" | "admin" | "outsider";
const CALLERS: readonly Caller[] = ["anonymous", "engineer", "checker", "quality", "admin", "outsider"];
type Role = "engineer" | "checker" | "quality" | "admin";
const ALL: readonly Role[] = ["engineer", "checker", "quality", "admin"];

/** What one handler must answer. `anon` is how a caller without a session is turned away. */
type Rule =
  | { kind: "public" }
  | { kind: "fixed"; answer: Outcome; note: string }
  | { kind: "roles"; roles: readonly Role[]; anon: "sign-in" | "401"; record: boolean }
  | { kind: "own"; anon: "sign-in" | "401" };

type Outcome = "allowed" | "sign-in" | "401" | "403" | "404" | "405";

const pub: Rule = { kind: "public" };
const page = (roles: readonly Role[], record = false): Rule => ({ kind: "roles", roles, anon: "sign-in", record });
const api = (roles: readonly Role[], record = false): Rule => ({ kind: "roles", roles, anon: "401", record });
const fixed = (answer: Outcome, note: string): Rule => ({ kind: "fixed", answer, note });
const notAllowed = fixed("405", "method not answered, before any check");
/** A record only its own person sees: the id in the matrix names nobody's, so every signed-in caller gets 404. */
const own: Rule = { kind: "own", anon: "401" };

/** The policy per route module file; `intents` adds rows for actions whose permission depends on the intent. */
const POLICY: Record<string, { loader?: Rule; action?: Rule; intents?: Record<string, Rule>; query?: string }> = {
  "routes/home.tsx": { loader: page(ALL) },
  "routes/auth/login.tsx": { loader: pub, action: pub },
  "routes/auth/logout.ts": { loader: pub, action: pub },
  "routes/auth/sso.ts": { loader: fixed("404", "company sign-in is not configured in this run") },
  "routes/auth/sso-callback.ts": { loader: fixed("404", "company sign-in is not configured in this run") },
  "routes/auth/invite.tsx": { loader: fixed("404", "unknown token"), action: fixed("404", "unknown token") },
  "routes/app-layout.tsx": { loader: page(ALL) },
  "routes/cases/list.tsx": { loader: page(ALL) },
  "routes/cases/new.tsx": { loader: page(["engineer"]), action: page(["engineer"]) },
  "routes/cases/case-layout.tsx": { loader: page(ALL, true) },
  "routes/cases/overview.tsx": { loader: page(ALL, true) },
  "routes/cases/basis.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/planform.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/sections.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/masses.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/envelope.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/distribution.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/loads.tsx": { loader: page(ALL, true), action: page(["engineer"], true) },
  "routes/cases/review.tsx": {
    loader: page(ALL, true),
    action: page(ALL, true),
    intents: {
      submit: page(["engineer"], true),
      approve: page(["checker"], true),
      return: page(["checker"], true),
      comment: page(ALL, true),
      "approve-case": page(["checker"], true),
    },
  },
  "routes/cases/reports.tsx": {
    loader: page(["engineer", "checker", "quality"], true),
    action: page(["engineer", "checker", "quality"], true),
    intents: { request: page(["engineer"], true), rerun: page(["engineer", "checker", "quality"], true), release: page(["quality"], true) },
  },
  "routes/cases/report-compare.tsx": { loader: page(["engineer", "checker", "quality"], true) },
  "routes/programmes/list.tsx": { loader: page(ALL), action: page(["admin"]) },
  "routes/programmes/detail.tsx": { loader: page(ALL, true) },
  "routes/checks.tsx": { loader: page(["checker"]) },
  "routes/methods.tsx": { loader: page(ALL) },
  "routes/audit.tsx": { loader: page(["quality", "admin"]) },
  "routes/reports.tsx": { loader: page(["engineer", "checker", "quality"]), action: page(["engineer", "checker", "quality"]) },
  "routes/admin/members.tsx": { loader: page(["admin"]), action: page(["admin"]) },
  "routes/account.tsx": { loader: page(ALL), action: page(ALL) },
  "routes/account-tokens.tsx": { loader: page(ALL), action: page(ALL) },
  "routes/dev/mailbox.tsx": { loader: page(ALL) },
  "routes/api/planform-preview.ts": { action: page(ALL) },
  "routes/api/case-distribution.ts": { loader: page(ALL, true), query: "case=:loadCaseId" },
  "routes/api/case-flagged-cases.ts": { loader: page(ALL, true) },
  "routes/api/case-load-case-search.ts": { loader: page(ALL, true), query: "q=:loadCaseId" },
  "routes/api/case-rule-sensitivity.ts": { loader: page(ALL, true) },
  "routes/api/case-spanwise-methods.ts": { loader: page(ALL, true), query: "case=:loadCaseId" },
  "routes/api/case-load-cases.ts": { loader: page(ALL, true) },
  "routes/api/case-loads.ts": { loader: page(ALL, true) },
  "routes/api/case-report-comparison.ts": { loader: page(["engineer", "checker", "quality"], true) },
  "routes/api/case-loads-breakdown.ts": { loader: page(ALL, true), query: "case=:loadCaseId" },
  // Putting back a step's saved revision over data changed outside the app: an administrator's act.
  "routes/api/case-step-restore.ts": { action: page(["admin"], true) },
  "routes/api-docs.tsx": { loader: pub },
  "routes/api/v1/cases.ts": { loader: api(ALL), action: notAllowed },
  "routes/api/v1/case-import.ts": { loader: notAllowed, action: api(["engineer"]) },
  "routes/api/v1/case.ts": { loader: api(ALL, true), action: notAllowed },
  "routes/api/v1/case-export.ts": { loader: api(ALL, true), action: notAllowed },
  "routes/api/v1/case-results.ts": { loader: api(ALL, true), action: notAllowed },
  "routes/api/v1/case-reports.ts": { loader: api(["engineer", "checker", "quality"], true), action: notAllowed },
  "routes/api/v1/report-pdf.ts": { loader: api(["engineer", "checker", "quality"], true), action: notAllowed },
  "routes/api/v1/analyze.ts": { loader: notAllowed, action: api(ALL) },
  "routes/api/v1/analyze-job.ts": { loader: own, action: notAllowed },
  "routes/api/v1/openapi.ts": { loader: pub, action: notAllowed },
  "routes/api/v1/not-found.ts": { loader: fixed("404", "no such endpoint"), action: fixed("404", "no such endpoint") },
  "routes/api/healthz.ts": { loader: pub },
};

interface FlatRoute {
  file: string;
  path: string;
}

/** Every route of the config with its full URL pattern (layouts have none of their own). */
function flatten(entries: readonly RouteConfigEntry[], parent = ""): FlatRoute[] {
  return entries.flatMap((e) => {
    const own = e.path ? `${parent.replace(/\/$/, "")}/${e.path}` : parent || "/";
    return [{ file: e.file, path: own }, ...flatten(e.children ?? [], own)];
  });
}

const outsiderRoles = DEMO_USERS.find((u) => u.label === "outsider")!.roles;

function expected(rule: Rule, caller: Caller): Outcome {
  if (rule.kind === "public") return "allowed";
  if (rule.kind === "fixed") return rule.answer;
  if (caller === "anonymous") return rule.anon;
  if (rule.kind === "own") return "404";
  const roles: readonly Role[] = caller === "outsider" ? outsiderRoles : [caller];
  // Kelvard's records are invisible to Northmoor's person whatever their role: the same 404 as a missing record.
  if (caller === "outsider" && rule.record) return "404";
  return roles.some((r) => rule.roles.includes(r)) ? "allowed" : "403";
}

function classify(res: { status: number; headers: Headers }): { outcome: Outcome; shown: string } {
  const location = res.headers.get("Location") ?? "";
  if (res.status >= 300 && res.status < 400) {
    const target = new URL(location, "http://x");
    if (target.pathname === "/login" && target.searchParams.get("reason") !== "signed-out") return { outcome: "sign-in", shown: "sign-in" };
    return { outcome: "allowed", shown: `allowed (${res.status} → ${location.split("?")[0]})` };
  }
  if ([401, 403, 404, 405].includes(res.status)) return { outcome: String(res.status) as Outcome, shown: String(res.status) };
  if (res.status >= 500) return { outcome: "allowed", shown: `ERROR ${res.status}` };
  return { outcome: "allowed", shown: `allowed (${res.status})` };
}

const cookies: Partial<Record<Caller, string>> = {};
let params: Record<string, string> = {};
let emptyCaseId = "";

beforeAll(async () => {
  const { seed } = await import("./helpers");
  await seed({ report: true });
  const [p] = await db.select().from(programmes).where(eq(programmes.code, "KF60"));
  const [c] = await db.select().from(cases).where(and(eq(cases.programmeId, p!.id), eq(cases.reference, "TN-WL-001")));
  const [empty] = await db.select().from(cases).where(and(eq(cases.programmeId, p!.id), eq(cases.reference, "TN-WL-002")));
  const [r] = await db.select().from(reports).where(eq(reports.caseId, c!.id));
  emptyCaseId = empty!.id;
  const loadCaseId = buildCaseFile(c!.title, caseInputs(await getCaseSteps(c!.id)), "envelope").cases[0]!.id;
  params = { loadCaseId, caseId: c!.id, programmeId: p!.id, reportId: r!.id, step: "distribution", token: "no-such-invitation-token-0000000000", jobId: "00000000-0000-4000-8000-000000000000", "*": "no-such-endpoint" };
  for (const caller of CALLERS) if (caller !== "anonymous") cookies[caller] = await cookieFor(caller);
}, 120_000);

// A re-run queues a job: the queue's connections end with the file.
afterAll(async () => {
  const { stopBoss } = await import("~/jobs/boss.server");
  await stopBoss();
});

/**
 * Bodies that pass each intent's schema, with the caller's own password where the intent re-confirms
 * identity, so the role check behind the schema is what answers.
 */
function intentBody(file: string, intent: string, caller: Caller): FormData {
  const fd = new FormData();
  fd.set("intent", intent);
  const password = DEMO_USERS.find((u) => u.label === caller)?.password;
  if (password && (intent === "submit" || intent === "approve" || intent === "approve-case" || intent === "release")) fd.set("password", password);
  if (file.endsWith("review.tsx")) {
    if (intent !== "approve-case") fd.set("step", "planform");
    if (intent === "return") fd.set("comment", "Please recheck the tip chord.");
    if (intent === "comment") fd.set("body", "Matrix comment.");
  }
  if (intent === "release" || intent === "rerun") fd.set("reportId", params.reportId!);
  return fd;
}

interface Row {
  route: string;
  file: string;
  handler: string;
  cells: Record<Caller, string>;
  holes: string[];
}

async function call(fn: (args: never) => unknown, url: string, method: "GET" | "POST", caller: Caller, body: ((caller: Caller) => FormData) | undefined, routeParams: Record<string, string>) {
  const cookie = cookies[caller];
  const req = request(url, { method, cookie, body: body?.(caller) });
  const res = await run(fn, { request: req, params: routeParams });
  // Signing out ends the session the later rows need: sign the person in again.
  if (caller !== "anonymous" && url === "/logout" && method === "POST") cookies[caller] = await cookieFor(caller);
  return res;
}

describe("authorisation matrix", () => {
  it("answers every loader and action of app/routes.ts as the policy says, for every kind of caller", { timeout: 240_000 }, async () => {
    const flat = flatten(routes);
    const unknown = flat.filter((r) => !(r.file in POLICY)).map((r) => r.file);
    expect(unknown, "route modules without a policy entry").toEqual([]);
    const rows: Row[] = [];

    for (const r of flat) {
      const mod = (await import(path.resolve("app", r.file))) as { loader?: (a: never) => unknown; action?: (a: never) => unknown };
      const policy = POLICY[r.file]!;
      const query = policy.query ? `?${policy.query.replace(/:(\w+)/g, (_, name: string) => encodeURIComponent(params[name]!))}` : "";
      const url = r.path.replace(/:(\w+)/g, (_, name: string) => params[name]!).replace("*", params["*"]!) + query;
      const kinds: { handler: string; fn: ((a: never) => unknown) | undefined; rule: Rule | undefined; method: "GET" | "POST"; body?: (caller: Caller) => FormData; url?: string; params?: Record<string, string> }[] = [
        { handler: "loader (GET)", fn: mod.loader, rule: policy.loader, method: "GET" },
        { handler: "action (POST, empty body)", fn: mod.action, rule: policy.action, method: "POST", body: () => new FormData() },
      ];
      for (const [intent, rule] of Object.entries(policy.intents ?? {})) {
        // Intents that could change the demo case run against the empty case, where they are refused for content, not role.
        const onEmpty = intent !== "release" && intent !== "comment" && intent !== "rerun";
        const p = onEmpty ? { ...params, caseId: emptyCaseId } : params;
        kinds.push({ handler: `action intent=${intent}`, fn: mod.action, rule, method: "POST", body: (caller: Caller) => intentBody(r.file, intent, caller), url: r.path.replace(/:(\w+)/g, (_, n: string) => p[n]!), params: p });
      }

      for (const k of kinds) {
        expect(Boolean(k.fn), `${r.file} ${k.handler}: policy and module disagree on whether it exists`).toBe(Boolean(k.rule));
        if (!k.fn || !k.rule) continue;
        const cells = {} as Record<Caller, string>;
        const holes: string[] = [];
        for (const caller of CALLERS) {
          const res = await call(k.fn, k.url ?? url, k.method, caller, k.body, k.params ?? params);
          const got = classify(res);
          const want = expected(k.rule, caller);
          cells[caller] = got.shown;
          if (got.outcome !== want || got.shown.startsWith("ERROR")) holes.push(`${caller}: expected ${want}, got ${got.shown}`);
        }
        rows.push({ route: r.path, file: r.file, handler: k.handler, cells, holes });
      }
    }

    writeMatrix(rows);
    const holes = rows.flatMap((row) => row.holes.map((h) => `${row.route} ${row.handler} — ${h}`));
    expect(holes).toEqual([]);
  });
});

const START = "<!-- authz-matrix:start -->";
const END = "<!-- authz-matrix:end -->";

/** Replaces the marked block of docs/security.md with the observed matrix. */
function writeMatrix(rows: Row[]) {
  const file = path.resolve("docs/security.md");
  const head = `| route | module | handler | anonymous | engineer | checker | quality | admin | other organisation |\n|---|---|---|---|---|---|---|---|---|`;
  const lines = rows.map((r) => `| \`${r.route}\` | \`${r.file.replace(/^routes\//, "")}\` | ${r.handler} | ${CALLERS.map((c) => r.cells[c]).join(" | ")} |`);
  const block = `${START}\n${head}\n${lines.join("\n")}\n${END}`;
  const current = fs.existsSync(file) ? fs.readFileSync(file, "utf8") : `# Security\n\n${START}\n${END}\n`;
  const at = current.indexOf(START);
  const end = current.indexOf(END);
  const next = at >= 0 && end > at ? current.slice(0, at) + block + current.slice(end + END.length) : `${current.trimEnd()}\n\n${block}\n`;
  if (next !== current) fs.writeFileSync(file, next);
}

describe("ids of another organisation's records inside a body", () => {
  it("are refused, and leave those records as they were", async () => {
    const { users, memberships, apiTokens } = await import("~/db/schema");
    const { createApiToken } = await import("~/auth/api-auth.server");
    const { action: membersAction } = await import("~/routes/admin/members");
    const { action: tokensAction } = await import("~/routes/account-tokens");
    const outsider = DEMO_USERS.find((u) => u.label === "outsider")!;
    const [jonas] = await db.select().from(users).where(eq(users.email, outsider.email));
    const [membership] = await db.select().from(memberships).where(eq(memberships.userId, jonas!.id));
    const token = await createApiToken({ userId: jonas!.id, organisationId: membership!.organisationId, name: "matrix", scope: "read", actor: { id: jonas!.id, email: jonas!.email } });

    // Kelvard's administrator tries to change the roles of Northmoor's person.
    const roles = new FormData();
    roles.set("intent", "set-roles");
    roles.set("userId", jonas!.id);
    roles.append("roles", "checker");
    const setRoles = await run(membersAction, { request: request("/admin", { method: "POST", cookie: cookies.admin, body: roles }) });
    expect(setRoles.status).toBeGreaterThanOrEqual(400);
    expect(setRoles.status).toBeLessThan(500);
    const [after] = await db.select().from(memberships).where(eq(memberships.userId, jonas!.id));
    expect(after!.roles).toEqual(membership!.roles);

    // Kelvard's engineer tries to revoke Northmoor's person's API token.
    const revoke = new FormData();
    revoke.set("intent", "revoke");
    revoke.set("tokenId", token.id);
    const revoked = await run(tokensAction, { request: request("/account/tokens", { method: "POST", cookie: cookies.engineer, body: revoke }) });
    expect(revoked.status).toBeGreaterThanOrEqual(400);
    expect(revoked.status).toBeLessThan(500);
    const [stillThere] = await db.select().from(apiTokens).where(eq(apiTokens.id, token.id));
    expect(stillThere!.revokedAt).toBeNull();
  });
});
