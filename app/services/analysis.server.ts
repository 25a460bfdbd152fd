import { promisify } from "node:util";
import zlib from "node:zlib";
import { and, desc, eq, notInArray, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import type { BasisData, EnvelopeData, LoadsData, MassesData, PlanformData, SectionsData, DistributionData } from "~/domain/step-data";
import { canonicalJson, sha256Hex } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { caseResults, cases, resultCases, resultFlags, resultInputs, resultProgress } from "~/db/schema";
import type { StepKey } from "~/domain/vocabulary";
import { ENGINE_VERSION } from "~/engine";
import { analyzeDocument, CASE_SCHEMA_ID, parseCase, parseSections, runCase, runCaseAsync, SECTIONS_SCHEMA_ID, type RunProgress, type CaseFile, type CaseFileInput, type CaseResult, type SectionsFile } from "~/exchange";
import { boss, QUEUES } from "~/jobs/boss.server";
import { getCaseSteps, getCaseStepsDigest, getCaseStepsDigested, stepData, type StepState } from "./case-steps.server";
import { runEngine, runEngineAsync } from "./engine.server";
import { DomainError, problemsMessage } from "~/domain/errors";
import { flagKinds, rankedRootLoads, resultFlagIndex, type FlagFacts } from "~/domain/results";
import { checkMassCaseNames, effectiveMasses, exchangeMasses, withTailLoads } from "./masses.server";
import { envelopeCaseCount, queueCaseResults, SWEEP_THRESHOLD, type InputScope } from "./results-queue.server";

export interface CaseInputs {
  basis: BasisData | null;
  planform: PlanformData | null;
  sections: SectionsData | null;
  masses: MassesData | null;
  envelope: EnvelopeData | null;
  distribution: DistributionData | null;
  loads: LoadsData | null;
}

export function caseInputs(steps: Record<StepKey, StepState>): CaseInputs {
  return {
    basis: stepData(steps, "basis"),
    planform: stepData(steps, "planform"),
    sections: stepData(steps, "sections"),
    masses: stepData(steps, "masses"),
    envelope: stepData(steps, "envelope"),
    distribution: stepData(steps, "distribution"),
    loads: stepData(steps, "loads"),
  };
}

function lerp(xs: number[], ys: number[], x: number): number {
  // Held constant beyond the first and last given station.
  if (x <= xs[0]!) return ys[0]!;
  if (x >= xs[xs.length - 1]!) return ys[ys.length - 1]!;
  let i = 1;
  while (xs[i]! < x) i++;
  // Exactly at a given station: its own value, so an export reproduces what was imported bit for bit.
  if (xs[i] === x) return ys[i]!;
  const t = (x - xs[i - 1]!) / (xs[i]! - xs[i - 1]!);
  return ys[i - 1]! + t * (ys[i]! - ys[i - 1]!);
}

/**
 * The wing as the exchange format has it: one station list carrying planform and section data.
 * Stations are the union of the planform's and the sections' spanwise positions; each quantity is
 * linear between its own stations (section data are held constant inboard and outboard of the
 * first and last section station). clMax and cpMin are carried only when every section row has them.
 */
export function exchangeStations(planform: PlanformData, sections: SectionsData): CaseFileInput["wing"]["stations"] {
  const semispan = planform.stations[planform.stations.length - 1]!.y;
  const outside = sections.rows.find((r) => r.y > semispan + 1e-9);
  if (outside) throw new DomainError(`Sections: the station at y = ${outside.y} m lies outside the wing (semispan ${semispan} m).`, { field: "sections" });
  const ys = [...new Set([...planform.stations.map((s) => s.y), ...sections.rows.map((r) => r.y)])].sort((a, b) => a - b);
  const p = planform.stations;
  const r = sections.rows;
  const py = p.map((s) => s.y);
  const ry = r.map((s) => s.y);
  const withClMax = r.every((s) => s.clMax !== undefined);
  const withCpMin = r.every((s) => s.cpMin !== undefined);
  return ys.map((y) => ({
    y,
    xLe: lerp(py, p.map((s) => s.xLe), y),
    chord: lerp(py, p.map((s) => s.chord), y),
    twist: lerp(py, p.map((s) => s.twist), y),
    a0: lerp(ry, r.map((s) => s.a0), y),
    alphaL0: lerp(ry, r.map((s) => s.alphaL0), y),
    cmAc: lerp(ry, r.map((s) => s.cmAc), y),
    ...(withClMax ? { clMax: lerp(ry, r.map((s) => s.clMax!), y) } : {}),
    ...(withCpMin ? { cpMin: lerp(ry, r.map((s) => s.cpMin!), y) } : {}),
  }));
}

type Row = SectionsData["rows"][number];
type Pressures = NonNullable<Row["pressures"]>;

/** Blend two Cp,min-against-lift tables at a fraction t of the way from the first to the second. */
function blendTables(a: NonNullable<Row["cpMinTable"]>, b: NonNullable<Row["cpMinTable"]>, t: number): NonNullable<Row["cpMinTable"]> {
  const at = (tb: NonNullable<Row["cpMinTable"]>, cl: number) => lerp(tb.map((p) => p.cl), tb.map((p) => p.cpMin), cl);
  const cls = [...new Set([...a.map((p) => p.cl), ...b.map((p) => p.cl)])].sort((u, v) => u - v);
  return cls.map((cl) => ({ cl, cpMin: at(a, cl) + t * (at(b, cl) - at(a, cl)) }));
}

/** Blend two pressure sets point by point where they share angles and chord points; otherwise none. */
function blendPressures(a: Pressures, b: Pressures, t: number): Pressures | undefined {
  const same = a.length === b.length && a.every((p, i) => p.alpha === b[i]!.alpha && p.x.length === b[i]!.x.length && p.x.every((x, k) => x === b[i]!.x[k]));
  if (!same) return undefined;
  const mix = (u: number[], v: number[]) => u.map((x, k) => x + t * (v[k]! - x));
  return a.map((p, i) => ({ alpha: p.alpha, x: [...p.x], cpUpper: mix(p.cpUpper, b[i]!.cpUpper), cpLower: mix(p.cpLower, b[i]!.cpLower) }));
}

/**
 * The richer section data of a case as `spanwright.sections/1` (docs/decisions/009), at every station of
 * its exchange document: a section row's own data at its station, held beyond the first and last row
 * like the rest of the section data, and linear between two rows (Cp,min tables blended on the union of
 * their lifts; pressures point by point where both rows give them at the same angles and chord points).
 * Undefined when no row carries any.
 */
export function buildSectionsFile(inputs: Pick<CaseInputs, "planform" | "sections">): SectionsFile | undefined {
  const { planform, sections } = inputs;
  if (!planform || !sections) return undefined;
  const r = sections.rows;
  if (!r.some((row) => row.cpMinCl !== undefined || row.cpMinTable || row.pressures)) return undefined;
  const withCpMin = r.every((row) => row.cpMin !== undefined);
  const out: SectionsFile["sections"] = [];
  for (const st of exchangeStations(planform, sections)) {
    const y = st.y;
    let i = r.findIndex((row) => row.y >= y);
    if (i < 0) i = r.length - 1;
    const at = r[i]!.y === y || i === 0 || y > r[r.length - 1]!.y ? r[i]! : null;
    const lo = r[i - 1];
    const hi = r[i]!;
    const t = at || !lo ? 0 : (y - lo.y) / (hi.y - lo.y);
    const entry: SectionsFile["sections"][number] = { y };
    if (at) {
      if (withCpMin && at.cpMinCl !== undefined) entry.cpMinCl = at.cpMinCl;
      if (at.cpMinTable) entry.cpMinTable = at.cpMinTable;
      if (at.pressures) entry.pressures = at.pressures;
    } else if (lo) {
      if (withCpMin && lo.cpMinCl !== undefined && hi.cpMinCl !== undefined) entry.cpMinCl = lo.cpMinCl + t * (hi.cpMinCl - lo.cpMinCl);
      if (lo.cpMinTable && hi.cpMinTable) entry.cpMinTable = blendTables(lo.cpMinTable, hi.cpMinTable, t);
      const p = lo.pressures && hi.pressures ? blendPressures(lo.pressures, hi.pressures, t) : undefined;
      if (p) entry.pressures = p;
    }
    if (Object.keys(entry).length > 1) out.push(entry);
  }
  return out.length ? { schema: SECTIONS_SCHEMA_ID, sections: out } : undefined;
}

/**
 * How many cases go into the analysis (as analysedCases), counted by PostgreSQL in the stored steps;
 * null when the envelope holds no cases.
 */
export async function analysedCaseCount(caseId: string): Promise<number | null> {
  const found = await db.execute<{ n: number }>(sql`
    select (select count(*)::int from jsonb_array_elements(e.data -> 'cases') as c(v)
        where coalesce((c.v ->> 'excluded')::boolean, false) = false
          and coalesce(d.data -> 'dispositions' -> (c.v ->> 'id') ->> 'action', '') <> 'exclude') as n
    from case_steps e left join case_steps d on d.case_id = e.case_id and d.step = 'distribution'
    where e.case_id = ${caseId} and e.step = 'envelope' and jsonb_typeof(e.data -> 'cases') = 'array'`);
  return found.rows[0]?.n ?? null;
}

/** Which cases go into the analysis: those not excluded in the envelope, nor by a disposition. */
export function analysedCases(envelope: EnvelopeData, distribution: DistributionData | null) {
  return envelope.cases.filter((c) => !c.excluded && distribution?.dispositions[c.id]?.action !== "exclude");
}

/**
 * The case as `spanwright.case/1`. `scope: "envelope"` keeps every case the envelope step includes
 * (what the distribution step examines); `scope: "final"` also drops cases dispositioned as
 * excluded (what the loads step, the export and the report use).
 */
export function buildCaseFile(title: string, inputs: CaseInputs, scope: "envelope" | "final" = "final"): CaseFileInput {
  const missing = (["planform", "sections", "envelope"] as const).filter((k) => !inputs[k]);
  if (missing.length) throw new DomainError(`Save the ${missing.join(", ")} step${missing.length > 1 ? "s" : ""} first.`, { field: "steps", kind: "conflict" });
  const { planform, sections, envelope } = inputs as Required<{ [K in keyof CaseInputs]: NonNullable<CaseInputs[K]> }>;
  const cases = scope === "final" ? analysedCases(envelope, inputs.distribution) : envelope.cases.filter((c) => !c.excluded);
  if (cases.length === 0) throw new DomainError("Every load case is excluded: include at least one.", { field: "cases", kind: "conflict" });
  const masses = effectiveMasses(inputs);
  checkMassCaseNames(cases, masses);
  const { mass, massCases } = exchangeMasses(masses);
  const file: CaseFileInput = {
    schema: CASE_SCHEMA_ID,
    title,
    wing: {
      stations: exchangeStations(planform, sections),
      axis: { rootChordFraction: planform.axisRoot, tipChordFraction: planform.axisTip },
      ...(mass ? { mass } : {}),
      ...(sections.flaps ? { flaps: { ...sections.flaps } } : {}),
      ...(sections.aileron ? { aileron: { ...sections.aileron } } : {}),
    },
    method: {
      compressibility: envelope.compressibility,
      spanwise: envelope.spanwise,
      stations: envelope.stations,
      output: envelope.output,
      ...(envelope.strips !== undefined ? { strips: envelope.strips } : {}),
    },
    ...(massCases ? { massCases } : {}),
    cases: cases.map((c) =>
      c.alpha !== undefined
        ? { id: c.id, mach: c.mach, altitude: c.altitude, alpha: c.alpha, ...(c.flaps ? { flaps: true } : {}) }
        : {
            id: c.id,
            mach: c.mach,
            altitude: c.altitude,
            weight: c.weight!,
            nz: c.nz!,
            ...(c.massCase ? { massCase: c.massCase } : {}),
            ...(c.tailLoad !== undefined ? { tailLoad: c.tailLoad } : {}),
            ...(c.flaps ? { flaps: true } : {}),
            ...(c.roll ? { roll: { ...c.roll } } : {}),
          },
    ),
  };
  // Tail loads from the balance need the wing's own moments, so only where a balance is given.
  return masses?.balance ? withTailLoads(file, parseOrThrow(file), cases, masses) : file;
}

/** Validates an exchange document exactly as the command line does; failures name the field. */
export function parseOrThrow(file: CaseFileInput): CaseFile {
  const parsed = runEngine(() => parseCase(file));
  if (!parsed.ok) throw new DomainError(problemsMessage(parsed.problems), { field: parsed.problems[0]?.path, kind: "unprocessable" });
  return parsed.value;
}

/** Validates a sections document against its case exactly as the command line does; failures name the field. */
export function parseSectionsOrThrow(sections: SectionsFile | undefined, parsed: CaseFile): SectionsFile | undefined {
  if (!sections) return undefined;
  const checked = runEngine(() => parseSections(sections, parsed));
  if (!checked.ok) throw new DomainError(checked.problems.map((p) => `${p.path}: ${p.message}`).join("; "), { field: checked.problems[0]?.path, kind: "unprocessable" });
  return checked.value;
}

/** The key of a result: the SHA-256 of the canonical exchange input (with its sections document, when there is one). */
export function analysisInputHash(parsed: CaseFile, sections?: SectionsFile): string {
  return sha256Hex(canonicalJson(sections ? { case: parsed, sections } : parsed));
}

/**
 * The stored result for these inputs, computed and recorded on first request. Results are keyed by
 * the SHA-256 of the canonical exchange input (and its richer section data) and the engine version, so
 * the same inputs are never solved twice and a result always names what it was computed from.
 */
export async function resultsFor(
  caseId: string,
  file: CaseFileInput,
  actorId: string | null,
  sectionsDoc?: SectionsFile,
  opts: { recordProgress?: boolean; database?: Db | Tx } = {},
): Promise<{ result: CaseResult; inputHash: string; computedAt: Date }> {
  const database = opts.database ?? db;
  const parsed = parseOrThrow(file);
  const sections = parseSectionsOrThrow(sectionsDoc, parsed);
  const inputHash = analysisInputHash(parsed, sections);
  const cached = await storedResult(caseId, inputHash, database);
  if (cached) return cached;
  // The job worker runs a sweep step by step and records how far it has got (sweepProgress reads it).
  const result = opts.recordProgress
    ? await runEngineAsync(() => runCaseAsync(parsed, { sections, onProgress: progressRecorder(caseId, inputHash, parsed.cases.length) }))
    : runEngine(() => runCase(parsed, { sections }));
  const input = (sections ? { case: parsed, sections } : parsed) as unknown as Record<string, unknown>;
  const documentBr = Buffer.from(await compressors.br(Buffer.from(JSON.stringify(result))));
  const { cases: _cases, ...head } = parsed;
  const inputHead = { head, sections: sections ?? null };
  // The row, its rows by load case and its flagged cases' rows together or not at all: a row marked as
  // kept by case (input_head) without them would answer "no such load case" for the cases it holds, and
  // one without its flagged rows would show no case to disposition.
  const { summary, flagged } = resultFlagIndex(result);
  const row = await database.transaction(async (tx) => {
    const [stored] = await tx
      .insert(caseResults)
      .values({ caseId, inputHash, engineVersion: ENGINE_VERSION, input, result: result as unknown as Record<string, unknown>, summary: summary as unknown as Record<string, unknown>, rootLoads: rankedRootLoads(result) as unknown as Record<string, unknown>, inputHead, documentBr, computedBy: actorId })
      .returning({ id: caseResults.id, computedAt: caseResults.computedAt });
    await storeResultCases(stored!.id, tx);
    await storeResultFlags(stored!.id, flagged, tx);
    return stored;
  });
  if (opts.recordProgress) await recordProgress(caseId, inputHash, { phase: "done", casesDone: parsed.cases.length, casesTotal: parsed.cases.length });
  await pruneResults(caseId, row!.id, database);
  return { result, inputHash, computedAt: row!.computedAt };
}

/**
 * Each load case of the stored result `resultId` as a row of result_cases (its input entry, place and
 * result entry), copied by PostgreSQL out of the stored row: the input and the result are taken
 * apart once here, not on every request for one case.
 */
async function storeResultCases(resultId: string, database: Db | Tx = db): Promise<void> {
  await database.execute(sql`
    with r as (
      select ${caseResults.id} as id, case when ${caseResults.input} ? 'case' then ${caseResults.input} -> 'case' else ${caseResults.input} end -> 'cases' as inputs, ${caseResults.result} -> 'cases' as results
      from ${caseResults} where ${caseResults.id} = ${resultId}
    ),
    i as (select e ->> 'id' as id, e, n from r, jsonb_array_elements(r.inputs) with ordinality as t(e, n)),
    o as (select e ->> 'id' as id, e from r, jsonb_array_elements(r.results) as t(e))
    insert into ${resultCases} (result_id, load_case, ordinal, input, result)
    select ${resultId}, i.id, i.n, i.e, o.e from i join o on o.id = i.id`);
}

/**
 * The flagged cases of the stored result `resultId`, in order, as rows of result_flags: one
 * parameter (a JSON array) however many there are. Rows already there are left as they are, so two
 * processes making the rows of an older result at once both succeed.
 */
export async function storeResultFlags(resultId: string, flagged: readonly FlagFacts[], database: Db | Tx = db): Promise<void> {
  if (flagged.length === 0) return;
  const rows = JSON.stringify(flagged.map((f) => ({ facts: f, kinds: flagKinds(f) })));
  await database.execute(sql`
    insert into ${resultFlags} (result_id, rank, load_case, kinds, facts)
    select ${resultId}, (t.n - 1)::integer, t.e -> 'facts' ->> 'id', array(select jsonb_array_elements_text(t.e -> 'kinds')), t.e -> 'facts'
    from jsonb_array_elements(${rows}::jsonb) with ordinality as t(e, n)
    on conflict do nothing`);
}

/**
 * Drops the case's stored results that nothing asks for any more, as a new one is stored: a result
 * of a large case is megabytes, and every saved step used to leave one behind. Kept: the result just
 * stored, those of the inputs its steps make now (as recorded against their digest, either scope),
 * and those stored since its steps were last written (inputs of the current steps built without being
 * recorded, as a report's snapshot builds them), by the running engine; of these, one row per input.
 * An issued report keeps its own evidence (input, result and documents in its snapshot, from which it
 * is re-run), so its input's row is not kept for it. The records of inputs whose result goes and that
 * the steps no longer make go with them (pruneInputs).
 */
async function pruneResults(caseId: string, stored: string, database: Db | Tx = db): Promise<void> {
  const [row] = await database.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  if (!row) return;
  const current = await currentSources(caseId, row.title);
  await database.execute(sql`
    delete from ${caseResults} r
    where r.case_id = ${caseId} and r.id <> ${stored}
      and (
        not (
          r.engine_version = ${ENGINE_VERSION}
          and (
            r.input_hash in (select i.input_hash from ${resultInputs} i where i.case_id = r.case_id and i.engine_version = r.engine_version and i.source = any(${sql.param(current)}::text[]))
            or r.computed_at >= coalesce((select max(s.updated_at) from case_steps s where s.case_id = r.case_id), '-infinity')
          )
        )
        or exists (select 1 from ${caseResults} n where n.case_id = r.case_id and n.input_hash = r.input_hash and n.engine_version = r.engine_version and (n.id = ${stored} or (n.computed_at, n.id) > (r.computed_at, r.id)))
      )`);
  await pruneInputs(caseId, row.title, database);
}

/** The rows of case_results that hold the case's result for this input hash by the running engine. */
export function storedResultOf(caseId: string, inputHash: string) {
  return and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash), eq(caseResults.engineVersion, ENGINE_VERSION));
}

