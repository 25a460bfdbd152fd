import { and, eq, inArray, notInArray, sql } from "drizzle-orm";
import type { z } from "zod";
import { canonicalJson, sha256Hex, writeAudit } from "~/db/audit.server";
import { db, prepared, type Db, type Tx } from "~/db/client.server";
import { caseSteps, cases, stepRevisions, users, type CaseStep } from "~/db/schema";
import { STEP_KEYS, type StepKey } from "~/domain/vocabulary";
import { LoadCaseSchema, STEP_SCHEMAS, type DistributionData, type EnvelopeData, type LoadCase } from "~/domain/step-data";
import { queueCaseResults } from "./results-queue.server";
import { voidApprovalsAfterEdit } from "./review.server";
import type { Actor } from "~/domain/people";
import type { UnitSystem } from "~/domain/units";
import { DomainError } from "~/domain/errors";


export interface StepState {
  step: StepKey;
  revision: number;
  status: CaseStep["status"];
  data: Record<string, unknown> | null;
  updatedAt: Date | null;
  updatedByName: string | null;
}

/** Every step of a case, in order; steps never saved come back as revision 0, "empty". */
export async function getCaseSteps(caseId: string, database: Db | Tx = db): Promise<Record<StepKey, StepState>> {
  const rows = await database
    .select({ row: caseSteps, updatedByName: users.name })
    .from(caseSteps)
    .leftJoin(users, eq(users.id, caseSteps.updatedBy))
    .where(eq(caseSteps.caseId, caseId));
  return stepsOf(rows, STEP_KEYS);
}

/**
 * The named steps of a case with their data, and no other: a page reads the steps it shows, not the
 * rest (an envelope of 100 000 load cases is megabytes of JSON to send, parse and check).
 */
export async function getCaseStepsOf<K extends StepKey>(caseId: string, keys: readonly K[], database: Db | Tx = db): Promise<Record<K, StepState>> {
  const rows = await database
    .select({ row: caseSteps, updatedByName: users.name })
    .from(caseSteps)
    .leftJoin(users, eq(users.id, caseSteps.updatedBy))
    .where(and(eq(caseSteps.caseId, caseId), inArray(caseSteps.step, [...keys])));
  return stepsOf(rows, keys);
}

/**
 * The digest of what a case's steps hold: PostgreSQL's MD5 of each step's stored data (jsonb's
 * normalised text), so equal data give an equal digest whatever wrote them. Read afresh each call
 * from the column PostgreSQL keeps as the data are written: neither the data nor their hashing.
 */
export async function getCaseStepsDigest(caseId: string, without: readonly StepKey[] = []): Promise<string> {
  return digestOf(await stepDigests().execute({ caseId }), without);
}

/** Every step of a case but those left out, with the digest of their data (as getCaseStepsDigest), from one read. */
export async function getCaseStepsDigested(caseId: string, without: readonly StepKey[] = [], database: Db | Tx = db): Promise<{ steps: Record<StepKey, StepState>; digest: string }> {
  const rows = await database
    .select({ row: caseSteps, updatedByName: users.name, digest: caseSteps.dataDigest })
    .from(caseSteps)
    .leftJoin(users, eq(users.id, caseSteps.updatedBy))
    // The steps left out are not read at all (they come back empty): a large envelope is megabytes.
    .where(and(eq(caseSteps.caseId, caseId), without.length ? notInArray(caseSteps.step, [...without]) : undefined));
  return { steps: stepsOf(rows, STEP_KEYS), digest: digestOf(rows.map((r) => ({ step: r.row.step, digest: r.digest })), without) };
}

/** Up to this many ids, envelopeCasesWith filters by JSON path. */
const FEW_IDS = 4;

/**
 * The envelope's load cases of these ids, in the envelope's order, with the envelope's digest (as
 * getCaseStepsDigest gives it, the envelope alone) from the same read: PostgreSQL picks the cases out,
 * so a page showing a few cases of a large envelope neither receives nor checks the rest. Cases that do
 * not pass the load-case rules are left out.
 */
