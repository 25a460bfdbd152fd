import { and, asc, desc, eq, gte, lt, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { db, type Tx } from "~/db/client.server";
import { caseResults, caseSteps, resultFlags } from "~/db/schema";
import { FLAG_REASON_LABELS, FLAG_REASONS, flagFacts, flagKinds, stallHits, summaryOfFlags, type FlagCounts, type FlagFacts, type FlagReason, type ResultSummary, type StallHit } from "~/domain/results";
import { DistributionSchema, type DistributionData } from "~/domain/step-data";
import { evaluateCase, schrenkDistribution, solveMach, type CompressibilityRule } from "~/engine";
import { caseWingModel, type CaseFile, type CaseFileInput, type CaseResult, type ResultCase, type ResultMethod, type SectionsFile } from "~/exchange";
import { DomainError } from "~/domain/errors";
import { fromSI, messageInUnits, unitSymbol, type UnitSystem } from "~/domain/units";
import type { StepKey } from "~/domain/vocabulary";
import { fieldErrorsOf, type FieldErrors } from "~/utils/form-data";
import { currentDistributionInput, currentInputKey, currentInputWith, inputInPreparation, parseOrThrow, queueResults, resultsFor, storedInputIds, storedInputWith, storedResultOf, storeResultFlags } from "./analysis.server";
import { SWEEP_THRESHOLD } from "./results-queue.server";
import { getCase } from "./programmes.server";
import { runEngine } from "./engine.server";

export interface CaseFlag {
  id: string;
  reasons: string[];
  /** The reasons by kind, in FLAG_REASONS order: what the summary counts and a bulk disposition selects. */
  kinds: FlagReason[];
}

/** A flagged case's reasons in words, in the units shown. */
function flagOf(f: FlagFacts, units: UnitSystem): CaseFlag {
  const supercritical = f.supercritical ? [`Mach ${f.mach.toFixed(3)} is at or above the critical Mach number ${f.machCritical?.toFixed(3)}: the subsonic compressibility rules are outside their validity`] : [];
  const stall = summariseHits(f.stall, units);
  const doubt = f.doubt ? ["the critical Mach number is not reliable at this case's lift: it rests on one Cp,min per section taken at another lift"] : [];
  return { id: f.id, reasons: [...supercritical, ...stall, ...doubt], kinds: flagKinds(f) };
}

/**
 * Cases the engineer must disposition: above the critical Mach number, with stations over clMax, or whose
 * critical-Mach check rests on a single Cp,min taken far from the case's lift.
 */
export function flaggedCases(result: Pick<CaseResult, "cases">, units: UnitSystem = "SI"): CaseFlag[] {
  return result.cases.map(flagFacts).filter((f): f is FlagFacts => f !== null).map((f) => flagOf(f, units));
}

/** One line for all of a case's stations over clmax: how many, where (in the length unit shown), and the worst ratio. */
export function summariseStall(warnings: string[], units: UnitSystem): string[] {
  return summariseHits(stallHits(warnings), units);
}

function summariseHits(hits: StallHit[], units: UnitSystem): string[] {
  if (hits.length === 0) return [];
  const worst = hits.reduce((a, b) => (b.cl / b.clMax > a.cl / a.clMax ? b : a));
  const ys = hits.map((h) => h.y);
  const y = (m: number) => fromSI(units, "length", m).toFixed(2);
  return [
    `cl exceeds the section clmax at ${hits.length} station${hits.length > 1 ? "s" : ""} (y = ${y(Math.min(...ys))}–${y(Math.max(...ys))} ${unitSymbol(units, "length")}); worst cl/clmax = ${(worst.cl / worst.clMax).toFixed(3)} at y = ${y(worst.y)} ${unitSymbol(units, "length")}`,
  ];
}

const RULES: CompressibilityRule[] = ["prandtl-glauert", "karman-tsien", "laitone"];

/**
 * Everything the distribution page plots for one case: the solver's spanwise loading beside
 * Schrenk's approximation, section cl and cm, the same case under each of the three
 * compressibility rules, and each station's critical Mach number against the case Mach number.
 */
export function distributionView(input: CaseFileInput, caseId: string, sections?: SectionsFile) {
  const file: CaseFile = parseOrThrow(input);
  const lc = file.cases.find((c) => c.id === caseId) ?? file.cases[0]!;
  const model = caseWingModel(file, lc.flaps, sections);
  const loadCase = lc.alpha !== undefined ? { id: lc.id, mach: lc.mach, altitude: lc.altitude, alphaDeg: lc.alpha } : { id: lc.id, mach: lc.mach, altitude: lc.altitude, weightN: lc.weight!, nz: lc.nz! };
  const byRule = RULES.map((rule) => {
    const sol = solveMach(model, lc.mach, { spanwise: file.method.spanwise, rule, stations: file.method.stations, resolution: file.method.strips });
    const loads = evaluateCase(sol, loadCase);
    return { rule, sol, loads };
  });
  const chosen = byRule.find((r) => r.rule === file.method.compressibility)!;
  const { sol, loads } = chosen;
  const meanChord = sol.geometry.meanGeometricChord;
  const schrenk = schrenkDistribution(model.stations, sol.y);
  const CL = loads.CL;
  const ratio = (basic: number[], additional: number[]) => basic.map((b, i) => (CL !== 0 ? (b + CL * additional[i]!) / (meanChord * CL) : additional[i]! / meanChord));
  return {
    caseId: lc.id,
    mach: lc.mach,
    altitude: lc.altitude,
    rule: file.method.compressibility,
    spanwise: file.method.spanwise,
    CL,
    alphaDeg: loads.alphaDeg,
    regime: loads.regime,
    machCritical: loads.machCritical,
    warnings: loads.warnings,
    y: sol.y,
    chord: sol.chord,
    loading: { solver: ratio(sol.cclBasic, sol.cclAdditional), schrenk: ratio(schrenk.cclBasic, schrenk.cclAdditional) },
    cl: loads.cl,
    clMax: sol.clMax,
    cm: loads.cm,
    // At this case's lift where the sections give Cp,min against lift; simple sweep theory scales each by 1/cos Λ.
    stationMachCritical: loads.stationMachCritical,
    stationMachCriticalSwept: loads.stationMachCritical.map((m, i) => {
      const u = sol.stationMachCritical[i];
      const w = sol.stationMachCriticalSwept[i];
      return m === null || u === null || u === undefined || w === null || w === undefined ? m : (m * w) / u;
    }),
    machCriticalSwept: sol.machCriticalSwept !== null && sol.machCritical !== null && loads.machCritical !== null ? (loads.machCritical * sol.machCriticalSwept) / sol.machCritical : null,
    rules: byRule.map((r) => ({ rule: r.rule, cl: r.loads.cl, cm: r.loads.cm, CL: r.loads.CL, clAlpha: r.sol.clAlphaPerRad, machCritical: r.loads.machCritical })),
  };
}

export type DistributionView = ReturnType<typeof distributionView>;

/** The view with one summary line for all stations over clmax, as the page shows it. */
function viewForPage(input: CaseFileInput, caseId: string, units: UnitSystem, sections?: SectionsFile) {
  const full = runEngine(() => distributionView(input, caseId, sections));
  const warnings = full.warnings.filter((w) => !w.includes("exceeds the section clMax")).map((w) => messageInUnits(w, units));
  return { ...full, warnings: [...warnings, ...summariseStall(full.warnings, units)] };
}

export type DistributionPageView = ReturnType<typeof viewForPage>;

/**
 * The distribution of one load case of the envelope, as the page shows it. Only that case is taken
 * out of the case's input (as stored with its result, else as built) and checked: one case solved
 * under each rule, not the file.
 * @throws DomainError (not-found) for a load case the distribution step does not examine
 */
export async function distributionCaseView(input: { caseId: string; reference: string; title: string; loadCase: string; units: UnitSystem }): Promise<DistributionPageView> {
  const { file, sections } = await currentInputWith(input.caseId, input.title, "envelope", [input.loadCase]);
  const lc = file.cases.find((c) => c.id === input.loadCase);
  if (!lc) throw new DomainError(`Case file ${input.reference} has no load case "${input.loadCase}".`, { field: "case", kind: "not-found" });
  return viewForPage({ ...file, cases: [lc] }, lc.id, input.units, sections);
}

/** Rows of the flagged-case table the page carries; the rest come by range (flagWindow) as they scroll into view. */
export const FIRST_FLAG_ROWS = 50;
/** Rows one range request may ask for. */
export const MAX_FLAG_ROWS = 500;
/** Ids the "without a disposition" alert names; it gives the count of all. */
export const OPEN_IDS_SHOWN = 5;
/** Matches the case search suggests at most. */
export const MAX_SUGGESTIONS = 20;

type Disposition = DistributionData["dispositions"][string];

/** A flagged case with its disposition (null while it has none), as a row of the table. */
export interface FlagRow extends CaseFlag {
  disposition: Disposition | null;
}

/** The stored result for an input: its row, method, first case and flagged cases counted; the flagged cases themselves are rows of result_flags. */
interface StoredFlags {
  resultId: string;
  method: ResultMethod;
  /** The id of the result's first case: the one shown when none is flagged. */
  first: string;
  counts: FlagCounts;
}

/**
 * The stored result for this input with its summary, or null while none is stored. Read on every
 * request (one indexed row, a few hundred bytes), so a page is always as current as the database.
 */
export async function storedFlags(caseId: string, inputHash: string): Promise<StoredFlags | null> {
  const [row] = await db
    .select({ id: caseResults.id, summary: caseResults.summary })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  if (!row) return null;
  const kept = row.summary as Partial<ResultSummary> | null;
  const summary = kept?.flagCounts ? (kept as ResultSummary) : await keepFlagIndex(row.id, row.summary);
  return { resultId: row.id, method: summary.method, first: summary.first, counts: summary.flagCounts };
}

/** The summary an older result was stored with: its flagged cases inline, or none at all. */
interface OlderSummary {
  method: ResultMethod;
  first: string;
  flagged: FlagFacts[];
}

/**
 * The flagged-case rows and summary of a result stored before they were kept, made once and kept:
 * from its older summary's inline list, else from the result (PostgreSQL hands over the method, the
 * first id and the flagged cases' few fields, not the result).
 */
async function keepFlagIndex(resultId: string, older: Record<string, unknown> | null): Promise<ResultSummary> {
  const inline = older && Array.isArray(older.flagged) ? (older as unknown as OlderSummary) : null;
  const { method, first, flagged } = inline ?? (await flagsFromResult(resultId));
  const summary = summaryOfFlags(method, first, flagged);
  await db.transaction(async (tx) => {
    await storeResultFlags(resultId, flagged, tx);
    await tx.update(caseResults).set({ summary: summary as unknown as Record<string, unknown> }).where(eq(caseResults.id, resultId));
  });
  return summary;
}

async function flagsFromResult(resultId: string): Promise<OlderSummary> {
  const [head] = await db.select({ method: sql<ResultMethod>`${caseResults.result} -> 'method'`, first: sql<string>`${caseResults.result} -> 'cases' -> 0 ->> 'id'` }).from(caseResults).where(eq(caseResults.id, resultId));
  const found = await db.execute<{ c: Pick<ResultCase, "id" | "regime" | "mach" | "machCritical" | "warnings"> }>(sql`
    select jsonb_build_object('id', e -> 'id', 'regime', e -> 'regime', 'mach', e -> 'mach', 'machCritical', e -> 'machCritical', 'warnings', e -> 'warnings') as c
    from case_results r, jsonb_array_elements(r.result -> 'cases') with ordinality as t(e, n)
    where r.id = ${resultId} and (e ->> 'regime' = 'supercritical' or jsonb_array_length(e -> 'warnings') > 0)
    order by n`);
  return { method: head!.method, first: head!.first, flagged: found.rows.map((r) => flagFacts(r.c)).filter((f): f is FlagFacts => f !== null) };
}

/** Flagged cases offset … offset + limit − 1 of a stored result, their reasons in the units shown. */
async function flagRows(stored: StoredFlags, offset: number, limit: number, units: UnitSystem): Promise<CaseFlag[]> {
  const rows = await db
    .select({ facts: resultFlags.facts })
    .from(resultFlags)
    .where(and(eq(resultFlags.resultId, stored.resultId), gte(resultFlags.rank, offset), lt(resultFlags.rank, offset + limit)))
    .orderBy(asc(resultFlags.rank));
  return rows.map((r) => flagOf(r.facts as unknown as FlagFacts, units));
}

type Dispositions = DistributionData["dispositions"];
const DispositionSchema = DistributionSchema.shape.dispositions.valueType;

/** The distribution step's revision and the digest PostgreSQL keeps of its data (null while it has none). */
interface DistributionHead {
  revision: number;
  digest: string | null;
}

async function distributionHead(tx: Tx, caseId: string): Promise<DistributionHead> {
  const [row] = await tx.select({ revision: caseSteps.revision, digest: caseSteps.dataDigest }).from(caseSteps).where(ofDistributionStep(caseId));
  return { revision: row?.revision ?? 0, digest: row?.digest ?? null };
}

const ofDistributionStep = (caseId: string) => and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, "distribution"));

