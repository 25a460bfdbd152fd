import { saveStep } from "~/services/case-steps.server";
import { accepted, answer } from "~/utils/http.server";

/** Saves a step form's data and answers: the new revision, or the refusal (stale, read-only) by field. */
export function saveStepAnswer(input: Parameters<typeof saveStep>[0]) {
  return answer(async () => {
    const saved = await saveStep(input);
    return accepted(`Saved as revision ${saved.revision}.`, { revision: saved.revision });
  });
}
