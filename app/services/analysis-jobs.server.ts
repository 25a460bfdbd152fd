import { and, eq, inArray, lt } from "drizzle-orm";
import { db } from "~/db/client.server";
import { analysisJobs } from "~/db/schema";
import { boss, QUEUES } from "~/jobs/boss.server";
import { DomainError } from "~/domain/errors";
import type { AnalysisJobStatus } from "~/domain/vocabulary";
import { analyzeDocument, parseCase, type CaseFile, type CaseProblem, type CaseResult } from "~/exchange";
import { ANALYZE_LIMITS, MAX_OPEN_ANALYSES, MAX_OUTPUT_ROWS } from "~/utils/limits";

/** Analyses kept after they finish, for their caller to fetch. */
export const ANALYSIS_JOB_TTL_MS = 24 * 60 * 60 * 1000;

/** A request beyond a limit of ANALYZE_LIMITS, refused before it is validated or solved (413). */
export class AnalysisLimitError extends DomainError {
  constructor(
    readonly limit: string,
    readonly max: number,
    message: string,
  ) {
    super(message, { kind: "too-large", field: limit });
  }
}

const lengthOf = (value: unknown, key: string): number | null => {
  const v = typeof value === "object" && value !== null ? (value as Record<string, unknown>)[key] : undefined;
  return Array.isArray(v) ? v.length : null;
};

/** The two documents of a request body: the bare case, or `{ case, sections }`. */
function documentsOf(body: unknown): { caseDoc: unknown; sectionsDoc: unknown } {
  const pair = typeof body === "object" && body !== null && !Array.isArray(body) && !("schema" in body);
  return pair ? { caseDoc: (body as Record<string, unknown>).case, sectionsDoc: (body as Record<string, unknown>).sections } : { caseDoc: body, sectionsDoc: undefined };
}

/** How many numbers and strings a JSON value holds, counted no further than `limit`. */
function countValues(value: unknown, limit: number): number {
  let n = 0;
  const stack: unknown[] = [value];
  while (stack.length && n <= limit) {
    const v = stack.pop();
    if (Array.isArray(v)) stack.push(...v);
    else if (v !== null && typeof v === "object") stack.push(...Object.values(v));
    else n++;
  }
  return n;
}

/**
 * Checks the sizes a request asks for before anything else reads it: a million empty stations or a
 * hundred thousand cases is refused in microseconds, naming the limit, rather than validated one by
 * one. Only counts are read here; everything else is the schema's business.
 * @throws AnalysisLimitError (413) naming the limit
 */
export function checkAnalysisSize(body: unknown): void {
  const { caseDoc: document, sectionsDoc } = documentsOf(body);
  const sections = lengthOf(sectionsDoc, "sections");
  if (sections !== null && sections > ANALYZE_LIMITS.wingStations) {
    throw new AnalysisLimitError("sections.sections", ANALYZE_LIMITS.wingStations, `sections.sections: ${sections} sections; a request takes at most ${ANALYZE_LIMITS.wingStations} (one per wing station).`);
  }
  if (sectionsDoc !== undefined && countValues(sectionsDoc, ANALYZE_LIMITS.sectionValues) > ANALYZE_LIMITS.sectionValues) {
    throw new AnalysisLimitError("sections", ANALYZE_LIMITS.sectionValues, `sections: more than ${ANALYZE_LIMITS.sectionValues} values of section data; a request takes at most that many.`);
  }
  const wing = typeof document === "object" && document !== null ? (document as Record<string, unknown>).wing : undefined;
  const stations = lengthOf(wing, "stations");
  if (stations !== null && stations > ANALYZE_LIMITS.wingStations) {
    throw new AnalysisLimitError("wing.stations", ANALYZE_LIMITS.wingStations, `wing.stations: ${stations} stations; a request takes at most ${ANALYZE_LIMITS.wingStations}.`);
  }
  const cases = lengthOf(document, "cases");
  if (cases !== null && cases > ANALYZE_LIMITS.queuedCases) {
    throw new AnalysisLimitError("cases", ANALYZE_LIMITS.queuedCases, `cases: ${cases} load cases; a request takes at most ${ANALYZE_LIMITS.queuedCases} (up to ${ANALYZE_LIMITS.syncCases} are answered at once, more go to the job queue). Split the sweep.`);
  }
}

/**
 * The output a parsed request asks for: with station tables ("full"), cases × output stations rows.
 * @throws AnalysisLimitError (413) when that is more than MAX_OUTPUT_ROWS
 */
function checkOutputSize(file: CaseFile): void {
  if (file.method.output !== "full") return;
  const rows = file.cases.length * file.method.stations;
  if (rows > MAX_OUTPUT_ROWS) {
    throw new AnalysisLimitError(
      "method.output",
      MAX_OUTPUT_ROWS,
      `method.output "full" would give ${rows} station rows (${file.cases.length} cases × ${file.method.stations} stations); a request gives at most ${MAX_OUTPUT_ROWS}. Ask for "summary" (root loads and the envelope), fewer output stations, or fewer cases.`,
    );
  }
}

let placesTaken = 0;
let lastInLine: Promise<void> = Promise.resolve();

/** Analyses this process holds now, the one running included (tests: to see places taken). */
export function analysesInFlight(): number {
  return placesTaken;
}

/**
 * Refuses an analysis request at once while every place is taken: called again before the request
 * is even authenticated or read, so a burst is answered without waiting behind the solves.
 * @throws DomainError (busy) when every place is taken
 */