// The step's dispositions stay in PostgreSQL: a statement makes `data -> 'dispositions'` once (an
// empty object while the step has none) and looks each case up in it by key. Written inline in the
// condition, PostgreSQL reads and decompresses the whole document again for every flagged case (30 s
// for 21 000); read into the app, a case whose 21 000 flagged cases all have one is two megabytes of
// JSON to fetch, parse and check (some 350 ms) at every first look after a save.
const stepDispositions = (caseId: string) =>
  sql`select coalesce((select ${caseSteps.data} -> 'dispositions' from ${caseSteps} where ${ofDistributionStep(caseId)}), '{}'::jsonb) as d`;

/** The stored dispositions of these cases (those without one are left out). */
async function dispositionsOf(tx: Tx, caseId: string, ids: string[]): Promise<Record<string, Disposition>> {
  if (!ids.length) return {};
  const found = await tx.execute<{ id: string; disposition: unknown }>(sql`
    with s as materialized (${stepDispositions(caseId)})
    select i as id, s.d -> i as disposition from s, unnest(${sql.param(ids)}::text[]) as i where s.d ? i`);
  return Object.fromEntries(
    found.rows.map((r) => {
      const parsed = DispositionSchema.safeParse(r.disposition);
      if (!parsed.success) throw damagedDispositions(r.id);
      return [r.id, parsed.data];
    }),
  );
}

