/**
 * The size limits of requests, in one place: the web server enforces the body limits while it reads
 * (docs/security.md), the API enforces the analysis limits before any solving starts, and the API
 * page and the OpenAPI document print them. Isomorphic: no server imports.
 */

const KiB = 1024;
const MiB = 1024 * KiB;

/** Largest request body read, in bytes, by kind of request. A larger one is answered 413 unread. */
export const BODY_LIMITS = {
  /** A request without a session cookie or bearer token (sign-in, invitations, sign-out). */
  anonymous: 16 * KiB,
  /** A signed-in form post: the largest, a whole envelope grid of 500 load cases or 2000 edited rows of a larger one, is about 0.5 MiB. */
  form: 2 * MiB,
  /** The section-data upload: the 1 MiB CSV limit plus the multipart envelope and form fields. */
  upload: 1 * MiB + 64 * KiB,
  /** A JSON body of the public API (case import, analyze). */
  api: 20 * MiB,
} as const;

/** Sizes in words for answers and documentation: "16 KiB", "2 MiB". */
export function formatBytes(bytes: number): string {
  if (bytes >= MiB && bytes % MiB === 0) return `${bytes / MiB} MiB`;
  if (bytes >= MiB) return `${(bytes / MiB).toFixed(2)} MiB`;
  return `${Math.round(bytes / KiB)} KiB`;
}

/**
 * What one `POST /api/v1/analyze` may ask for. A request inside SYNC_CASES is solved while the
 * caller waits; up to QUEUED_CASES it goes to the job queue and is answered 202 with a job to poll;
 * anything larger, or a wing or output beyond its limit, is refused at once (413 or 422) naming the
 * limit, before any solving starts.
 */
export const ANALYZE_LIMITS = {
  /** Wing stations in `wing.stations`. */
  wingStations: 200,
  /** Output stations per semispan (`method.stations`). */
  outputStations: 400,
  /** Load cases answered within the request. */
  syncCases: 500,
  /** Load cases of one request in all; between syncCases and this, the job queue solves them. */
  queuedCases: 20_000,
  /** Numbers and strings in the richer section data beside the case (`sections`). */
  sectionValues: 500_000,
  /**
   * Analysis requests one web process holds at once (reading, validating, solving or queueing).
   * Solving takes the process's whole thread, so more would only wait behind each other until the
   * client gives up; the next one is answered 503 with Retry-After at once instead.
   */
  inFlightPerProcess: 4,
} as const;

/** Output station rows (cases × output stations) a request may ask for with method.output "full". */
export const MAX_OUTPUT_ROWS = ANALYZE_LIMITS.syncCases * ANALYZE_LIMITS.outputStations;
/** Queued analyses one person may have waiting or running at once. */
export const MAX_OPEN_ANALYSES = 3;

/** An error answer lists at most this many problems, then says how many more there were. */
export const MAX_LISTED_PROBLEMS = 50;
