import { requireCase } from "~/auth/case-access.server";
import { getCaseUnits } from "~/services/case-steps.server";
import { distributionDrawings } from "~/charts/drawings.server";
import { distributionCaseView } from "~/services/distribution.server";
import type { Route } from "./+types/case-distribution";
import { DomainError } from "~/domain/errors";
import { apiRefusal } from "~/utils/http.server";

/**
 * GET /api/cases/:caseId/distribution?case= — the distribution of one load case, as JSON for the
 * distribution page, which asks for it after it shows and when another case is chosen; with the
 * server's drawings of its charts, which the page shows without the chart library.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const loadCase = new URL(request.url).searchParams.get("case") ?? "";
  try {
    const units = await getCaseUnits(c.id);
    const view = await distributionCaseView({ caseId: c.id, reference: c.reference, title: c.title, loadCase, units });
    return Response.json({ ...view, drawings: distributionDrawings(view, units) }, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