// The dispositions of the rows a page or range shows, by case, the step data's digest and the rows:
// a function of exactly those, so never stale. A look that finds them here reads only the digest.
const rowDispositionsCache = new LRUCache<string, Readonly<Record<string, Disposition>>>({ max: 256 });

/** The stored dispositions of these rows; `head` must come from the same snapshot as `tx`. */
async function rowDispositions(tx: Tx, caseId: string, head: DistributionHead, ids: string[]): Promise<Readonly<Record<string, Disposition>>> {
  if (!head.digest) return {};
  const key = `${caseId}\n${head.digest}\n${ids.join("\n")}`;
  const hit = rowDispositionsCache.get(key);
  if (hit) return hit;
  const found = Object.freeze(await dispositionsOf(tx, caseId, ids));
  rowDispositionsCache.set(key, found);
  return found;
}

// Every write is checked against the step's schema (saveStep, the import): a stored disposition that
// does not match it was written outside the app. Said as such, never shown or merged into as none.
const damagedDispositions = (id?: string) =>
  new DomainError(
    `The stored dispositions of this case${id ? ` (that of ${id} among them)` : ""} do not match the step's rules: they were changed outside Spanwright. Nothing is shown or saved over them; an administrator can put back the step's revision as it was saved, from this page.`,
    { field: "dispositions", kind: "conflict" },
  );

