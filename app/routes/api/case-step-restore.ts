import { z } from "zod";
import { requireCase } from "~/auth/case-access.server";
import { numberInput } from "~/domain/form-inputs";
import { STEP_KEYS } from "~/domain/vocabulary";
import { restoreSavedRevision } from "~/services/case-steps.server";
import { accepted, answer, notFound, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/case-step-restore";

/** The revision the administrator was shown: put back only if the step is still at it. */
export const RestoreFormSchema = z.strictObject({ revision: numberInput("Revision") });

/**
 * An administrator puts back a step's data as its current revision was saved, where they were
 * changed outside Spanwright (the distribution page says so and offers it). JSON or a form in, the
 * action's answer out.
 */
export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "org:admin");
  const step = STEP_KEYS.find((k) => k === params.step);
  if (!step) notFound("Step");
  const parsed = await parseBody(request, RestoreFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  return answer(async () => {
    const { revision } = await restoreSavedRevision({ caseId: c.id, step, revision: parsed.value.revision, actor: current.user });
    return accepted(`Revision ${revision} put back as it was saved; what was found instead is kept in the audit log.`, { revision });
  });
}
