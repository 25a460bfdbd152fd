import { data } from "react-router";

/** Throws a 404 that says what was not found: also used for other organisations' records, so their existence is not revealed. */
export function notFound(what: string): never {
  throw data({ message: `${what} was not found, or you have no access to it.` }, { status: 404 });
}

export function forbidden(message: string): never {
  throw data({ message }, { status: 403 });
}

/** Validation failures are returned, not thrown, so the form can show them next to its fields. */
export function badRequest<T extends { fieldErrors?: Record<string, string[] | undefined>; formError?: string }>(body: T) {
  return data(body, { status: 400 });
}

/** Only same-site relative paths are followed after sign-in, never another origin. */
export function safeRedirectPath(value: unknown, fallback: string): string {
  if (typeof value !== "string" || !value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\")) return fallback;
  return value;
}

import type { z } from "zod";
import { fieldErrorsOf, formDataToObject, type FieldErrors } from "./form-data";

export type Parsed<T> = { ok: true; value: T } | { ok: false; fieldErrors: FieldErrors };

/**
 * Reads a form post (or a JSON body) and validates it with the same zod schema the browser used.
 * The server always re-validates: the client-side check is only for the person's convenience.
 */
export async function parseBody<S extends z.ZodType>(request: Request, schema: S, arrays: readonly string[] = []): Promise<Parsed<z.output<S>>> {
  const type = request.headers.get("Content-Type") ?? "";
  let raw: unknown;
  try {
    raw = type.includes("application/json") ? await request.json() : formDataToObject(await request.formData(), arrays);
  } catch {
    return { ok: false, fieldErrors: { form: ["The request body could not be read."] } };
  }
  const parsed = schema.safeParse(raw);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, fieldErrors: fieldErrorsOf(parsed.error) };
}

/** Set by our HTTP server on every request from the socket's address, replacing anything the client sent. */
export const CLIENT_ADDRESS_HEADER = "x-spanwright-client-address";

export function clientAddress(request: Request): string {
  return request.headers.get(CLIENT_ADDRESS_HEADER) ?? "unknown";
}