/** The stored dispositions and revision, whole: what a change is merged into (a damaged row is said, not merged into as none). */
async function storedDispositions(caseId: string): Promise<{ revision: number; dispositions: Dispositions }> {
  const [row] = await db.select({ revision: caseSteps.revision, data: caseSteps.data }).from(caseSteps).where(ofDistributionStep(caseId));
  const parsed = row?.data ? DistributionSchema.safeParse(row.data) : null;
  if (parsed && !parsed.success) throw damagedDispositions();
  return { revision: row?.revision ?? 0, dispositions: parsed?.data.dispositions ?? {} };
}

const rowsOf = (flags: CaseFlag[], dispositions: Readonly<Record<string, Disposition>>): FlagRow[] => flags.map((f) => ({ ...f, disposition: dispositions[f.id] ?? null }));

/**
 * The step's revision and digest, the summary of open cases and the rows' dispositions, read in one
 * snapshot: a save between the reads cannot pair one revision's dispositions with another's counts.
 */
function inOneSnapshot<T>(work: (tx: Tx) => Promise<T>): Promise<T> {
  return db.transaction(work, { isolationLevel: "repeatable read", accessMode: "read only" });
}

// Summaries by stored result and the step data's digest: a function of exactly those, so never stale.
const summaryCache = new LRUCache<string, DistributionSummary>({ max: 64 });