/** The result stored for this input hash and the engine version, or null. */
export async function storedResult(caseId: string, inputHash: string, database: Db | Tx = db): Promise<{ result: CaseResult; inputHash: string; computedAt: Date } | null> {
  const [row] = await database
    .select({ result: caseResults.result, computedAt: caseResults.computedAt })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  return row ? { result: row.result as unknown as CaseResult, inputHash, computedAt: row.computedAt } : null;
}

/** The brotli-compressed result document kept with the stored result for this input hash, or null (none stored, or stored before it was kept). */
async function storedResultDocument(caseId: string, inputHash: string): Promise<Uint8Array<ArrayBuffer> | null> {
  const [row] = await db
    .select({ documentBr: caseResults.documentBr })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  const bytes = row?.documentBr;
  return bytes ? (new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength) as Uint8Array<ArrayBuffer>) : null;
}

/** Whether a result is stored for this input hash and the engine version (without reading it). */
async function hasStoredResult(caseId: string, inputHash: string, database: Db | Tx = db): Promise<boolean> {
  const [row] = await database
    .select({ id: caseResults.id })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .limit(1);
  return Boolean(row);
}

/**
 * The input of the stored result for this hash (as checked) with only the named load cases, in the
 * input's order, and its sections document: PostgreSQL picks the cases out, so a page showing a few
 * cases of a large file neither reads nor checks the rest. Null while no result is stored for it.
 */
