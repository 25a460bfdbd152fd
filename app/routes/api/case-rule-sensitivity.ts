import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { caseRuleSensitivity } from "~/services/comparisons.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-rule-sensitivity";

/**
 * The root loads of the case's critical cases under each compressibility rule, as JSON for the
 * distribution page, which loads it after the page itself (it takes a few spanwise solves).
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  try {
    return Response.json(await caseRuleSensitivity({ caseId: c.id, title: c.title, actorId: current.user.id }), { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