/**
 * How many flagged cases, and of them without a disposition, for each reason, and the first few
 * without one, in rank order: counted by PostgreSQL; kept for the same result and dispositions.
 * `head` must come from the same snapshot as `tx`.
 */
async function summaryOf(tx: Tx, stored: StoredFlags, caseId: string, head: DistributionHead): Promise<DistributionSummary> {
  const key = `${stored.resultId}\n${head.digest ?? ""}`;
  const hit = summaryCache.get(key);
  if (hit) return hit;
  const summary = await countOpen(tx, stored, caseId);
  summaryCache.set(key, summary);
  return summary;
}

async function countOpen(tx: Tx, stored: StoredFlags, caseId: string) {
  // One statement, so that PostgreSQL takes the dispositions out of the step's data once for both.
  const [found] = (
    await tx.execute<{ closed: { kinds: FlagReason[]; n: number }[]; open_ids: string[] }>(sql`
    with s as materialized (${stepDispositions(caseId)})
    select
      (select coalesce(json_agg(json_build_object('kinds', c.kinds, 'n', c.n)), '[]') from (
        select f.kinds, count(*)::integer as n from ${resultFlags} f where f.result_id = ${stored.resultId} and s.d ? f.load_case group by f.kinds) c) as closed,
      (select coalesce(json_agg(o.id order by o.rank), '[]') from (
        select f.load_case as id, f.rank from ${resultFlags} f where f.result_id = ${stored.resultId} and not s.d ? f.load_case order by f.rank limit ${OPEN_IDS_SHOWN}) o) as open_ids
    from s`)
  ).rows;
  const closed: FlagCounts = { all: 0, supercritical: 0, stall: 0, "critical-mach-basis": 0 };
  for (const r of found!.closed) {
    closed.all += r.n;
    for (const k of r.kinds) closed[k] += r.n;
  }
  const { counts } = stored;
  return {
    flagged: counts.all,
    open: counts.all - closed.all,
    openIds: found!.open_ids,
    byReason: FLAG_REASONS.map((reason) => ({ reason, label: FLAG_REASON_LABELS[reason], count: counts[reason], open: counts[reason] - closed[reason] })).filter((r) => r.count > 0),
  };
}

export type DistributionSummary = Awaited<ReturnType<typeof countOpen>>;

/**
 * Why the page has nothing to show, for its heading: a step not saved yet or every case excluded
 * (the engineer's next step), saved inputs the engine refuses, or stored dispositions that were
 * changed outside Spanwright (an administrator's matter).
 */
export type ProblemCause = "incomplete" | "refused" | "damaged";

function problemCause(error: DomainError): ProblemCause {
  if (error.field === "dispositions") return "damaged";
  return error.kind === "conflict" ? "incomplete" : "refused";
}

/**
 * What the distribution page carries: the summary of the flagged cases (by reason, and those still
 * without a disposition), the first rows of their table, the method and the case to show first (the
 * one asked for, else the first flagged, else the first) — all from the stored result, without any
 * solve. While no result is stored, the sweep is handed to the job worker and its progress answered;
 * a step not saved or a case the engine refuses gives the reason instead.
 */
export async function distributionPage(input: { caseId: string; title: string; units: UnitSystem; requested: string | null }) {
  try {
    // The input's hash from the steps' digest: the case file is built here only when no process has built it for these steps.
    const key = await currentInputKey(input.caseId, input.title, "envelope");
    // A large case's input is being built by the job worker: nothing to read yet.
    if (key.inputHash === null) return { state: "pending" as const, cases: key.caseCount, progress: null };
    const stored = await storedFlags(input.caseId, key.inputHash);
    if (!stored) {
      const progress = await queueResults(input.caseId, { inputHash: key.inputHash, caseCount: key.caseCount }, "envelope");
      if (progress?.phase === "failed") return { state: "problem" as const, cause: "refused" as ProblemCause, problem: progress.problem ?? "The engine refused this case file." };
      return { state: "pending" as const, cases: key.caseCount, progress };
    }
    const known = input.requested ? (await storedInputWith(input.caseId, key.inputHash, [input.requested]))?.file.cases.length : 0;
    const first = await flagRows(stored, 0, FIRST_FLAG_ROWS, input.units);
    const shown = input.requested && known ? input.requested : (first[0]?.id ?? stored.first);
    const { summary, rows } = await inOneSnapshot(async (tx) => {
      const head = await distributionHead(tx, input.caseId);
      return { summary: await summaryOf(tx, stored, input.caseId, head), rows: rowsOf(first, await rowDispositions(tx, input.caseId, head, first.map((f) => f.id))) };
    });
    return { state: "ready" as const, cases: key.caseCount, method: stored.method, shown, summary, first: rows };
  } catch (error) {
    if (error instanceof DomainError) return { state: "problem" as const, cause: problemCause(error), problem: error.message };
    throw error;
  }
}

