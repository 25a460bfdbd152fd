import { databaseUnavailableResponse, isDatabaseUnavailable } from "~/utils/unavailable.server";
import { DomainError, problemsMessage, type DocumentProblem } from "~/domain/errors";
import { apiError, apiRefusal } from "~/utils/http.server";
import { BODY_LIMITS, formatBytes } from "~/utils/limits";
import { findNul, NUL_MESSAGE } from "~/utils/text";

/** Largest request body the API reads (bytes); the web server refuses a larger one before this is reached. */
export const MAX_BODY_BYTES = BODY_LIMITS.api;

/**
 * Runs an API handler and turns every failure into the API's JSON `{ error, message }` answer:
 * Responses thrown by the auth helpers pass through, domain refusals get their status (services turn
 * the engine's refusals into domain refusals),
 * a database outage is a 503, anything unexpected is logged once and answered 500 without its stack.
 */
export async function apiHandler(fn: () => Promise<Response>): Promise<Response> {
  try {
    return await fn();
  } catch (error) {
    if (error instanceof Response) return error;
    if (error instanceof DomainError) return apiRefusal(error);
    if (isDatabaseUnavailable(error)) return databaseUnavailableResponse();
    console.error("API request failed", error);
    return apiError(500, "internal", "The server failed to answer this request. It has been logged; try again or report it.");
  }
}

export function notFoundJson(what: string): Response {
  return apiError(404, "not-found", `${what} was not found, or you have no access to it.`);
}

/** For a method the route does not answer (GET on a POST-only endpoint and the reverse). */
export function methodNotAllowed(request: Request, allowed: string): Response {
  return apiError(405, "method-not-allowed", `${request.method} is not answered here; use ${allowed}.`, { Allow: allowed });
}

/**
 * Reads a JSON request body of at most MAX_BODY_BYTES, refusing a larger one with 413 as soon as
 * it is known to be larger (by Content-Length, or while streaming when that header is absent).
 * @throws Response 413 (too large), 415 (not JSON), 400 (unreadable JSON)
 */
export async function readJsonBody(request: Request): Promise<unknown> {
  const type = request.headers.get("Content-Type");
  if (type && !/^application\/(?:[\w.+-]+\+)?json\b/i.test(type)) {
    throw apiError(415, "unsupported-media-type", "Send the body as JSON (Content-Type: application/json).");
  }
  const tooLarge = () => apiError(413, "too-large", `The request body is larger than ${formatBytes(MAX_BODY_BYTES)}, the limit for this request.`);
  const declared = Number(request.headers.get("Content-Length") ?? NaN);
  if (declared > MAX_BODY_BYTES) throw tooLarge();
  const chunks: Uint8Array[] = [];
  let size = 0;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > MAX_BODY_BYTES) {
        await reader.cancel();
        throw tooLarge();
      }
      chunks.push(value);
    }
  }
  const text = new TextDecoder().decode(Buffer.concat(chunks));
  if (!text.trim()) throw apiError(400, "invalid-json", "The request body is empty; send a JSON document.");
  let value: unknown;
  try {
    value = JSON.parse(text) as unknown;
  } catch (error) {
    throw apiError(400, "invalid-json", `The request body is not valid JSON: ${(error as Error).message}`);
  }
  // PostgreSQL cannot store it, and no field of ours means it: refused naming where it is.
  const nul = findNul(value);
  if (nul) throw apiError(400, "bad-request", `${nul}: ${NUL_MESSAGE}.`);
  return value;
}

/**
 * Problems of a bad exchange document, as the API answers them: 422 naming each field (at most
 * MAX_LISTED_PROBLEMS of them, with their count: see apiRefusal).
 */
export function invalidCase(problems: DocumentProblem[]): Response {
  return apiRefusal(new DomainError(problemsMessage(problems), { kind: "unprocessable", field: problems[0]?.path, problems }));
}