export async function storedInputWith(caseId: string, inputHash: string, ids: readonly string[]): Promise<{ file: CaseFile; sections: SectionsFile | undefined } | null> {
  // Kept as the result was stored: its head and the named cases' rows, by key.
  const [kept] = await db
    .select({
      inputHead: caseResults.inputHead,
      cases: sql<CaseFile["cases"]>`(select coalesce(jsonb_agg(${resultCases.input} order by ${resultCases.ordinal}), '[]'::jsonb) from ${resultCases} where ${resultCases.resultId} = ${caseResults.id} and ${resultCases.loadCase} = any(${sql.param([...ids])}::text[]))`,
    })
    .from(caseResults)
    .where(storedResultOf(caseId, inputHash))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  if (!kept) return null;
  if (kept.inputHead) {
    const { head, sections } = kept.inputHead as { head: Omit<CaseFile, "cases">; sections: SectionsFile | null };
    return { file: { ...head, cases: kept.cases }, sections: sections ?? undefined };
  }
  // A result stored before: PostgreSQL picks the cases out of its input.
  // The input is the checked case file, or { case, sections } where the case has richer section data.
  const found = await db.execute<{ head: CaseFile; cases: CaseFile["cases"]; sections: SectionsFile | null }>(sql`
    with r as (
      select case when ${caseResults.input} ? 'case' then ${caseResults.input} -> 'case' else ${caseResults.input} end as f, ${caseResults.input} -> 'sections' as sections
      from ${caseResults}
      where ${caseResults.caseId} = ${caseId} and ${caseResults.inputHash} = ${inputHash} and ${caseResults.engineVersion} = ${ENGINE_VERSION}
      order by ${caseResults.computedAt} desc limit 1
    )
    select r.f - 'cases' as head, r.sections,
      (select coalesce(jsonb_agg(e order by n), '[]'::jsonb) from jsonb_array_elements(r.f -> 'cases') with ordinality as t(e, n) where e ->> 'id' = any(${sql.param([...ids])}::text[])) as cases
    from r`);
  const row = found.rows[0];
  return row ? { file: { ...row.head, cases: row.cases }, sections: row.sections ?? undefined } : null;
}