/** The stored result with its flagged cases, or a refusal that says they are still being computed. */
async function currentFlags(caseId: string, title: string): Promise<StoredFlags> {
  const { inputHash } = await currentInputKey(caseId, title, "envelope");
  const stored = inputHash === null ? null : await storedFlags(caseId, inputHash);
  if (!stored) throw new DomainError("The results of this case file are still being computed: the flagged cases are known once they are stored.", { field: "results", kind: "conflict" });
  return stored;
}

/**
 * Rows offset … offset + limit − 1 of the flagged-case table with their dispositions, the distribution
 * revision they belong to and how many there are: the table of a large case fetches them as they scroll in.
 */
export async function flagWindow(input: { caseId: string; title: string; units: UnitSystem; offset: number; limit: number }) {
  if (!Number.isInteger(input.offset) || input.offset < 0) throw new DomainError("offset must be a whole number ≥ 0", { field: "offset" });
  if (!Number.isInteger(input.limit) || input.limit < 1 || input.limit > MAX_FLAG_ROWS) throw new DomainError(`limit must be a whole number from 1 to ${MAX_FLAG_ROWS}`, { field: "limit" });
  const stored = await currentFlags(input.caseId, input.title);
  const flags = await flagRows(stored, input.offset, input.limit, input.units);
  return inOneSnapshot(async (tx) => {
    const head = await distributionHead(tx, input.caseId);
    return { revision: head.revision, total: stored.counts.all, offset: input.offset, rows: rowsOf(flags, await rowDispositions(tx, input.caseId, head, flags.map((f) => f.id))) };
  });
}

export type FlagWindow = Awaited<ReturnType<typeof flagWindow>>;

/**
 * Load cases of the distribution step whose id holds the text typed (ignoring case), those that begin
 * with it first, at most MAX_SUGGESTIONS, each marked when flagged: the case picker of a large case.
 */
export async function searchLoadCases(input: { caseId: string; title: string; units: UnitSystem; text: string }) {
  const text = input.text.trim().toLowerCase();
  const { inputHash } = await currentInputKey(input.caseId, input.title, "envelope");
  if (inputHash === null) throw inputInPreparation();
  // The ids of the stored result's input (read once per input); a small case not yet solved builds its input.
  const ids = (await storedInputIds(input.caseId, inputHash)) ?? (await currentDistributionInput(input.caseId, input.title)).parsed.cases.map((c) => c.id);
  const stored = await storedFlags(input.caseId, inputHash);
  const starts: string[] = [];
  const contains: string[] = [];
  for (const id of ids) {
    const at = id.toLowerCase().indexOf(text);
    // One more than is shown, to know that more match.
    if (at === 0) starts.push(id);
    else if (at > 0 && contains.length <= MAX_SUGGESTIONS) contains.push(id);
    if (starts.length > MAX_SUGGESTIONS) break;
  }
  const all = [...starts, ...contains];
  const shown = all.slice(0, MAX_SUGGESTIONS);
  const flagged = new Set(stored && shown.length ? (await db.select({ id: resultFlags.loadCase }).from(resultFlags).where(and(eq(resultFlags.resultId, stored.resultId), sql`${resultFlags.loadCase} = any(${sql.param(shown)}::text[])`))).map((r) => r.id) : []);
  return { matches: shown.map((id) => ({ id, flagged: flagged.has(id) })), more: all.length > MAX_SUGGESTIONS };
}

/** A change of dispositions: some rows (action "none" takes a disposition away), or every case flagged for one reason. */
export type DispositionChange =
  | { kind: "rows"; changed: { id: string; action: "none" | "exclude" | "justify"; comment: string }[] }
  | { kind: "bulk"; reason: FlagReason; action: "exclude" | "justify"; comment: string };

