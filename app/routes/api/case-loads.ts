import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { sweepProgressText } from "~/domain/results";
import { getCaseUnits } from "~/services/case-steps.server";
import { loadsDrawings } from "~/charts/drawings.server";
import { loadsView } from "~/services/loads-view.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-loads";

/**
 * GET /api/cases/:caseId/loads[?case=id] — what the loads page shows of the case's results: the
 * envelope, the root loads of at most 500 cases (the most critical of a larger file) and one case
 * with its stations, and the server's drawings of the page's charts; 202 with the progress while a
 * large sweep is computed. The whole result
 * document is the public results API's.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  try {
    const view = await loadsView(c.id, c.title, current.user.id, new URL(request.url).searchParams.get("case"));
    if (view.pending) {
      const p = view.progress;
      return Response.json(
        { status: "computing", message: `${sweepProgressText(p, view.cases)} Ask again in a moment.`, progress: p ? { phase: p.phase, solves: p.solves, casesDone: p.casesDone, casesTotal: p.casesTotal } : null },
        { status: 202, headers: { "Retry-After": "1", "Cache-Control": "no-store" } },
      );
    }
    const { pending: _pending, ...body } = view;
    return Response.json({ ...body, drawings: loadsDrawings(body, await getCaseUnits(c.id)) }, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