// The load-case ids of a stored result's input, by case, input hash and engine version: a function of
// exactly those, so never stale; a large input's ids are read out of it once per process.
const inputIds = new LRUCache<string, string[]>({ max: 4 });

/** The load-case ids of the stored result's input for this hash, in order (PostgreSQL picks them out), or null while none is stored. */
export async function storedInputIds(caseId: string, inputHash: string): Promise<string[] | null> {
  const key = `${caseId}\n${inputHash}\n${ENGINE_VERSION}`;
  const hit = inputIds.get(key);
  if (hit) return hit;
  const found = await db.execute<{ ids: string[] | null }>(sql`
    select (select coalesce(jsonb_agg(e -> 'id' order by n), '[]'::jsonb) from jsonb_array_elements(case when ${caseResults.input} ? 'case' then ${caseResults.input} -> 'case' else ${caseResults.input} end -> 'cases') with ordinality as t(e, n)) as ids
    from ${caseResults}
    where ${caseResults.caseId} = ${caseId} and ${caseResults.inputHash} = ${inputHash} and ${caseResults.engineVersion} = ${ENGINE_VERSION}
    order by ${caseResults.computedAt} desc limit 1`);
  const ids = found.rows[0]?.ids ?? null;
  if (ids) inputIds.set(key, ids);
  return ids;
}

