// Node's socket errors and PostgreSQL's connection-class and shutdown SQLSTATEs: the server is
// away (stopped, restarting, unreachable), as opposed to a query that is wrong.
const SOCKET_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EPIPE", "EHOSTUNREACH", "ENOTFOUND"]);
const SQLSTATES = new Set(["57P01", "57P02", "57P03", "08000", "08001", "08003", "08004", "08006"]);
const MESSAGES = /Connection terminated|terminating connection|the database system is (?:starting up|shutting down)|Client has encountered a connection error|timeout exceeded when trying to connect/i;

/**
 * True when an error (or any error in its `cause` chain, as drizzle wraps pg's) means the database
 * cannot be reached just now, so the request may succeed unchanged once it is back.
 */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, message, errors } = e as { code?: unknown; message?: unknown; errors?: unknown };
    if (typeof code === "string" && (SOCKET_CODES.has(code) || SQLSTATES.has(code))) return true;
    if (typeof message === "string" && MESSAGES.test(message)) return true;
    // Node reports a refused connection to a host with several addresses as an AggregateError.
    if (Array.isArray(errors) && errors.some((x) => isDatabaseUnavailable(x))) return true;
  }
  return false;
}

export const DATABASE_UNAVAILABLE_MESSAGE = "The database cannot be reached just now, so nothing was read or saved. Try again in a minute; if it keeps happening, tell your administrator.";

/** The 503 answer to a request made during an outage: JSON `{ error, message }`, read by the error pages and the API alike. */
export function databaseUnavailableResponse(): Response {
  return Response.json({ error: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE }, { status: 503, headers: { "Retry-After": "30", "Cache-Control": "no-store" } });
}

/** Re-throws a database outage as that 503 Response; any other error unchanged. */
export function rethrowUnavailable(error: unknown): never {
  if (isDatabaseUnavailable(error)) throw databaseUnavailableResponse();
  throw error;
}
