/** Machine-readable reasons the engine refuses an input. */
export type EngineErrorCode =
  | "altitude-out-of-range"
  | "mach-out-of-range"
  | "invalid-planform"
  | "invalid-section"
  | "invalid-argument"
  | "no-solution";

/**
 * A domain failure: the input is outside what the methods can honour.
 * `field` names the offending input in the exchange-contract path style ("cases[3].mach") when known.
 */
export class EngineError extends Error {
  readonly code: EngineErrorCode;
  readonly field: string | undefined;

  constructor(code: EngineErrorCode, message: string, field?: string) {
    super(field ? `${field}: ${message}` : message);
    this.name = "EngineError";
    this.code = code;
    this.field = field;
  }
}

/** True when `e` is an EngineError (also across module copies, by name and shape). */
export function isEngineError(e: unknown): e is EngineError {
  return e instanceof EngineError || (e instanceof Error && e.name === "EngineError" && "code" in e);
}
