/**
 * What kind of refusal a DomainError is. The one mapping of kinds to HTTP answers is in
 * app/utils/http.server.ts; services say what went wrong, never how it is answered.
 */
export type DomainErrorKind =
  /** The input breaks a rule (400). */
  | "invalid"
  /** The person's identity was not confirmed, e.g. a wrong password when signing (401). */
  | "unauthenticated"
  /** The person may not do this (403). */
  | "forbidden"
  /** The record does not exist, or belongs to another organisation (404). */
  | "not-found"
  /** The record's state does not allow it now: stale revision, read-only step, already done (409). */
  | "conflict"
  /** The request is larger than the limit it names (413). */
  | "too-large"
  /** Too many attempts or requests for now: wait and try again (429). */
  | "too-many"
  /** The server is working at its stated capacity for this kind of request: send again shortly (503). */
  | "busy"
  /** The case cannot be computed as given: the engine or the exchange contract refuses it (422). */
  | "unprocessable";

/** One problem of a document, with its path in that document (`cases[3].mach`). */
export interface DocumentProblem {
  path: string;
  message: string;
}

/**
 * An expected refusal by a rule of the product, with a message for the person and, where one
 * field is at fault, that field's name. Nothing is written when one is thrown: services throw it
 * before or inside the transaction of the change.
 */
export class DomainError extends Error {
  readonly kind: DomainErrorKind;
  /** The form field or document path at fault ("revision", "stations.2.y"), if one is. */
  readonly field?: string;
  /** Every problem of a refused document (exchange import), each with its path. */
  readonly problems?: readonly DocumentProblem[];

  constructor(message: string, options: { kind?: DomainErrorKind; field?: string; problems?: readonly DocumentProblem[] } = {}) {
    super(message);
    this.name = "DomainError";
    this.kind = options.kind ?? "invalid";
    this.field = options.field;
    this.problems = options.problems;
  }
}

/**
 * The problems of a refused document in one short message: the first few with their paths, then
 * how many more there are. A document with a hundred thousand bad rows is answered in a line.
 */
export function problemsMessage(problems: readonly DocumentProblem[], shown = 5): string {
  const head = problems.slice(0, shown).map((p) => `${p.path}: ${p.message}`).join("; ");
  const more = problems.length - shown;
  return more > 0 ? `${head}; and ${more} more problem${more === 1 ? "" : "s"}` : head;
}

export function isDomainError(error: unknown): error is DomainError {
  return error instanceof DomainError;
}
