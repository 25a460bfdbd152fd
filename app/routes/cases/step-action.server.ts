import { data } from "react-router";
import { saveStep } from "~/services/case-steps.server";
import { DomainError } from "~/services/organisation.server";

/** What every step form's action answers: saved (with the new revision) or refused per field. */
export type StepActionResult = { ok: boolean; revision: number; fieldErrors: Record<string, string[] | undefined> };

/** A refusal of a step form: 400 with the messages per field, nothing written. */
export function refused(fieldErrors: Record<string, string[] | undefined>, status = 400) {
  return data<StepActionResult>({ ok: false, revision: 0, fieldErrors }, { status });
}

/** Saves the step and answers the form: the new revision, or the domain refusal (stale, read-only) by field. */
export async function saveStepAnswer(input: Parameters<typeof saveStep>[0]) {
  try {
    const saved = await saveStep(input);
    return data<StepActionResult>({ ok: true, revision: saved.revision, fieldErrors: {} });
  } catch (error) {
    if (error instanceof DomainError) return refused({ [error.field ?? "form"]: [error.message] }, error.status);
    throw error;
  }
}
