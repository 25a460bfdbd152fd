import pg from "pg";
import { afterAll, beforeAll, vi } from "vitest";
import { db } from "~/db/client.server";
import { eq } from "drizzle-orm";
import { auditLog, cases, caseSteps, stepRevisions } from "~/db/schema";
import { DEMO_CASE_INPUTS, DEMO_USERS, type DemoUser } from "~/demo/scenario";
import { seedDemo } from "~/demo/seed.server";
import { stopBoss } from "~/jobs/boss.server";
import { RouterContextProvider } from "react-router";
import { signInWithPassword } from "~/auth/auth.server";
import { requestReads, type RequestScope } from "~/auth/request-context.server";
import { CLIENT_ADDRESS_HEADER } from "~/utils/http.server";

export const ORIGIN = "http://127.0.0.1:3000";

/** The demo scenario without its issued report (rendering a PDF in every test file would be slow). */
export async function seed(opts: { report?: boolean } = { report: false }) {
  return seedDemo(db, opts);
}

/** The demo scenario seeded, with its case TN-WL-001 and a demo user signed in (the engineer unless named). */
export async function seededDemoCase(label: DemoUser["label"] = "engineer"): Promise<{ caseId: string; cookie: string }> {
  await seed();
  const [c] = await db.select({ id: cases.id }).from(cases).where(eq(cases.reference, "TN-WL-001"));
  return { caseId: c!.id, cookie: await cookieFor(label) };
}

/** For a whole test file: the seeded demo case and a signed-in cookie handed to `set` before the tests, the job queue stopped after them. */
export function withSeededDemoCase(set: (demo: { caseId: string; cookie: string }) => void, label: DemoUser["label"] = "engineer"): void {
  beforeAll(async () => set(await seededDemoCase(label)), 120_000);
  afterAll(stopBoss);
}

export function demoUser(label: DemoUser["label"]): DemoUser {
  return DEMO_USERS.find((u) => u.label === label)!;
}

/** Signs a demo user in through the real password path and returns the Cookie header value. */
export async function cookieFor(label: DemoUser["label"]): Promise<string> {
  const u = demoUser(label);
  const result = await signInWithPassword({ email: u.email, password: u.password, address: `10.${label.length}.0.1`, userAgent: "vitest" });
  if (!result.ok) throw new Error(`sign-in of ${label} failed: ${result.message}`);
  return result.setCookie.split(";")[0]!;
}

export function request(path: string, init: RequestInit & { cookie?: string } = {}): Request {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("Cookie", init.cookie);
  headers.set(CLIENT_ADDRESS_HEADER, "127.0.0.1");
  return new Request(new URL(path, ORIGIN), { ...init, headers });
}

export function form(fields: Record<string, string | string[]>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) for (const item of Array.isArray(v) ? v : [v]) fd.append(k, item);
  return fd;
}

/** The request with the context the root's middleware gives it, as a loader or action receives them. */
export async function scopeOf(req: Request): Promise<RequestScope> {
  const context = new RouterContextProvider();
  await requestReads({ request: req, context, params: {}, url: new URL(req.url), pattern: "" }, async () => new Response());
  return { request: req, context };
}

/** A loader's or action's arguments as the router hands them, after the root's middleware. */
export async function routeArgs(req: Request, params: Record<string, string> = {}) {
  return { ...(await scopeOf(req)), params };
}

/** Runs a loader or action and returns the Response it threw or returned (redirects and errors are thrown). */
export async function run(fn: (args: never) => unknown, args: { request: Request; params?: Record<string, string> }): Promise<{ status: number; body: unknown; headers: Headers }> {
  try {
    const out = await fn((await routeArgs(args.request, args.params)) as never);
    return normalise(out);
  } catch (thrown) {
    return normalise(thrown);
  }
}

function normalise(value: unknown): { status: number; body: unknown; headers: Headers } {
  if (value instanceof Response) return { status: value.status, body: null, headers: value.headers };
  if (value && typeof value === "object" && "type" in value && (value as { type: string }).type === "DataWithResponseInit") {
    const d = value as unknown as { data: unknown; init: ResponseInit | null };
    return { status: d.init?.status ?? 200, body: d.data, headers: new Headers(d.init?.headers) };
  }
  if (value instanceof Error) throw value;
  return { status: 200, body: value, headers: new Headers() };
}