export function refuseWhenNoPlace(): void {
  if (placesTaken >= ANALYZE_LIMITS.inFlightPerProcess) {
    throw new DomainError(
      `The server is working on ${placesTaken} analyses already, the most it holds at once (${ANALYZE_LIMITS.inFlightPerProcess} per web process); nothing was computed. Send the request again in a second.`,
      { kind: "busy" },
    );
  }
}

/**
 * Runs the work of one analysis request (its body already read) after those before it in this
 * process, or refuses it at once when ANALYZE_LIMITS.inFlightPerProcess are already held. Solving
 * takes the process's thread, so requests beyond a few would only wait until their clients give up;
 * under a burst they hear "busy, ask again in a second" instead. Places are taken after the body is
 * read, so a client that sends slowly holds none.
 * @throws DomainError (busy) when every place is taken
 */
export async function withAnalysisPlace<T>(work: () => Promise<T>): Promise<T> {
  refuseWhenNoPlace();
  placesTaken++;
  const before = lastInLine;
  let leave!: () => void;
  lastInLine = new Promise((resolve) => (leave = resolve));
  try {
    await before;
    // Let the requests that arrived meanwhile take a place or hear "busy" before this one holds the thread.
    await new Promise((resolve) => setImmediate(resolve));
    return await work();
  } finally {
    placesTaken--;
    leave();
  }
}

export type AnalysisAnswer =
  | { kind: "result"; result: CaseResult }
  | { kind: "invalid"; problems: CaseProblem[] }
  | { kind: "queued"; job: AnalysisJobView };

export interface AnalysisJobView {
  id: string;
  status: AnalysisJobStatus;
  cases: number;
  createdAt: Date;
  finishedAt: Date | null;
}

const view = (j: typeof analysisJobs.$inferSelect): AnalysisJobView => ({ id: j.id, status: j.status, cases: j.cases, createdAt: j.createdAt, finishedAt: j.finishedAt });

/**
 * `POST /api/v1/analyze`: checks the sizes, validates, then solves at once (up to
 * ANALYZE_LIMITS.syncCases cases) or records a job for the queue and answers with it. Nothing is
 * stored for an answer given at once.
 * @throws AnalysisLimitError (too-large) beyond a limit; DomainError (too-many) with too many analyses open
 */
export async function analyse(input: { organisationId: string; userId: string; document: unknown }): Promise<AnalysisAnswer> {
  checkAnalysisSize(input.document);
  // The case alone first, for its size; the whole request is then analysed as the command line would.
  const parsed = parseCase(documentsOf(input.document).caseDoc);
  if (parsed.ok) checkOutputSize(parsed.value);
  if (!parsed.ok || parsed.value.cases.length <= ANALYZE_LIMITS.syncCases) {
    const answer = analyzeDocument(input.document);
    return answer.ok ? { kind: "result", result: answer.result } : { kind: "invalid", problems: answer.problems };
  }
  const file = parsed.value;
  const open = await db.select({ id: analysisJobs.id }).from(analysisJobs).where(and(eq(analysisJobs.userId, input.userId), inArray(analysisJobs.status, ["queued", "running"])));
  if (open.length >= MAX_OPEN_ANALYSES) {
    throw new DomainError(`You have ${open.length} analyses waiting or running; at most ${MAX_OPEN_ANALYSES} at once. Fetch their results first.`, { kind: "too-many", field: "cases" });
  }
  const [job] = await db
    .insert(analysisJobs)
    // The document as sent: the worker validates it again, exactly as the command line would.
    .values({ organisationId: input.organisationId, userId: input.userId, cases: file.cases.length, input: input.document as Record<string, unknown> })
    .returning();
  await (await boss()).send(QUEUES.analyze, { jobId: job!.id }, { singletonKey: job!.id, retryLimit: 2, expireInSeconds: 30 * 60 });
  return { kind: "queued", job: view(job!) };
}

/**
 * The job: solves a queued analysis and keeps its result (or the engine's refusal). Idempotent: a
 * finished job is left alone. Finished jobs older than ANALYSIS_JOB_TTL_MS are removed on the way.
 */
export async function runAnalysisJob(jobId: string): Promise<void> {
  await db.delete(analysisJobs).where(lt(analysisJobs.createdAt, new Date(Date.now() - ANALYSIS_JOB_TTL_MS)));
  const [job] = await db.select().from(analysisJobs).where(eq(analysisJobs.id, jobId));
  if (!job || job.status === "done" || job.status === "failed") return;
  await db.update(analysisJobs).set({ status: "running" }).where(eq(analysisJobs.id, jobId));
  const answer = analyzeDocument(job.input);
  await db
    .update(analysisJobs)
    .set(answer.ok ? { status: "done", result: answer.result as unknown as Record<string, unknown>, finishedAt: new Date() } : { status: "failed", problems: answer.problems, finishedAt: new Date() })
    .where(eq(analysisJobs.id, jobId));
}

/** One of the person's own analyses (another person's answers null, as a missing one does). */
export async function getAnalysisJob(userId: string, jobId: string) {
  const [job] = await db.select().from(analysisJobs).where(and(eq(analysisJobs.id, jobId), eq(analysisJobs.userId, userId)));
  if (!job) return null;
  return { ...view(job), result: job.result as unknown as CaseResult | null, problems: job.problems };
}
