import { and, eq, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { db, type Db, type Tx } from "~/db/client.server";
import { DomainError } from "~/domain/errors";
import type { Actor } from "~/domain/people";
import { caseSteps, STEP_HEAD_CASES, type CaseStep } from "~/db/schema";
import { EnvelopeSchema, LoadCaseSchema, type EnvelopeData, type LoadCase } from "~/domain/step-data";
import { fieldErrorsOf, type FieldErrors } from "~/utils/form-data";
import { getCaseSteps, saveStep, stepData } from "./case-steps.server";

/** Rows one window request may ask for: a screenful or a few, never the whole file. */
export const MAX_WINDOW_ROWS = 500;

export interface LoadCaseWindow {
  /** The envelope step's revision the rows belong to (0 before it is saved). */
  revision: number;
  /** Load cases in the stored envelope. */
  total: number;
  offset: number;
  cases: LoadCase[];
}

/**
 * Rows offset … offset + limit − 1 of the stored load cases and how many there are. PostgreSQL
 * picks them out of the stored document (element access into a jsonb array), so a case file of
 * 100 000 cases is never read whole for one screenful.
 */
export async function loadCaseWindow(caseId: string, offset: number, limit: number, database: Db | Tx = db): Promise<LoadCaseWindow> {
  if (!Number.isInteger(offset) || offset < 0)
    throw new DomainError("offset must be a whole number ≥ 0", {
      field: "offset",
    });
  if (!Number.isInteger(limit) || limit < 1 || limit > MAX_WINDOW_ROWS) throw new DomainError(`limit must be a whole number from 1 to ${MAX_WINDOW_ROWS}`, { field: "limit" });
  // Materialised: the list is taken out of the stored document once, not once per row asked for.
  const result = await database.execute<{ revision: number; total: number; cases: unknown[] | null }>(sql`
    with s as materialized (select revision, data -> 'cases' as cases from case_steps where case_id = ${caseId} and step = 'envelope')
    select s.revision, coalesce(jsonb_array_length(s.cases), 0)::int as total,
      (select jsonb_agg(s.cases -> i order by i) from generate_series(${offset}::int, least(${offset + limit}::int, coalesce(jsonb_array_length(s.cases), 0)) - 1) as i) as cases
    from s`);
  const row = result.rows[0];
  if (!row) return { revision: 0, total: 0, offset, cases: [] };
  return {
    revision: row.revision,
    total: row.total,
    offset,
    cases: (row.cases ?? []).map((c) => LoadCaseSchema.parse(c)),
  };
}

/** The stored envelope step as a page shows it without reading all its load cases. */
export interface EnvelopeOutline {
  revision: number;
  status: CaseStep["status"];
  /** Load cases in the stored envelope. */
  total: number;
  /**
   * The method with the cases read (all of them, or the first rows of a larger file), checked with
   * the step's schema; null when the step is not saved or what was read is not valid.
   */
  data: EnvelopeData | null;
}

/**
 * The envelope step's method and its number of load cases, with every case when there are at most
 * `whole` and otherwise the first `first` (at least one, so that the method is checked with the
 * step's own schema). PostgreSQL counts and picks the rows out of the stored document: the basis
 * and envelope pages of a case of 100 000 load cases do not read, parse and check them all.
 */
export async function envelopeOutline(caseId: string, rows: { first: number; whole: number }, database: Db | Tx = db): Promise<EnvelopeOutline> {
  const first = Math.max(1, rows.first);
  // The count and the digest are columns PostgreSQL keeps as the data are written: the cases themselves
  // are read and checked once per content of the step (and rows asked for), not on every request.
  const [row] = await database
    .select({ revision: caseSteps.revision, status: caseSteps.status, total: sql<number>`coalesce(${caseSteps.caseCount}, 0)`, digest: caseSteps.dataDigest })
    .from(caseSteps)
    .where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  if (!row) return { revision: 0, status: "empty", total: 0, data: null };
  const all = row.total <= rows.whole;
  const key = (digest: string | null) => `${caseId}\n${digest}\n${all ? "all" : first}`;
  const outline = (data: EnvelopeData | null): EnvelopeOutline => ({ revision: row.revision, status: row.status, total: row.total, data });
  const hit = outlines.get(key(row.digest));
  if (hit) return outline(hit.data);
  const read = await envelopeRows(caseId, all ? null : first, database);
  if (!read?.data) return outline(null);
  const cases = Array.isArray(read.data.cases) ? (all ? read.data.cases : read.data.cases.slice(0, first)) : [];
  const parsed = EnvelopeSchema.safeParse({ ...read.data, cases });
  const data = parsed.success ? deepFreeze(parsed.data) : null;
  // Kept under the digest read with the data, so an entry holds exactly what its key names.
  outlines.set(key(read.digest), { data });
  return outline(data);
}

// The envelope's method and cases as read and checked, by case, digest of the step's data and the rows
// asked for: a function of its key, so never stale (any write of the data changes the digest). Shared
// by every caller, hence frozen. Reading and checking the demo's 228 cases cost about 6 ms of CPU per
// request of the envelope page.
const outlines = new LRUCache<string, { data: EnvelopeData | null }>({ max: 64 });

function deepFreeze<T>(value: T): T {
  if (value && typeof value === "object" && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

/**
 * The stored envelope with all its cases (first null) or the first ones (from the head column when it
 * holds them), picked out by PostgreSQL, with the digest of the data in the same read.
 */
async function envelopeRows(caseId: string, first: number | null, database: Db | Tx): Promise<{ data: Record<string, unknown> | null; digest: string | null } | null> {
  const picked = sql`${caseSteps.data} - 'cases' || jsonb_build_object('cases', ${first === null ? sql`${caseSteps.data} -> 'cases'` : sql`jsonb_path_query_array(${caseSteps.data}, '$.cases[0 to $last]', jsonb_build_object('last', ${(first ?? 1) - 1}::int))`})`;
  const data = first !== null && first <= STEP_HEAD_CASES ? sql`coalesce(${caseSteps.head}, ${picked})` : picked;
  const [row] = await database
    .select({ data: sql<Record<string, unknown> | null>`${data}`, digest: caseSteps.dataDigest })
    .from(caseSteps)
    .where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  return row ?? null;
}

export interface LoadCaseEdits {
  caseId: string;
  /** The revision the edits were made on; a save by anyone since refuses them (nothing is written). */
  baseRevision: number;
  /** Changed rows by their index in the stored list, whole rows in SI. */
  changed: { index: number; values: Record<string, unknown> }[];
  /** Indices of stored rows to remove. */
  removed: number[];
  /** New rows, appended after the stored ones, in SI. */
  added: Record<string, unknown>[];
  actor: Actor;
}

/**
 * Applies edits of single rows to a stored envelope and saves the result as a new revision: the
 * way a large case file is edited, where the page holds only the rows in view. Every row is
 * checked with the step's own schema; messages name the row as the person sees it
 * (`cases.<index>.<field>` for stored rows, `added.<n>.<field>` for new ones) and nothing is written.
 */
export async function editLoadCases(input: LoadCaseEdits): Promise<{ ok: true; revision: number } | { ok: false; fieldErrors: FieldErrors }> {
  const steps = await getCaseSteps(input.caseId);
  const envelope = stepData(steps, "envelope");
  if (!envelope) throw new DomainError("The envelope has no load cases yet: save it from the whole grid first.", { field: "revision", kind: "conflict" });
  if (steps.envelope.revision !== input.baseRevision) {
    throw new DomainError(`Not saved: the envelope was saved again (revision ${steps.envelope.revision}) after you opened revision ${input.baseRevision}. Reload to see it; your changes were not written.`, {
      field: "revision",
      kind: "conflict",
    });
  }
  const total = envelope.cases.length;
  for (const i of [...input.changed.map((c) => c.index), ...input.removed]) {
    if (!Number.isInteger(i) || i < 0 || i >= total) throw new DomainError(`Row ${i + 1} does not exist: the envelope has ${total} load cases.`, { field: "cases" });
  }
  // Where each row of the new list came from, so that messages name the row the person edited.
  const rows: unknown[] = envelope.cases.slice();
  for (const c of input.changed) rows[c.index] = c.values;
  const removed = new Set(input.removed);
  const origin: string[] = [];
  const next: unknown[] = [];
  rows.forEach((r, i) => {
    if (removed.has(i)) return;
    next.push(r);
    origin.push(`cases.${i}`);
  });
  input.added.forEach((r, n) => {
    next.push(r);
    origin.push(`added.${n}`);
  });
  const parsed = EnvelopeSchema.safeParse({ ...envelope, cases: next });
  if (!parsed.success) {
    const errors = fieldErrorsOf(parsed.error);
    const named: FieldErrors = {};
    for (const [key, messages] of Object.entries(errors)) {
      const m = /^cases\.(\d+)(\..*)?$/.exec(key);
      named[m ? `${origin[Number(m[1])]}${m[2] ?? ""}` : key] = messages;
    }
    return { ok: false, fieldErrors: named };
  }
  const saved = await saveStep({
    caseId: input.caseId,
    step: "envelope",
    baseRevision: input.baseRevision,
    data: parsed.data,
    actor: input.actor,
  });
  return { ok: true, revision: saved.revision };
}