export async function envelopeCasesWith(caseId: string, ids: readonly string[]): Promise<{ digest: string; cases: LoadCase[] }> {
  // A few ids: a JSON path filter walks the stored cases without making a row of each (100 000 cases: 0.1–0.2 s
  // against 0.55–0.65 s in psql); it compares every case with every id, so many ids (a page's list) go the other way.
  const cases =
    ids.length <= FEW_IDS
      ? sql`case when jsonb_typeof(${caseSteps.data} -> 'cases') = 'array' then jsonb_path_query_array(${caseSteps.data}, 'strict $.cases[*] ? (@.id == $ids[*])', jsonb_build_object('ids', ${JSON.stringify(ids)}::jsonb)) else '[]'::jsonb end`
      : sql`(select coalesce(jsonb_agg(e order by n), '[]'::jsonb) from jsonb_array_elements(case when jsonb_typeof(${caseSteps.data} -> 'cases') = 'array' then ${caseSteps.data} -> 'cases' else '[]'::jsonb end) with ordinality as t(e, n)
        where e ->> 'id' = any(${sql.param([...ids])}::text[]))`;
  const found = await db.execute<{ digest: string | null; cases: unknown[] }>(sql`
    select ${caseSteps.dataDigest} as digest, ${cases} as cases
    from ${caseSteps} where ${caseSteps.caseId} = ${caseId} and ${caseSteps.step} = 'envelope'`);
  const row = found.rows[0];
  if (!row) return { digest: "", cases: [] };
  return { digest: digestOf([{ step: "envelope", digest: row.digest }], []), cases: row.cases.flatMap((c) => { const parsed = LoadCaseSchema.safeParse(c); return parsed.success ? [parsed.data] : []; }) };
}

const stepDigests = prepared((database) =>
  database
    .select({ step: caseSteps.step, digest: caseSteps.dataDigest })
    .from(caseSteps)
    .where(eq(caseSteps.caseId, sql.placeholder("caseId")))
    .prepare("case_step_digests"),
);

/** The digest of the steps' data, leaving out the steps named (a derivation that does not read them). */
function digestOf(rows: { step: string; digest: string | null }[], without: readonly StepKey[]): string {
  return rows
    .filter((r) => !without.includes(r.step as StepKey))
    .map((r) => `${r.step}:${r.digest ?? "-"}`)
    .sort()
    .join(";");
}

function stepsOf<K extends StepKey>(rows: { row: CaseStep; updatedByName: string | null }[], keys: readonly K[]): Record<K, StepState> {
  const out = {} as Record<K, StepState>;
  for (const key of keys) {
    const found = rows.find((r) => r.row.step === key);
    out[key] = found
      ? { step: key, revision: found.row.revision, status: found.row.status, data: found.row.data, updatedAt: found.row.updatedAt, updatedByName: found.updatedByName }
      : { step: key, revision: 0, status: "empty", data: null, updatedAt: null, updatedByName: null };
  }
  return out;
}

/** A step's state without its data: what the case header, step rail and overview show. */
export type StepMeta = Omit<StepState, "data">;

// Every page of a case shows the step states (its header and rail): built once (see `prepared`).
const stepStates = prepared((database) =>
  database
    .select({ step: caseSteps.step, revision: caseSteps.revision, status: caseSteps.status, updatedAt: caseSteps.updatedAt, updatedByName: users.name })
    .from(caseSteps)
    .leftJoin(users, eq(users.id, caseSteps.updatedBy))
    .where(eq(caseSteps.caseId, sql.placeholder("caseId")))
    .prepare("case_step_states"),
);

/**
 * Every step's state without its data, in order (steps never saved: revision 0, "empty"). A step's
 * data can be megabytes (a large envelope); a status line has no need to read, send and parse them.
 */
export async function getCaseStepStates(caseId: string): Promise<Record<StepKey, StepMeta>> {
  const rows = await stepStates().execute({ caseId });
  const out = {} as Record<StepKey, StepMeta>;
  for (const key of STEP_KEYS) {
    const found = rows.find((r) => r.step === key);
    out[key] = found ? { ...found, step: key } : { step: key, revision: 0, status: "empty", updatedAt: null, updatedByName: null };
  }
  return out;
}

/** The stored data of one step, parsed with its schema, or null when the step has not been saved. */
export function stepData<K extends StepKey>(steps: Readonly<Record<NoInfer<K>, StepState>>, key: K) {
  const raw = steps[key].data;
  if (!raw) return null;
  const parsed = STEP_SCHEMAS[key].safeParse(raw);
  return parsed.success ? (parsed.data as z.output<(typeof STEP_SCHEMAS)[K]>) : null;
}

