import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { spanwiseWaysDrawing } from "~/charts/drawings.server";
import { caseSpanwiseComparison } from "~/services/comparisons.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-spanwise-methods";

/** One load case (`?case=`) by the vortex lattice, the lifting line and Schrenk's approximation, as JSON for the distribution page, with the server's drawing of its chart. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  try {
    const loadCase = new URL(request.url).searchParams.get("case") ?? "";
    const { units, comparison } = await caseSpanwiseComparison({ caseId: c.id, title: c.title, loadCase });
    return Response.json({ units, comparison, drawing: spanwiseWaysDrawing(comparison, units) }, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
