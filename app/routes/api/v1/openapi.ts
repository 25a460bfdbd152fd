import { z } from "zod";
import { CASE_SCHEMA_ID, CaseFileSchema, CaseResultSchema as ResultSchema, RESULT_SCHEMA_ID } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { ANALYSIS_JOB_STATUSES, CASE_STATUSES, STEP_KEYS, STEP_STATUSES } from "~/domain/vocabulary";
import { ANALYZE_LIMITS, BODY_LIMITS, formatBytes, MAX_LISTED_PROBLEMS, MAX_OPEN_ANALYSES, MAX_OUTPUT_ROWS } from "~/utils/limits";
import type { Route } from "./+types/openapi";
import { ImportTargetSchema } from "./case-import";
import { methodNotAllowed } from "./respond.server";

const ErrorSchema = z.object({ error: z.string(), message: z.string() });
const InvalidCaseSchema = ErrorSchema.extend({
  error: z.literal("invalid-case"),
  problemCount: z.int().meta({ description: "how many problems the document has in all" }),
  problems: z.array(z.object({ path: z.string().meta({ description: "contract path, e.g. cases[3].mach" }), message: z.string() })).meta({ description: `the first ${MAX_LISTED_PROBLEMS} problems, in document order` }),
  omitted: z.int().optional().meta({ description: "problems not listed" }),
});
const TooLargeSchema = ErrorSchema.extend({
  error: z.literal("too-large"),
  limit: z.object({ name: z.string().meta({ description: "the limit, e.g. cases or wing.stations" }), max: z.int() }).optional(),
});
const AnalysisJobSchema = z.object({
  job: z.object({
    id: z.uuid(),
    status: z.enum(ANALYSIS_JOB_STATUSES),
    cases: z.int(),
    createdAt: z.iso.datetime(),
    finishedAt: z.iso.datetime().nullable(),
    links: z.object({ self: z.string() }),
  }),
  message: z.string().optional(),
});
const ProgrammeRefSchema = z.object({ id: z.uuid(), code: z.string(), name: z.string() });
const CaseSummarySchema = z.object({ id: z.uuid(), reference: z.string(), title: z.string(), programme: ProgrammeRefSchema, status: z.enum(CASE_STATUSES), updatedAt: z.iso.datetime() });
const CaseDetailSchema = CaseSummarySchema.extend({
  description: z.string(),
  revision: z.int(),
  createdBy: z.string(),
  createdAt: z.iso.datetime(),
  steps: z.array(z.object({ step: z.enum(STEP_KEYS), status: z.enum(STEP_STATUSES), revision: z.int(), updatedAt: z.iso.datetime().nullable() })),
});
const ImportedSchema = z.object({ id: z.uuid(), reference: z.string(), title: z.string(), status: z.enum(CASE_STATUSES), links: z.object({ case: z.string(), export: z.string(), results: z.string() }) });