/**
 * The distribution step's dispositions with a change merged in, checked with the step's schema:
 * messages name the field (`dispositions.<id>.comment`, or `comment` for a bulk justification).
 * The change must be made on the stored revision; saveStep checks it again as it writes.
 */
export async function mergedDispositions(input: { caseId: string; title: string; units: UnitSystem; baseRevision: number; change: DispositionChange }): Promise<{ ok: true; data: DistributionData } | { ok: false; fieldErrors: FieldErrors }> {
  const current = await storedDispositions(input.caseId);
  if (current.revision !== input.baseRevision)
    throw new DomainError(`Not saved: the dispositions were saved again (revision ${current.revision}) after you opened revision ${input.baseRevision}. Reload to see them; your changes were not written.`, { field: "revision", kind: "conflict" });
  const next = { ...current.dispositions };
  const { change } = input;
  if (change.kind === "rows") {
    for (const c of change.changed) {
      if (c.action === "none") delete next[c.id];
      else next[c.id] = { action: c.action, comment: c.comment };
    }
  } else {
    const one = DistributionSchema.shape.dispositions.valueType.safeParse({ action: change.action, comment: change.comment });
    if (!one.success) return { ok: false, fieldErrors: fieldErrorsOf(one.error) };
    const stored = await currentFlags(input.caseId, input.title);
    const chosen = await db.select({ id: resultFlags.loadCase }).from(resultFlags).where(and(eq(resultFlags.resultId, stored.resultId), sql`${change.reason} = any(${resultFlags.kinds})`)).orderBy(asc(resultFlags.rank));
    if (chosen.length === 0) throw new DomainError(`No case is flagged for this reason (${FLAG_REASON_LABELS[change.reason]}).`, { field: "reason" });
    for (const f of chosen) next[f.id] = one.data;
  }
  const parsed = DistributionSchema.safeParse({ dispositions: next });
  return parsed.success ? { ok: true, data: parsed.data } : { ok: false, fieldErrors: fieldErrorsOf(parsed.error) };
}

/**
 * What keeps a step from being submitted now, in words (none for most steps): the distribution step
 * waits until every flagged case has a disposition.
 */
export async function submissionBlockers(organisationId: string, caseId: string, step: StepKey): Promise<string[]> {
  if (step !== "distribution") return [];
  const row = await getCase(organisationId, caseId);
  if (!row) throw new DomainError("Case not found.", { field: "caseId", kind: "not-found" });
  return dispositionBlockers(caseId, row.case.title);
}

const STILL_COMPUTING = "The results of this case file are still being computed: submit once the distribution page shows its flagged cases.";

/**
 * Flagged cases without a disposition keep the distribution step from being submitted: the reasons,
 * or none. A sweep small enough to solve here is solved (and stored) if it is not yet; a larger one waits for the worker.
 */
export async function dispositionBlockers(caseId: string, title: string): Promise<string[]> {
  try {
    // The input's key from the steps' digest: a large case's file is neither built nor checked here.
    const key = await currentInputKey(caseId, title, "envelope");
    if (key.inputHash === null) return [STILL_COMPUTING];
    let stored = await storedFlags(caseId, key.inputHash);
    if (!stored && key.caseCount <= SWEEP_THRESHOLD) {
      const analysis = await currentDistributionInput(caseId, title);
      await resultsFor(caseId, analysis.file, null, analysis.sections);
      stored = await storedFlags(caseId, key.inputHash);
    }
    if (!stored) {
      const progress = await queueResults(caseId, { inputHash: key.inputHash, caseCount: key.caseCount }, "envelope");
      return [progress?.phase === "failed" && progress.problem ? progress.problem : STILL_COMPUTING];
    }
    const flags: StoredFlags = stored;
    const { open, openIds } = await inOneSnapshot(async (tx) => summaryOf(tx, flags, caseId, await distributionHead(tx, caseId)));
    return open ? [`Disposition every flagged case first (exclude, or justify with a comment): ${open} without a disposition (${openIds.join(", ")}${open > openIds.length ? ", …" : ""}).`] : [];
  } catch (error) {
    if (error instanceof DomainError) return [error.message];
    throw error;
  }
}
