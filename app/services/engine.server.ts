import { DomainError } from "~/domain/errors";
import { isEngineError } from "~/engine";

/**
 * Runs engine work for a service: an EngineError (the input is outside what the methods honour)
 * becomes the DomainError that names the field, answered 422; anything else is thrown on.
 */
export function runEngine<T>(work: () => T): T {
  try {
    return work();
  } catch (error) {
    if (isEngineError(error)) throw new DomainError(error.message, { field: error.field, kind: "unprocessable" });
    throw error;
  }
}

/** As runEngine, for engine work that runs in steps (a sweep handed to the job worker). */
export async function runEngineAsync<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (isEngineError(error)) throw new DomainError(error.message, { field: error.field, kind: "unprocessable" });
    throw error;
  }
}