/** Sorted-key JSON written here from the definition (keys sorted, no spaces), independently of the application's serialiser. */
export function canonical(value: unknown): string {
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  return `{${Object.keys(value as object)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`)
    .join(",")}}`;
}

/** The text of every query sent to PostgreSQL while `work` runs. */
export async function queriesOf(work: () => Promise<unknown>): Promise<string[]> {
  const sent: string[] = [];
  const query = pg.Client.prototype.query;
  const spy = vi.spyOn(pg.Client.prototype, "query").mockImplementation(function (this: pg.Client, ...args: unknown[]) {
    const q = args[0] as string | { text?: string };
    sent.push(typeof q === "string" ? q : (q.text ?? ""));
    return (query as (...a: unknown[]) => unknown).apply(this, args);
  } as typeof query);
  try {
    await work();
  } finally {
    spy.mockRestore();
  }
  return sent;
}

/** The row values PostgreSQL sent while `work` runs, as text (before pg parses them: JSON, numbers…). */
export async function rowFieldsOf(work: () => Promise<unknown>): Promise<string[]> {
  const fields: string[] = [];
  const query = pg.Query.prototype as unknown as { handleDataRow(msg: { fields: (string | null)[] }): void };
  const handle = query.handleDataRow;
  const spy = vi.spyOn(query, "handleDataRow").mockImplementation(function (this: unknown, msg) {
    for (const field of msg.fields) if (field !== null) fields.push(field);
    return handle.call(this, msg);
  });
  try {
    await work();
  } finally {
    spy.mockRestore();
  }
  return fields;
}

/** Characters of the row values PostgreSQL sent while `work` runs (text, before pg parses them: JSON, numbers…). */
export async function rowTextOf(work: () => Promise<unknown>): Promise<number> {
  return (await rowFieldsOf(work)).reduce((sum, field) => sum + field.length, 0);
}

/** Of those, the reads of the steps' data column itself (a digest of it is md5("data"::text)). */
export const readsStepData = (sent: string[]) => sent.filter((text) => text.includes('"case_steps"') && /"data"(?!::text)/.test(text));

/** Rows of the tables a step's save writes: equal before and after a refused post means nothing was written. */
export async function stepWriteCounts() {
  return { steps: (await db.select().from(caseSteps)).length, revisions: (await db.select().from(stepRevisions)).length, audit: (await db.select().from(auditLog)).length };
}

/** The demo planform as the planform page posts it. */
export function demoPlanformFields(revision = "0"): Record<string, string> {
  const p = DEMO_CASE_INPUTS.planform;
  const out: Record<string, string> = { revision, axisRoot: String(p.axisRoot), axisTip: String(p.axisTip) };
  p.stations.forEach((s, i) => Object.assign(out, { [`stations.${i}.y`]: String(s.y), [`stations.${i}.xLe`]: String(s.xLe), [`stations.${i}.chord`]: String(s.chord), [`stations.${i}.twist`]: String(s.twist) }));
  return out;
}

/** The demo section rows as the sections page posts them, with the named panels (flaps, aileron) as dotted fields. */
export function demoSectionsFields(revision: string, panels: Record<string, Record<string, unknown>> = {}): Record<string, string> {
  const out: Record<string, string> = { intent: "save", revision };
  DEMO_CASE_INPUTS.sections.rows.forEach((r, i) => Object.assign(out, Object.fromEntries(Object.entries(r).map(([k, v]) => [`rows.${i}.${k}`, String(v)]))));
  for (const [panel, fields] of Object.entries(panels)) for (const [k, v] of Object.entries(fields)) out[`${panel}.${k}`] = String(v);
  return out;
}

/** The demo basis as the basis page posts it, in SI, with any further fields of the basis named (VF, CLmax with flaps). */
export function demoBasisFields(revision: string, more: readonly ("vf" | "clMaxFlaps")[] = []): Record<string, string> {
  const b = DEMO_CASE_INPUTS.basis;
  const keys = ["mtow", "mzfw", "minWeight", "vs1", "va", "vb", "vc", "vd", "wingArea", "clMax", "clMaxNegative", ...more] as const;
  return { revision, units: "SI", category: b.category, regulations: b.regulations, altitudes: b.altitudes.join(", "), ...Object.fromEntries(keys.map((k) => [k, String(b[k])])) };
}