/** How far the job worker has got with a sweep: its phase, the spanwise solves made and the cases evaluated. */
export interface SweepProgress {
  phase: "queued" | "solving" | "cases" | "done" | "failed";
  solves: number;
  casesDone: number;
  casesTotal: number;
  /** Why the engine refused the input (phase failed), else null. */
  problem: string | null;
  updatedAt: Date;
}

async function recordProgress(caseId: string, inputHash: string, p: Partial<Omit<SweepProgress, "updatedAt">> & { casesTotal: number }) {
  const values = { ...p, updatedAt: new Date() };
  await db
    .insert(resultProgress)
    .values({ caseId, inputHash, engineVersion: ENGINE_VERSION, ...values })
    .onConflictDoUpdate({ target: [resultProgress.caseId, resultProgress.inputHash, resultProgress.engineVersion], set: values });
}

/** The engine's progress reports as rows of result_progress (one write per solve and per 1 000 cases). */
function progressRecorder(caseId: string, inputHash: string, casesTotal: number) {
  return (p: RunProgress) =>
    recordProgress(caseId, inputHash, p.phase === "solves" ? { phase: "solving", solves: p.done, casesTotal } : { phase: "cases", casesDone: p.done, casesTotal });
}

/** The recorded progress of a case input's sweep, or null when no job has taken or queued it. */
export async function sweepProgress(caseId: string, inputHash: string): Promise<SweepProgress | null> {
  const [row] = await db
    .select()
    .from(resultProgress)
    .where(and(eq(resultProgress.caseId, caseId), eq(resultProgress.inputHash, inputHash), eq(resultProgress.engineVersion, ENGINE_VERSION)));
  return row ? { phase: row.phase, solves: row.solves, casesDone: row.casesDone, casesTotal: row.casesTotal, problem: row.problem, updatedAt: row.updatedAt } : null;
}

/**
 * The stateless analysis the API offers: a `spanwright.case/1` document (or `{ case, sections }`)
 * computed exactly as the command line computes it; nothing is stored.
 * @throws DomainError (unprocessable) with every problem of the document, each with its path
 */
export function analyze(body: unknown): CaseResult {
  const answer = runEngine(() => analyzeDocument(body));
  if (!answer.ok) throw new DomainError(answer.problems.map((p) => `${p.path}: ${p.message}`).join("; "), { kind: "unprocessable", field: answer.problems[0]?.path, problems: answer.problems });
  return answer.result;
}

/** Export of a case as the exchange document the CLI reads. */
export async function exportCase(caseId: string, title: string, database: Db | Tx = db): Promise<CaseFileInput> {
  return buildCaseFile(title, caseInputs(await getCaseSteps(caseId, database)));
}

/** Export of a case with its richer section data (`spanwright.sections/1`, undefined when it has none). */
export async function exportCaseDocuments(caseId: string, title: string, database: Db | Tx = db): Promise<{ file: CaseFileInput; sections: SectionsFile | undefined }> {
  const inputs = caseInputs(await getCaseSteps(caseId, database));
  return { file: buildCaseFile(title, inputs), sections: buildSectionsFile(inputs) };
}

/** A case's exchange input as its results are computed from it, checked, with the hash that names them. */
export interface AnalysisInput {
  file: CaseFileInput;
  sections: SectionsFile | undefined;
  inputHash: string;
  /** The file as checked, and the steps it was built from. */
  parsed: CaseFile;
  inputs: CaseInputs;
}

// Values derived from a case's stored steps by pure functions, by what they are derived from: the
// derivation, the case, its title and the digest of its steps' stored data. An entry is a function
// of its key, so it is never stale: every call reads the title and the digest from the database, and
// anything written to a step since changes the digest. Entries can be large (a big case file), so few.
const derived = new LRUCache<string, { value: unknown }>({ max: 32 });

/** Tests only: forget every derived value, as a web process that has not built anything yet. */
export function forgetDerivedForTests(): void {
  derived.clear();
  resultDocuments.clear();
}

/**
 * `derive` of the case's steps as stored now, computed once per content of the steps. Each call
 * reads the digest of the steps' data (not the data); a miss reads the data and their digest in one
 * read, so an entry holds exactly what its key names. A derivation that throws is not kept.
 */
