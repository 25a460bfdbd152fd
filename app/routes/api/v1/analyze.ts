import { href } from "react-router";
import { requireApiUser } from "~/auth/api-auth.server";
import { analyse, AnalysisLimitError, refuseWhenNoPlace, withAnalysisPlace } from "~/services/analysis-jobs.server";
import { statusOf } from "~/utils/http.server";
import type { Route } from "./+types/analyze";
import { apiHandler, invalidCase, methodNotAllowed, readJsonBody } from "./respond.server";

export async function loader({ request }: Route.LoaderArgs) {
  return methodNotAllowed(request, "POST");
}

/**
 * POST /api/v1/analyze — body `spanwright.case/1` (or `{ case, sections }` with the richer section data
 * of `spanwright.sections/1` beside it), answer `spanwright.result/1`, exactly as the command line computes
 * it. Up to ANALYZE_LIMITS.syncCases load cases are answered at once and nothing is stored; a larger
 * sweep is answered 202 with a job to poll at /api/v1/analyze/jobs/{jobId}. A request beyond a limit
 * answers 413 naming it; a bad document 422 naming its fields; a request beyond the analyses a web
 * process holds at once (ANALYZE_LIMITS.inFlightPerProcess) 503 with Retry-After, at once.
 */
export async function action({ request, context }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") return methodNotAllowed(request, "POST");
    refuseWhenNoPlace();
    const current = await requireApiUser({ request, context }, "case:read");
    const document = await readJsonBody(request);
    return withAnalysisPlace(async () => {
      try {
        const answer = await analyse({ organisationId: current.organisation.id, userId: current.user.id, document });
        if (answer.kind === "invalid") return invalidCase(answer.problems);
        if (answer.kind === "result") return Response.json(answer.result);
        const location = href("/api/v1/analyze/jobs/:jobId", { jobId: answer.job.id });
        return Response.json(
          { job: { ...answer.job, links: { self: location } }, message: `${answer.job.cases} load cases are solved by a background worker; fetch ${location} until it answers 200.` },
          { status: 202, headers: { Location: location, "Retry-After": "2" } },
        );
      } catch (error) {
        if (error instanceof AnalysisLimitError) return Response.json({ error: "too-large", message: error.message, limit: { name: error.limit, max: error.max } }, { status: statusOf(error) });
        throw error;
      }
    });
  });
}
