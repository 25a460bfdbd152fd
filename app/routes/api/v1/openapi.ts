import { z } from "zod";
import { CASE_SCHEMA_ID, CaseFileSchema, CaseResultSchema as ResultSchema, RESULT_SCHEMA_ID } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { CASE_STATUSES, STEP_KEYS, STEP_STATUSES } from "~/domain/vocabulary";
import type { Route } from "./+types/openapi";
import { ImportTargetSchema } from "./case-import";
import { methodNotAllowed } from "./respond.server";

const ErrorSchema = z.object({ error: z.string(), message: z.string() });
const InvalidCaseSchema = ErrorSchema.extend({
  error: z.literal("invalid-case"),
  problems: z.array(z.object({ path: z.string().meta({ description: "contract path, e.g. cases[3].mach" }), message: z.string() })),
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
const read = { 401: error("No credentials, or they are not valid"), 403: error("Your role does not grant the permission named") };

/** The OpenAPI 3.1 description of the public API, generated from the zod schemas the server validates with. */
export function openApiDocument() {
  return {
    openapi: "3.1.0",
    info: {
      title: "Spanwright API",
      version: "1",
      description: `Cases, exchange-format import and export, and stateless analysis. Engine ${ENGINE_VERSION}. Authenticate with the session cookie or a personal API token (Authorization: Bearer sw_…) from /account/tokens. Every error answers JSON { error, message }.`,
    },
    servers: [{ url: "/" }],
    security: [{ bearer: [] }, { cookie: [] }],
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
          description:
            "Needs case:create. Body { programmeId, reference, title?, case }, or the document alone with ?programmeId=&reference=[&title=]. Creates the case and its planform, sections, envelope and loads steps in one transaction; a refusal writes nothing.",
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
            413: error("Body larger than 20 MB"),
            422: { description: "Every bad field", content: json("InvalidCase") },
          },
        },
      },
      "/api/v1/analyze": {
        post: {
          summary: `Analyse a ${CASE_SCHEMA_ID} document; nothing is stored`,
          description: "Needs case:read.",
          requestBody: { required: true, content: json("CaseFile") },
          responses: { 200: { description: "The result", content: json("CaseResult") }, ...read, 413: error("Body larger than 20 MB"), 422: { description: "Every bad field", content: json("InvalidCase") } },
        },
      },
      "/api/v1/openapi.json": { get: { summary: "This document", security: [], responses: { 200: { description: "OpenAPI 3.1", content: { "application/json": { schema: { type: "object" } } } } } } },
    },
    components: {
      securitySchemes: {
        bearer: { type: "http", scheme: "bearer", description: "Personal API token sw_… from /account/tokens" },
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
