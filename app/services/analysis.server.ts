import { and, desc, eq } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import type { BasisData, EnvelopeData, LoadsData, PlanformData, SectionsData, DistributionData } from "~/domain/step-data";
import { canonicalJson, sha256Hex } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { caseResults, cases } from "~/db/schema";
import type { StepKey } from "~/domain/vocabulary";
import { ENGINE_VERSION, isEngineError } from "~/engine";
import { CASE_SCHEMA_ID, parseCase, runCase, type CaseFile, type CaseFileInput, type CaseResult } from "~/exchange";
import { getCaseSteps, stepData, type StepState } from "./case-steps.server";
import { DomainError } from "~/domain/errors";

export interface CaseInputs {
  basis: BasisData | null;
  planform: PlanformData | null;
  sections: SectionsData | null;
  envelope: EnvelopeData | null;
  distribution: DistributionData | null;
  loads: LoadsData | null;
}

export function caseInputs(steps: Record<StepKey, StepState>): CaseInputs {
  return {
    basis: stepData(steps, "basis"),
    planform: stepData(steps, "planform"),
    sections: stepData(steps, "sections"),
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
  const mass = inputs.loads?.semispanMass ?? 0;
  return {
    schema: CASE_SCHEMA_ID,
    title,
    wing: {
      stations: exchangeStations(planform, sections),
      axis: { rootChordFraction: planform.axisRoot, tipChordFraction: planform.axisTip },
      ...(mass > 0 ? { mass: { kg: mass, distribution: "chord" as const } } : {}),
    },
    method: {
      compressibility: envelope.compressibility,
      spanwise: envelope.spanwise,
      stations: envelope.stations,
      output: envelope.output,
      ...(envelope.strips !== undefined ? { strips: envelope.strips } : {}),
    },
    cases: cases.map((c) => (c.alpha !== undefined ? { id: c.id, mach: c.mach, altitude: c.altitude, alpha: c.alpha } : { id: c.id, mach: c.mach, altitude: c.altitude, weight: c.weight!, nz: c.nz! })),
  };
}

/** Validates an exchange document exactly as the command line does; failures name the field. */
export function parseOrThrow(file: CaseFileInput): CaseFile {
  const parsed = parseCase(file);
  if (!parsed.ok) throw new DomainError(parsed.problems.map((p) => `${p.path}: ${p.message}`).join("; "), { field: parsed.problems[0]?.path, kind: "unprocessable" });
  return parsed.value;
}

/**
 * The stored result for these inputs, computed and recorded on first request. Results are keyed by
 * the SHA-256 of the canonical exchange input and the engine version, so the same inputs are never
 * solved twice and a result always names what it was computed from.
 */
export async function resultsFor(caseId: string, file: CaseFileInput, actorId: string | null): Promise<{ result: CaseResult; inputHash: string; computedAt: Date }> {
  const parsed = parseOrThrow(file);
  const inputHash = sha256Hex(canonicalJson(parsed));
  const [cached] = await db
    .select()
    .from(caseResults)
    .where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash), eq(caseResults.engineVersion, ENGINE_VERSION)))
    .orderBy(desc(caseResults.computedAt))
    .limit(1);
  if (cached) return { result: cached.result as unknown as CaseResult, inputHash, computedAt: cached.computedAt };
  let result: CaseResult;
  try {
    result = runCase(parsed);
  } catch (error) {
    if (isEngineError(error)) throw new DomainError(error.message, { field: error.field, kind: "unprocessable" });
    throw error;
  }
  const [row] = await db
    .insert(caseResults)
    .values({ caseId, inputHash, engineVersion: ENGINE_VERSION, input: parsed as unknown as Record<string, unknown>, result: result as unknown as Record<string, unknown>, computedBy: actorId })
    .returning();
  return { result, inputHash, computedAt: row!.computedAt };
}

/** Export of a case as the exchange document the CLI reads. */
export async function exportCase(caseId: string, title: string): Promise<CaseFileInput> {
  return buildCaseFile(title, caseInputs(await getCaseSteps(caseId)));
}

/** Sweeps larger than this are solved by a worker rather than inside the web request. */
export const SWEEP_THRESHOLD = 500;

/**
 * The stored result when there is one; otherwise small cases are solved at once and large sweeps
 * are handed to the job queue (the caller answers "computing" and asks again).
 */
export async function resultsOrQueue(caseId: string, file: CaseFileInput, actorId: string | null): Promise<{ pending: true; cases: number } | ({ pending: false } & Awaited<ReturnType<typeof resultsFor>>)> {
  if (file.cases.length <= SWEEP_THRESHOLD) return { pending: false, ...(await resultsFor(caseId, file, actorId)) };
  const parsed = parseOrThrow(file);
  const inputHash = sha256Hex(canonicalJson(parsed));
  const [cached] = await db
    .select({ id: caseResults.id })
    .from(caseResults)
    .where(and(eq(caseResults.caseId, caseId), eq(caseResults.inputHash, inputHash), eq(caseResults.engineVersion, ENGINE_VERSION)))
    .limit(1);
  if (cached) return { pending: false, ...(await resultsFor(caseId, file, actorId)) };
  const { boss, QUEUES } = await import("~/jobs/boss.server");
  await (await boss()).send(QUEUES.computeResults, { caseId }, { singletonKey: `${caseId}:${inputHash}`, retryLimit: 2 });
  return { pending: true, cases: file.cases.length };
}

// Serialised result documents by case, input hash and engine version. A result is a function of
// exactly those, so an entry can never be stale; the bound keeps the process's memory flat.
const resultDocuments = new LRUCache<string, string>({ maxSize: 64 * 2 ** 20, sizeCalculation: (json) => json.length || 1 });

/**
 * As resultsOrQueue, with the `spanwright.result/1` document already serialised: the API sends the
 * same bytes for the same input without reading and re-encoding the stored result every time.
 */
export async function resultJsonOrQueue(caseId: string, file: CaseFileInput, actorId: string | null): Promise<{ pending: true; cases: number } | { pending: false; json: string; inputHash: string }> {
  const inputHash = sha256Hex(canonicalJson(parseOrThrow(file)));
  const key = `${caseId}:${inputHash}:${ENGINE_VERSION}`;
  const hit = resultDocuments.get(key);
  if (hit) return { pending: false, json: hit, inputHash };
  const answer = await resultsOrQueue(caseId, file, actorId);
  if (answer.pending) return answer;
  const json = JSON.stringify(answer.result);
  resultDocuments.set(key, json);
  return { pending: false, json, inputHash };
}

/** The job: solve and store the case's current results (idempotent: stored results are reused). */
export async function computeQueuedResults(caseId: string): Promise<void> {
  const [row] = await db.select({ title: cases.title }).from(cases).where(eq(cases.id, caseId));
  if (!row) return;
  await resultsFor(caseId, await exportCase(caseId, row.title), null);
}
