import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { currentCaseLoadsBreakdown } from "~/services/case-loads.server";
import { getCaseUnits } from "~/services/case-steps.server";
import { reliefDrawings } from "~/charts/drawings.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-loads-breakdown";

/**
 * One load case's aerodynamic loads, inertia relief and net loads as JSON for the loads page:
 * choosing another case re-draws the breakdown with a fetcher, without a full navigation. With the
 * server's drawings of its charts.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const id = new URL(request.url).searchParams.get("case") ?? "";
  try {
    const [parts, units] = await Promise.all([currentCaseLoadsBreakdown(c.id, c.title, id), getCaseUnits(c.id)]);
    return Response.json({ ...parts, drawings: reliefDrawings(parts, units) }, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