/** The display units chosen in the case's basis (SI until a basis is saved). */
export function caseUnits(steps: Readonly<Record<"basis", StepState>>): UnitSystem {
  return stepData(steps, "basis")?.units ?? "SI";
}

/** The display units of a case, reading its basis step only (a window of a large envelope needs no more). */
export async function getCaseUnits(caseId: string, database: Db | Tx = db): Promise<UnitSystem> {
  const [row] = await database.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "basis")));
  const parsed = row?.data ? STEP_SCHEMAS.basis.safeParse(row.data) : null;
  return parsed?.success ? parsed.data.units : "SI";
}

/**
 * A disposition names a load case of the case's envelope: one for an id the envelope does not
 * hold would sit in the record, and in the report, as if that case had been judged.
 */
async function refuseUnknownLoadCases(tx: Tx, caseId: string, data: DistributionData): Promise<void> {
  const [envelope] = await tx.select({ data: caseSteps.data }).from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "envelope")));
  const known = new Set(((envelope?.data as EnvelopeData | null)?.cases ?? []).map((c) => c.id));
  const unknown = Object.keys(data.dispositions).filter((id) => !known.has(id));
  if (unknown.length) {
    const shown = unknown.slice(0, 5).map((id) => JSON.stringify(id)).join(", ");
    throw new DomainError(`Dispositions name load cases the envelope does not have: ${shown}${unknown.length > 5 ? ` and ${unknown.length - 5} more` : ""}. Disposition only the envelope's cases.`, { field: "dispositions" });
  }
}

/**
 * Saves a new revision of a step. `baseRevision` is the revision the person started editing from:
 * if anyone saved since, nothing is written and the person is told who and when (optimistic
 * concurrency). The revision, its hash, the step's new state and the audit entry are one transaction.
 * Data equal to the stored ones make no revision (`unchanged: true`): a new revision would void the
 * step's approvals for nothing.
 */
export async function saveStep(input: { caseId: string; step: StepKey; baseRevision: number; data: Record<string, unknown>; actor: Actor }, database: Db | Tx = db) {
  const parsed = STEP_SCHEMAS[input.step].safeParse(input.data);
  if (!parsed.success) throw new DomainError(parsed.error.issues[0]?.message ?? "The step's data are not valid", { field: parsed.error.issues[0]?.path.join(".") });
  const data = parsed.data as Record<string, unknown>;
  const saved = await database.transaction(async (tx) => {
    await tx.insert(caseSteps).values({ caseId: input.caseId, step: input.step }).onConflictDoNothing();
    const [current] = await tx
      .select({ row: caseSteps, updatedByName: users.name })
      .from(caseSteps)
      .leftJoin(users, eq(users.id, caseSteps.updatedBy))
      .where(and(eq(caseSteps.caseId, input.caseId), eq(caseSteps.step, input.step)))
      .for("update", { of: caseSteps });
    const row = current!.row;
    if (row.revision !== input.baseRevision) {
      throw new DomainError(
        `Not saved: ${current!.updatedByName ?? "someone"} saved this step (revision ${row.revision}) at ${row.updatedAt.toISOString().slice(0, 16).replace("T", " ")} UTC, after you opened revision ${input.baseRevision}. Reload to see their version; your changes were not written.`,
        { field: "revision", kind: "conflict" },
      );
    }
    if (row.status === "submitted") {
      throw new DomainError("This step is submitted for check and is read-only until the checker returns or approves it.", { field: "status", kind: "conflict" });
    }
    if (input.step === "distribution") await refuseUnknownLoadCases(tx, input.caseId, data as DistributionData);
    if (row.data && sameStepData(row.data, data)) return { revision: row.revision, hash: null, unchanged: true as const };
    const revision = row.revision + 1;
    const hash = sha256Hex(canonicalJson(data));
    await tx.insert(stepRevisions).values({ caseId: input.caseId, step: input.step, revision, data, hash, createdBy: input.actor.id });
    const now = new Date();
    await tx.update(caseSteps).set({ revision, status: "draft", data, updatedBy: input.actor.id, updatedAt: now }).where(eq(caseSteps.id, row.id));
    const voided = await voidApprovalsAfterEdit(tx, { caseId: input.caseId, step: input.step, revision, actor: input.actor });
    const [caseRow] = await tx.update(cases).set({ updatedAt: now, ...(voided.length ? { status: "draft" as const } : {}) }).where(eq(cases.id, input.caseId)).returning({ organisationId: cases.organisationId });
    await writeAudit(tx, {
      organisationId: caseRow!.organisationId,
      actor: input.actor,
      action: `step.${input.step}.save`,
      entityType: "case",
      entityId: input.caseId,
      before: row.data ? { revision: row.revision, data: row.data } : null,
      after: { revision, hash, data, ...(voided.length ? { voidedSignatures: voided } : {}) },
    });
    return { revision, hash, unchanged: false as const };
  });
  // Committed: the worker builds and solves a large case's new results now, not the first page that shows them.
  // A caller's own transaction has not committed yet: it queues them itself.
  if (!saved.unchanged && database === db) await queueCaseResults(input.caseId);
  return saved;
}

