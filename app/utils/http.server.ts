import Negotiator from "negotiator";
import { data } from "react-router";
import type { z } from "zod";
import { DomainError, type DomainErrorKind } from "~/domain/errors";
import { fieldErrorsOf, FormFieldError, formDataToObject, type ActionAnswer, type ActionRefusal, type FieldErrors, type FormShape } from "./form-data";
import { MAX_LISTED_PROBLEMS } from "./limits";
import { findNul, NUL_MESSAGE } from "./text";

// ---------------------------------------------------------------- the one mapping of refusals to HTTP

const STATUS: Record<DomainErrorKind, number> = {
  invalid: 400,
  unauthenticated: 401,
  forbidden: 403,
  "not-found": 404,
  conflict: 409,
  "too-large": 413,
  "too-many": 429,
  busy: 503,
  unprocessable: 422,
};

// The `error` code of the API's JSON answers.
const API_CODE: Record<DomainErrorKind, string> = {
  invalid: "bad-request",
  unauthenticated: "unauthorized",
  forbidden: "forbidden",
  "not-found": "not-found",
  conflict: "conflict",
  "too-large": "too-large",
  "too-many": "too-many-requests",
  busy: "busy",
  unprocessable: "invalid-case",
};

/** The HTTP status that answers a refusal of this kind. */
export function statusOf(error: DomainError): number {
  return STATUS[error.kind];
}

/** A JSON error answer of the API: always `{ error, message }` (plus `problems` for a refused document), never a stack trace. */
export function apiError(status: number, error: string, message: string, headers?: HeadersInit): Response {
  return Response.json({ error, message }, { status, headers });
}

/**
 * A domain refusal as the API answers it. A refused document's problems are listed up to
 * MAX_LISTED_PROBLEMS, in document order, with their count, so the answer stays short.
 */
export function apiRefusal(error: DomainError): Response {
  const problems = error.problems ? { problemCount: error.problems.length, problems: error.problems.slice(0, MAX_LISTED_PROBLEMS), ...(error.problems.length > MAX_LISTED_PROBLEMS ? { omitted: error.problems.length - MAX_LISTED_PROBLEMS } : {}) } : {};
  // A refusal for now (busy, too many) says when to ask again, as HTTP has it say.
  const headers: HeadersInit = error.kind === "busy" ? { "Retry-After": "1" } : {};
  return Response.json({ error: API_CODE[error.kind], message: error.message, ...problems }, { status: statusOf(error), headers });
}

// ---------------------------------------------------------------- page actions

/**
 * An action's success: the message for the page and whatever else the page needs next. Give every
 * success of one action the same keys (`null` where there is nothing), so the page's type keeps them.
 */
export function accepted(message: string | null): Accepted;
export function accepted<T extends object>(message: string | null, values: T): Accepted & T;
export function accepted(message: string | null, values?: object) {
  return { ok: true as const, message, fieldErrors: {}, ...values };
}

type Accepted = ActionAnswer & { ok: true };

/** An action's refusal: messages by field ("form" for the whole form), nothing written. */
export function refused(fieldErrors: FieldErrors, options: { status?: number; message?: string; intent?: string; headers?: HeadersInit } = {}) {
  const body: ActionRefusal = { ok: false, message: options.message ?? null, fieldErrors, ...(options.intent ? { intent: options.intent } : {}) };
  return data(body, { status: options.status ?? 400, headers: options.headers });
}

/** A domain refusal as an action answers it: its status, its message, and the message by its field. */
export function refusalOf(error: DomainError, intent?: string) {
  return refused({ [error.field ?? "form"]: [error.message] }, { status: statusOf(error), message: error.message, intent });
}

/**
 * Runs an action's work and answers a DomainError as that refusal; anything else is thrown on
 * (a Response to the framework, a fault to the error boundary). Every page action answers through it.
 */
export async function answer<T>(work: () => Promise<T>, options: { intent?: string } = {}): Promise<T | ReturnType<typeof refusalOf>> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof DomainError) return refusalOf(error, options.intent);
    throw error;
  }
}

// ---------------------------------------------------------------- loaders and guards

/** Throws a 404 that says what was not found: also used for other organisations' records, so their existence is not revealed. */
export function notFound(what: string): never {
  throw data({ message: `${what} was not found, or you have no access to it.` }, { status: 404 });
}

/** Throws a 403 for a role that may not do this; the page's error boundary shows the message. */
export function forbidden(message: string): never {
  throw data({ message }, { status: 403 });
}

// Any origin of our own would do: only whether a return path stays on it matters.
const HOME = new URL("http://spanwright.invalid");

/**
 * The path to return to after sign-in, resolved as a browser would resolve it (tabs and line
 * breaks dropped, backslashes read as slashes, other characters percent-encoded) and kept only if
 * it stays on our own origin: "/%09/evil.example" and "/\evil.example" become the fallback.
 */
export function safeRedirectPath(value: unknown, fallback: string): string {
  if (typeof value !== "string" || !value.startsWith("/") || value.length > 2048) return fallback;
  let url: URL;
  try {
    url = new URL(value, HOME);
  } catch {
    return fallback;
  }
  if (url.origin !== HOME.origin) return fallback;
  return url.pathname + url.search + url.hash;
}

export type Parsed<T> = { ok: true; value: T } | { ok: false; fieldErrors: FieldErrors };

/**
 * Reads a form post (or a JSON body) and validates it with the same zod schema the browser used.
 * The server always re-validates: the client-side check is only for the person's convenience.
 * `shape` bounds the form's lists (its step's maximum rows) and names its checkbox groups; a NUL
 * character anywhere is refused naming the field.
 */
export async function parseBody<S extends z.ZodType>(request: Request, schema: S, shape: FormShape = {}): Promise<Parsed<z.output<S>>> {
  const type = request.headers.get("Content-Type") ?? "";
  let raw: unknown;
  try {
    raw = type.includes("application/json") ? await request.json() : formDataToObject(await request.formData(), shape);
  } catch (error) {
    if (error instanceof FormFieldError) return { ok: false, fieldErrors: { [error.field]: [error.message] } };
    return { ok: false, fieldErrors: { form: ["The request body could not be read."] } };
  }
  const nul = findNul(raw);
  if (nul) return { ok: false, fieldErrors: { [nul]: [`The value ${NUL_MESSAGE}.`] } };
  const parsed = schema.safeParse(raw);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, fieldErrors: fieldErrorsOf(parsed.error) };
}

/** Set by our HTTP server on every request from the socket's address, replacing anything the client sent. */
export const CLIENT_ADDRESS_HEADER = "x-spanwright-client-address";

export function clientAddress(request: Request): string {
  return request.headers.get(CLIENT_ADDRESS_HEADER) ?? "unknown";
}

// negotiator 1.x breaks ties between equal weights by a preferred order; @types/negotiator describes 0.6, without it.
const negotiateEncoding = Negotiator.prototype.encoding as (this: Negotiator, available: readonly string[], options: { preferred: readonly string[] }) => string | undefined;

/** The compression a client takes for a body the server keeps compressed (brotli first on a tie, as the compression middleware), or null. */
export function acceptedEncoding(request: Request): "br" | "gzip" | null {
  const negotiator = new Negotiator({ headers: { "accept-encoding": request.headers.get("accept-encoding") ?? "identity" } });
  const chosen = negotiateEncoding.call(negotiator, ["br", "gzip", "identity"], { preferred: ["br", "gzip"] });
  return chosen === "br" || chosen === "gzip" ? chosen : null;
}