export async function fromCurrentSteps<T>(
  name: string,
  caseId: string,
  title: string,
  derive: (inputs: CaseInputs) => T,
  opts: { without?: readonly (keyof CaseInputs)[]; onDerived?: (value: T, digest: string) => Promise<void> } = {},
): Promise<T> {
  // Steps the derivation does not read are left out of the key (and out of what it is handed), so saving them keeps the entry.
  const without = opts.without ?? [];
  const key = (digest: string) => `${name}\n${caseId}\n${title}\n${digest}`;
  const hit = derived.get(key(await getCaseStepsDigest(caseId, without)));
  if (hit) return hit.value as T;
  const { steps, digest } = await getCaseStepsDigested(caseId, without);
  const inputs = caseInputs(steps);
  for (const k of without) inputs[k] = null;
  const value = derive(inputs);
  derived.set(key(digest), { value });
  await opts.onDerived?.(value, digest);
  return value;
}

// Steps an input does not read: the distribution step examines its cases whatever their dispositions,
// so a saved disposition keeps its input.
const UNREAD: Record<InputScope, readonly (keyof CaseInputs)[]> = { envelope: ["distribution"], final: [] };

/** The case's exchange input of a scope built from its steps, checked and hashed. */
function buildInput(title: string, inputs: CaseInputs, scope: InputScope): AnalysisInput {
  const file = buildCaseFile(title, inputs, scope);
  const sections = buildSectionsFile(inputs);
  const parsed = parseOrThrow(file);
  return { file, sections, inputHash: analysisInputHash(parsed, parseSectionsOrThrow(sections, parsed)), parsed, inputs };
}

/** What names an input's source in result_inputs: its scope, the case's title and the digest of the steps it reads. */
const sourceOf = (scope: InputScope, title: string, digest: string) => sha256Hex(`${scope}\n${title}\n${digest}`);

/** What names the inputs the case's steps make now, of both scopes (sourceOf). */
function currentSources(caseId: string, title: string): Promise<string[]> {
  const scopes: InputScope[] = ["envelope", "final"];
  return Promise.all(scopes.map(async (scope) => sourceOf(scope, title, await getCaseStepsDigest(caseId, UNREAD[scope]))));
}

/** Records which input these steps make (once; the same steps always make the same input under one engine version). */
async function rememberInput(caseId: string, title: string, source: string, key: InputKey, database: Db | Tx = db): Promise<void> {
  const [added] = await database.insert(resultInputs).values({ caseId, source, engineVersion: ENGINE_VERSION, ...key }).onConflictDoNothing().returning({ source: resultInputs.source });
  if (added) await pruneInputs(caseId, title, database);
}

/**
 * Drops the case's records of inputs nothing can ask for again: those of steps the case no longer
 * holds (of either scope) whose result is not stored. A record of a stored result is kept (steps
 * put back as they were, as a report's revision, find it again without a build); so are the
 * current steps' records, whether solved, being solved or refused.
 */
async function pruneInputs(caseId: string, title: string, database: Db | Tx = db): Promise<void> {
  const current = await currentSources(caseId, title);
  await database.delete(resultInputs).where(
    and(
      eq(resultInputs.caseId, caseId),
      notInArray(resultInputs.source, current),
      sql`not exists (select 1 from ${caseResults} where ${caseResults.caseId} = ${resultInputs.caseId} and ${caseResults.inputHash} = ${resultInputs.inputHash} and ${caseResults.engineVersion} = ${resultInputs.engineVersion})`,
    ),
  );
}

/** An input's hash and its number of load cases: enough to find its stored result and to say how far its sweep has got. */
export interface InputKey {
  inputHash: string;
  caseCount: number;
}

/**
 * The key of the input the case's steps make now, when any process has built it before (result_inputs):
 * one read of the steps' digest and one indexed read, no build. Null when these steps were never built.
 */
export async function storedInputKey(caseId: string, title: string, scope: InputScope): Promise<InputKey | null> {
  return inputKeyOf(caseId, sourceOf(scope, title, await getCaseStepsDigest(caseId, UNREAD[scope])));
}

async function inputKeyOf(caseId: string, source: string, database: Db | Tx = db): Promise<InputKey | null> {
  const [row] = await database
    .select({ inputHash: resultInputs.inputHash, caseCount: resultInputs.caseCount })
    .from(resultInputs)
    .where(and(eq(resultInputs.caseId, caseId), eq(resultInputs.source, source), eq(resultInputs.engineVersion, ENGINE_VERSION)));
  return row ?? null;
}

/** A large case's input the job worker has not built yet: its hash is not known, its envelope's load cases are counted. */
export interface InputInPreparation {
  inputHash: null;
  /** Load cases of the stored envelope (the input may leave out excluded ones). */
  caseCount: number;
}

/**
 * The key of the case's current input: as stored, else built here (and recorded for every process)
 * when the case is small; a large case's input is built by the job worker alone (queued again here,
 * in case its save was not followed by a job), and meanwhile has no key.
 */
export async function currentInputKey(caseId: string, title: string, scope: InputScope): Promise<InputKey | InputInPreparation> {
  const known = await storedInputKey(caseId, title, scope);
  if (known) return known;
  const count = await envelopeCaseCount(caseId);
  if (count > SWEEP_THRESHOLD) {
    await queueCaseResults(caseId, [scope]);
    return { inputHash: null, caseCount: count };
  }
  const built = await currentInput(caseId, title, scope);
  return { inputHash: built.inputHash, caseCount: built.parsed.cases.length };
}

/** A refusal for a reader that needs an input the job worker is still building. */
export function inputInPreparation(): DomainError {
  return new DomainError("The results of this case file are still being computed by a background worker: try again once the page shows them.", { field: "results", kind: "conflict" });
}

