import { saveStep } from "~/services/case-steps.server";
import { accepted, answer } from "~/utils/http.server";

/**
 * Saves a step form's data and answers: the new revision ("Saved as revision 3.", or with `what`
 * "Dispositions saved as revision 3."), that nothing changed, or the refusal (stale, read-only) by field.
 */
export function saveStepAnswer(input: Parameters<typeof saveStep>[0], what?: string) {
  return answer(async () => {
    const saved = await saveStep(input);
    if (saved.unchanged) return accepted(`Nothing changed: revision ${saved.revision} is kept as it was, and so are its approvals.`, { revision: saved.revision });
    return accepted(`${what ? `${what} saved` : "Saved"} as revision ${saved.revision}.`, { revision: saved.revision });
  });
}
