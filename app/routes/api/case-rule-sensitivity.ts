import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { caseRuleSensitivity } from "~/services/rule-sensitivity.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-rule-sensitivity";

/**
 * GET /api/cases/:caseId/rule-sensitivity — the root loads of the case's critical cases under each
 * compressibility rule, as the job worker stored them for the distribution page; 202 with the
 * worker's progress until then (the page asks again). Nothing is solved here.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  try {
    const answer = await caseRuleSensitivity({ caseId: c.id, title: c.title });
    if (answer.state === "pending") return Response.json(answer, { status: 202, headers: { "Retry-After": "1", "Cache-Control": "no-store" } });
    return Response.json({ units: answer.units, sensitivity: answer.sensitivity }, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