/**
 * The case's exchange input of a scope (with its sections document) and its hash, derived once per
 * content of the steps it reads and recorded against their digest: building it balances the tail
 * loads of every case (engine solves), validates and hashes the document.
 */
function currentInput(caseId: string, title: string, scope: InputScope): Promise<AnalysisInput> {
  return fromCurrentSteps(`${scope}-input`, caseId, title, (inputs) => buildInput(title, inputs, scope), {
    without: UNREAD[scope],
    onDerived: (input, digest) => rememberInput(caseId, title, sourceOf(scope, title, digest), { inputHash: input.inputHash, caseCount: input.parsed.cases.length }),
  });
}

/**
 * The case's current input of a scope with only the named load cases, and its sections document: out
 * of the stored result's input when there is one (nothing built or checked), else out of the built input.
 */
export async function currentInputWith(caseId: string, title: string, scope: InputScope, ids: readonly string[]): Promise<{ file: CaseFileInput; sections: SectionsFile | undefined }> {
  const { inputHash } = await currentInputKey(caseId, title, scope);
  if (inputHash === null) throw inputInPreparation();
  const stored = await storedInputWith(caseId, inputHash, ids);
  if (stored) return stored;
  const built = await currentInput(caseId, title, scope);
  return { file: { ...built.file, cases: built.file.cases.filter((c) => ids.includes(c.id)) }, sections: built.sections };
}

/** The input the loads step, the export and the report use, as `exportCaseDocuments` and `analysisInputHash` give it. */
export function currentAnalysisInput(caseId: string, title: string): Promise<AnalysisInput> {
  return currentInput(caseId, title, "final");
}

/** What the distribution step examines (every case the envelope includes, dispositions aside) with its section data, checked and hashed. */
export function currentDistributionInput(caseId: string, title: string): Promise<AnalysisInput> {
  return currentInput(caseId, title, "envelope");
}

/**
 * The stored result when there is one; otherwise small cases are solved at once and large sweeps
 * are handed to the job queue (the caller answers "computing" and asks again).
 */
export async function resultsOrQueue(
  caseId: string,
  file: CaseFileInput,
  actorId: string | null,
  sections?: SectionsFile,
  database: Db | Tx = db,
): Promise<{ pending: true; cases: number; progress: SweepProgress | null } | ({ pending: false } & Awaited<ReturnType<typeof resultsFor>>)> {
  if (file.cases.length <= SWEEP_THRESHOLD) return { pending: false, ...(await resultsFor(caseId, file, actorId, sections, { database })) };
  const parsed = parseOrThrow(file);
  const inputHash = analysisInputHash(parsed, parseSectionsOrThrow(sections, parsed));
  if (await hasStoredResult(caseId, inputHash, database)) return { pending: false, ...(await resultsFor(caseId, file, actorId, sections, { database })) };
  const progress = await queueResults(caseId, { inputHash, caseCount: parsed.cases.length }, "final");
  if (progress?.phase === "failed") throw new DomainError(progress.problem ?? "The engine refused this case file.", { field: "cases", kind: "unprocessable" });
  return { pending: true, cases: file.cases.length, progress };
}

/**
 * As resultsOrQueue for the case's current final input: a stored result is found from the steps'
 * digest (storedInputKey) without building the case file; only steps never built are built here.
 */
export async function currentResultsOrQueue(caseId: string, title: string, actorId: string | null): ReturnType<typeof resultsOrQueue> {
  const known = await storedInputKey(caseId, title, "final");
  const stored = known && (await storedResult(caseId, known.inputHash));
  if (stored) return { pending: false, ...stored };
  if (known) {
    if (known.caseCount > SWEEP_THRESHOLD) return { pending: true, cases: known.caseCount, progress: await queueResults(caseId, known, "final") };
  } else {
    const count = await envelopeCaseCount(caseId);
    // Not built yet: a large case's input is the worker's to build (see currentInputKey).
    if (count > SWEEP_THRESHOLD) {
      await queueCaseResults(caseId, ["final"]);
      return { pending: true, cases: count, progress: null };
    }
  }
  const input = await currentAnalysisInput(caseId, title);
  return resultsOrQueue(caseId, input.file, actorId, input.sections);
}

// Result documents by case, input hash and engine version, serialised and encoded: a result is a
// function of exactly those, so an entry can never be stale; the bound keeps the process's memory flat.
const resultDocuments = new LRUCache<string, Uint8Array<ArrayBuffer>>({ maxSize: 64 * 2 ** 20, sizeCalculation: (bytes) => bytes.byteLength || 1 });

const brotli = promisify(zlib.brotliCompress);
const brotliDecompress = promisify(zlib.brotliDecompress);
const toBytes = (out: Buffer) => new Uint8Array(out.buffer, out.byteOffset, out.byteLength) as Uint8Array<ArrayBuffer>;
const gzip = promisify(zlib.gzip);
/** Compressed once per document (on libuv's threads), so a quality above the middleware's per-answer 4 is affordable. */
const compressors = {
  br: (bytes: Uint8Array) => brotli(bytes, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 6, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: bytes.byteLength } }),
  gzip: (bytes: Uint8Array) => gzip(bytes, { level: 6 }),
};
// Compressions under way, so that the answers asked for at the same time share one.
const compressing = new Map<string, Promise<Uint8Array<ArrayBuffer>>>();

/**
 * As resultsOrQueue, with the `spanwright.result/1` document already serialised to UTF-8 and, when
 * the client takes it, compressed: the API sends the same bytes for the same input without reading,
 * re-encoding, re-serialising and re-compressing the stored result every time (brotli of a 1.8 MB
 * document costs tens of milliseconds of CPU per answer).
 */