/**
 * Puts back a step's data as its current revision was saved, where the stored step was changed
 * since outside Spanwright: the revision's record (step_revisions) is what the app wrote, checked
 * first against the hash taken when it was written. The revision number, its state and its
 * signatures stay, since they rest on exactly the data put back; the data found are kept in the
 * audit entry (step.<step>.restore), as the evidence of what was changed. An administrator's act.
 */
export async function restoreSavedRevision(input: { caseId: string; step: StepKey; revision: number; actor: Actor }, database: Db | Tx = db) {
  const restored = await database.transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(caseSteps)
      .where(and(eq(caseSteps.caseId, input.caseId), eq(caseSteps.step, input.step)))
      .for("update");
    if (!row || row.revision === 0) throw new DomainError("This step has no saved revision to put back.", { field: "revision", kind: "conflict" });
    if (row.revision !== input.revision) {
      throw new DomainError(`The step was saved again (revision ${row.revision}) after you opened revision ${input.revision}: nothing was put back. Reload to see it.`, { field: "revision", kind: "conflict" });
    }
    const [saved] = await tx
      .select({ data: stepRevisions.data, hash: stepRevisions.hash })
      .from(stepRevisions)
      .where(and(eq(stepRevisions.caseId, input.caseId), eq(stepRevisions.step, input.step), eq(stepRevisions.revision, row.revision)));
    if (!saved) throw new DomainError(`Revision ${row.revision} of this step has no saved record: nothing was put back.`, { field: "revision", kind: "conflict" });
    if (sha256Hex(canonicalJson(saved.data)) !== saved.hash) {
      throw new DomainError(`The saved record of revision ${row.revision} does not match the hash taken when it was written: it was changed too, and nothing was put back.`, { field: "revision", kind: "conflict" });
    }
    if (row.data && sha256Hex(canonicalJson(row.data)) === saved.hash) {
      throw new DomainError(`The step's data are those of revision ${row.revision} as saved: there is nothing to put back.`, { field: "revision", kind: "conflict" });
    }
    await tx.update(caseSteps).set({ data: saved.data }).where(eq(caseSteps.id, row.id));
    const [caseRow] = await tx.select({ organisationId: cases.organisationId }).from(cases).where(eq(cases.id, input.caseId));
    await writeAudit(tx, {
      organisationId: caseRow!.organisationId,
      actor: input.actor,
      action: `step.${input.step}.restore`,
      entityType: "case",
      entityId: input.caseId,
      before: { revision: row.revision, data: row.data },
      after: { revision: row.revision, hash: saved.hash },
    });
    return { revision: row.revision };
  });
  if (database === db) await queueCaseResults(input.caseId);
  return restored;
}

/**
 * Equal step data, numbers within display rounding: a value shown in other units to ten significant
 * figures (or tidied for an input) and posted back differs from the stored one in its last bits only.
 */
export function sameStepData(a: unknown, b: unknown): boolean {
  if (typeof a === "number" && typeof b === "number") return a === b || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
  if (Array.isArray(a) || Array.isArray(b)) return Array.isArray(a) && Array.isArray(b) && a.length === b.length && a.every((x, i) => sameStepData(x, b[i]));
  if (a && b && typeof a === "object" && typeof b === "object") {
    const ra = a as Record<string, unknown>;
    const rb = b as Record<string, unknown>;
    // A key that holds nothing counts as absent (JSON drops undefined when it is stored).
    const keys = new Set([...Object.keys(ra), ...Object.keys(rb)].filter((k) => ra[k] !== undefined || rb[k] !== undefined));
    return [...keys].every((k) => sameStepData(ra[k], rb[k]));
  }
  return a === b;
}