// Each schema becomes one component; the JSON Schema dialect of zod's output (2020-12) is OpenAPI 3.1's.
function component(schema: z.ZodType, io: "input" | "output") {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(schema, { io, unrepresentable: "any" }) as Record<string, unknown>;
  return rest;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const json = (name: string) => ({ "application/json": { schema: ref(name) } });
const error = (description: string) => ({ description, content: json("Error") });
const caseIdParam = { name: "caseId", in: "path", required: true, schema: { type: "string", format: "uuid" }, description: "Case id; another organisation's or a malformed id answers 404." };
const read = { 401: error("No credentials, or they are not valid"), 403: error("Your role does not grant the permission named, or the token's scope is read-only and the request changes records") };
/** A token with either scope may read; only a read-write token may change records. The session cookie may do what the person's roles allow. */
const reading = [{ bearer: ["read"] }, { bearer: ["read-write"] }, { cookie: [] }];
const writing = [{ bearer: ["read-write"] }, { cookie: [] }];
const tooLarge = (what: string) => ({ description: what, content: json("TooLarge") });
const LIMITS = {
  bodyBytes: BODY_LIMITS.api,
  wingStations: ANALYZE_LIMITS.wingStations,
  outputStations: ANALYZE_LIMITS.outputStations,
  casesAnsweredAtOnce: ANALYZE_LIMITS.syncCases,
  casesPerRequest: ANALYZE_LIMITS.queuedCases,
  sectionDataValues: ANALYZE_LIMITS.sectionValues,
  outputStationRows: MAX_OUTPUT_ROWS,
  openAnalysesPerPerson: MAX_OPEN_ANALYSES,
  problemsListed: MAX_LISTED_PROBLEMS,
};

/** The OpenAPI 3.1 description of the public API, generated from the zod schemas the server validates with. */
export function openApiDocument() {
  return {
    openapi: "3.1.0",
    info: {
      title: "Spanwright API",
      version: "1",
      description: `Cases, exchange-format import and export, and analysis. Engine ${ENGINE_VERSION}. Authenticate with the session cookie or a personal API token (Authorization: Bearer sw_…) from /account/tokens; a token's scope is "read" (reads only) or "read-write" (may also import), and each operation's security names the scope it needs. Every error answers JSON { error, message }. A request body is at most ${formatBytes(BODY_LIMITS.api)}.`,
    },
    servers: [{ url: "/" }],
    security: reading,
    paths: {
      "/api/v1/cases": {
        get: {
          summary: "Your organisation's cases",
          description: "Needs case:read.",
          responses: { 200: { description: "Cases, most recently changed first", content: { "application/json": { schema: { type: "object", properties: { cases: { type: "array", items: ref("CaseSummary") } }, required: ["cases"] } } } }, ...read },
        },
      },
      "/api/v1/cases/{caseId}": {
        get: {
          summary: "One case with its steps' statuses and revisions",
          description: "Needs case:read.",
          parameters: [caseIdParam],
          responses: { 200: { description: "The case", content: json("CaseDetail") }, ...read, 404: error("No such case in your organisation") },
        },
      },
      "/api/v1/cases/{caseId}/export": {
        get: {
          summary: `The case as ${CASE_SCHEMA_ID}`,
          description: "Needs case:read.",
          parameters: [caseIdParam],
          responses: { 200: { description: "The exchange document", content: json("CaseFile") }, ...read, 404: error("No such case in your organisation"), 409: error("Planform, sections or envelope not saved yet") },
        },
      },
      "/api/v1/cases/{caseId}/results": {
        get: {
          summary: `The case's ${RESULT_SCHEMA_ID}, or its station tables as CSV`,
          description: "Needs case:read. Computed once per input and engine version, then served from storage.",
          parameters: [caseIdParam, { name: "format", in: "query", required: false, schema: { type: "string", enum: ["json", "csv"], default: "json" } }],
          responses: {
            200: { description: "The result", content: { ...json("CaseResult"), "text/csv": { schema: { type: "string" } } } },
            ...read,
            404: error("No such case in your organisation"),
            409: error("Planform, sections or envelope not saved yet"),
            422: error("The engine refused the stored input"),
          },
        },
      },
      "/api/v1/cases/import": {
        post: {
          summary: `Create a case from a ${CASE_SCHEMA_ID} document`,
          security: writing,
          description: "Needs case:create and, with a token, the read-write scope. Body { programmeId, reference, title?, case }, or the document alone with ?programmeId=&reference=[&title=]. Creates the case and its planform, sections, envelope and loads steps in one transaction; a refusal writes nothing.",
          parameters: [
            { name: "programmeId", in: "query", required: false, schema: { type: "string", format: "uuid" } },
            { name: "reference", in: "query", required: false, schema: { type: "string" } },
            { name: "title", in: "query", required: false, schema: { type: "string" } },
          ],
          requestBody: { required: true, content: { "application/json": { schema: { oneOf: [ref("ImportRequest"), ref("CaseFile")] } } } },
          responses: {
            201: { description: "Created", content: json("Imported") },
            ...read,
            404: error("No such programme in your organisation"),
            409: error("The programme already has a case with this reference"),
            413: tooLarge(`Body larger than ${formatBytes(BODY_LIMITS.api)}`),
            422: { description: "The bad fields", content: json("InvalidCase") },
          },
        },
      },
      "/api/v1/analyze": {
        post: {
          summary: `Analyse a ${CASE_SCHEMA_ID} document`,
          description: [
            "Needs case:read (either token scope).",
            `Limits per request (also in x-limits): at most ${ANALYZE_LIMITS.wingStations} wing stations, ${ANALYZE_LIMITS.outputStations} output stations (method.stations), ${ANALYZE_LIMITS.queuedCases} load cases, ${ANALYZE_LIMITS.sectionValues} values of section data beside the case, and with method.output "full" at most ${MAX_OUTPUT_ROWS} station rows (cases × output stations).`,
            `Up to ${ANALYZE_LIMITS.syncCases} cases are answered at once (200) and nothing is stored. More are answered 202 with a job: poll /api/v1/analyze/jobs/{jobId} until it answers 200; the job and its result are kept for a day, and one person may have ${MAX_OPEN_ANALYSES} waiting at once (429 beyond).`,
            `A request beyond a limit is answered 413 at once, naming the limit. A bad document is answered 422 with its first ${MAX_LISTED_PROBLEMS} problems and their count.`,
            `A web process holds ${ANALYZE_LIMITS.inFlightPerProcess} analyses at once (the one being solved and those waiting for it); beyond that a request is answered 503 with Retry-After at once and nothing is computed: send it again.`,
          ].join(" "),
          "x-limits": LIMITS,
          requestBody: { required: true, content: json("CaseFile") },
          responses: {
            200: { description: "The result", content: json("CaseResult") },
            202: { description: "Queued: the job to poll (also in Location)", content: json("AnalysisJob") },
            ...read,
            413: tooLarge("Beyond a limit: the body size, wing stations, load cases or output station rows"),
            422: { description: "The bad fields", content: json("InvalidCase") },
            429: error(`${MAX_OPEN_ANALYSES} of your analyses are already waiting`),
            503: error(`The web process already holds ${ANALYZE_LIMITS.inFlightPerProcess} analyses, or the database is unavailable: send again after Retry-After`),
          },
        },
      },
      "/api/v1/analyze/jobs/{jobId}": {
        get: {
          summary: "A queued analysis of yours",
          description: "Needs case:read. 202 while it waits or runs; 200 with the result once done; 422 when the engine refused the document. Another person's job answers 404.",
          parameters: [{ name: "jobId", in: "path", required: true, schema: { type: "string", format: "uuid" } }],
          responses: {
            200: { description: "The result", content: json("CaseResult") },
            202: { description: "Still waiting or running", content: json("AnalysisJob") },
            ...read,
            404: error("No such analysis of yours (or it is more than a day old)"),
            422: { description: "The engine refused the document", content: json("InvalidCase") },
          },
        },
      },
      "/api/v1/openapi.json": { get: { summary: "This document", security: [], responses: { 200: { description: "OpenAPI 3.1", content: { "application/json": { schema: { type: "object" } } } } } } },
    },
    components: {
      securitySchemes: {
        bearer: {
          type: "http",
          scheme: "bearer",
          description: 'Personal API token sw_… from /account/tokens, with the scope chosen when it was made: "read" (every GET, and analyse) or "read-write" (also import). A read-only token asking to change records is answered 403 insufficient-scope.',
        },
        cookie: { type: "apiKey", in: "cookie", name: "sw_session" },
      },
      schemas: {
        CaseFile: component(CaseFileSchema, "input"),
        CaseResult: component(ResultSchema, "output"),
        ImportRequest: { ...component(ImportTargetSchema.extend({ case: z.object({}) }), "input"), properties: { ...(component(ImportTargetSchema.omit({ case: true }), "input").properties as object), case: ref("CaseFile") } },
        Imported: component(ImportedSchema, "output"),
        CaseSummary: component(CaseSummarySchema, "output"),
        CaseDetail: component(CaseDetailSchema, "output"),
        Error: component(ErrorSchema, "output"),
        InvalidCase: component(InvalidCaseSchema, "output"),
        TooLarge: component(TooLargeSchema, "output"),
        AnalysisJob: component(AnalysisJobSchema, "output"),
      },
    },
  };
}

/** GET /api/v1/openapi.json — public, so tools can read it before anyone has a token. */
export async function loader() {
  return Response.json(openApiDocument(), { headers: { "Cache-Control": "public, max-age=300" } });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