export async function resultJsonOrQueue(
  caseId: string,
  title: string,
  actorId: string | null,
  encoding: keyof typeof compressors | null = null,
): Promise<{ pending: true; cases: number; progress: SweepProgress | null } | { pending: false; json: Uint8Array<ArrayBuffer>; encoding: keyof typeof compressors | null; inputHash: string }> {
  const known = await storedInputKey(caseId, title, "final");
  let inputHash = known?.inputHash ?? "";
  let result: CaseResult | null = null;
  const resolve = async () => {
    const answer = await currentResultsOrQueue(caseId, title, actorId);
    if (!answer.pending) ({ inputHash, result } = answer);
    return answer;
  };
  if (!known) {
    const answer = await resolve();
    if (answer.pending) return answer;
  }
  const key = () => `${caseId}:${inputHash}:${ENGINE_VERSION}`;
  const kept = resultDocuments.get(encoding ? `${key()}:${encoding}` : key());
  if (kept) return { pending: false, json: kept, encoding, inputHash };
  // The brotli form stored with the result: any web process answers from it without serialising or
  // compressing the result, and every representation is made from the same bytes.
  const br = resultDocuments.get(`${key()}:br`) ?? (await storedResultDocument(caseId, inputHash));
  if (br) resultDocuments.set(`${key()}:br`, br);
  if (br && encoding === "br") return { pending: false, json: br, encoding, inputHash };
  let json = resultDocuments.get(key()) ?? (br ? toBytes(await brotliDecompress(br)) : undefined);
  if (!json) {
    // A result stored before its document was kept (or none stored yet: then solved or queued now).
    if (!result) {
      const answer = await resolve();
      if (answer.pending) return answer;
    }
    json = Buffer.from(JSON.stringify(result)) as Uint8Array<ArrayBuffer>;
  }
  resultDocuments.set(key(), json);
  if (!encoding) return { pending: false, json, encoding, inputHash };
  const encodedKey = `${key()}:${encoding}`;
  let encoded = resultDocuments.get(encodedKey);
  if (!encoded) {
    let pending = compressing.get(encodedKey);
    if (!pending) {
      pending = compressors[encoding](json).then(toBytes);
      compressing.set(encodedKey, pending);
      void pending.finally(() => compressing.delete(encodedKey)).catch(() => {});
    }
    encoded = await pending;
    resultDocuments.set(encodedKey, encoded);
  }
  return { pending: false, json: encoded, encoding, inputHash };
}

/**
 * The job: solve and store the case's current results (idempotent: stored results are reused), of
 * what the loads step uses ("final") or of every case the distribution step examines ("envelope").
 */
export async function computeQueuedResults(caseId: string, database: Db | Tx = db, scope: InputScope = "final"): Promise<void> {
  const [row] = await database.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  if (!row) return;
  // The steps and their digest from one read, so what is recorded below names exactly what was built.
  const { steps, digest } = await getCaseStepsDigested(caseId, UNREAD[scope], database);
  const source = sourceOf(scope, row.title, digest);
  // Jobs are queued at every save and may arrive twice: these steps' result (or refusal) may be there already.
  const known = await inputKeyOf(caseId, source, database);
  if (known && ((await hasStoredResult(caseId, known.inputHash, database)) || (await sweepProgress(caseId, known.inputHash))?.phase === "failed")) return;
  const inputs = caseInputs(steps);
  for (const k of UNREAD[scope]) inputs[k] = null;
  let checked: { file: CaseFileInput; sections: SectionsFile | undefined; inputHash: string; caseCount: number };
  try {
    const file = buildCaseFile(row.title, inputs, scope);
    const sections = buildSectionsFile(inputs);
    const parsed = parseOrThrow(file);
    checked = { file, sections, inputHash: analysisInputHash(parsed, parseSectionsOrThrow(sections, parsed)), caseCount: parsed.cases.length };
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    // Steps missing, or a file its checks refuse: recorded under a key of these steps, so that the pages say why instead of waiting.
    const refused = { inputHash: sha256Hex(`refused\n${source}`), caseCount: await envelopeCaseCount(caseId, database) };
    await recordProgress(caseId, refused.inputHash, { phase: "failed", problem: error.message, casesTotal: refused.caseCount });
    await rememberInput(caseId, row.title, source, refused, database);
    return;
  }
  const { file, sections, inputHash, caseCount } = checked;
  // Known from now on: pages find the input and show how far its sweep has got.
  await db.insert(resultProgress).values({ caseId, inputHash, engineVersion: ENGINE_VERSION, casesTotal: caseCount }).onConflictDoNothing();
  await rememberInput(caseId, row.title, source, { inputHash, caseCount }, database);
  try {
    await resultsFor(caseId, file, null, sections, { recordProgress: true, database });
  } catch (error) {
    // The engine's refusal is the input's, not the worker's: recorded for the pages to say, not retried.
    if (!(error instanceof DomainError)) throw error;
    await recordProgress(caseId, inputHash, { phase: "failed", problem: error.message, casesTotal: caseCount });
  }
}

/**
 * Hands the sweep of a checked input to the job worker (once per input however often asked) and
 * records that it waits; the answer is how far it has got.
 */
export async function queueResults(caseId: string, input: InputKey, scope: InputScope): Promise<SweepProgress | null> {
  const known = await sweepProgress(caseId, input.inputHash);
  // The engine refused this input: asking again would only fail again.
  if (known?.phase === "failed") return known;
  await (await boss()).send(QUEUES.computeResults, { caseId, scope }, { singletonKey: `${caseId}:${input.inputHash}`, retryLimit: 2 });
  // A first row says the sweep waits for a worker; the worker's reports then move it on.
  await db.insert(resultProgress).values({ caseId, inputHash: input.inputHash, engineVersion: ENGINE_VERSION, casesTotal: input.caseCount }).onConflictDoNothing();
  return sweepProgress(caseId, input.inputHash);
}
