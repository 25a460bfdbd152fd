import { href } from "react-router";
import { requireApiUser } from "~/auth/api-auth.server";
import { getAnalysisJob } from "~/services/analysis-jobs.server";
import type { Route } from "./+types/analyze-job";
import { apiHandler, invalidCase, methodNotAllowed, notFoundJson } from "./respond.server";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * GET /api/v1/analyze/jobs/:jobId — a queued analysis of the caller's: 202 with its status while it
 * waits or runs, 200 with the `spanwright.result/1` document when done, 422 naming the field the
 * engine refused. Another person's job answers 404, as a missing one does. Kept for a day.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "case:read");
    const job = UUID.test(params.jobId) ? await getAnalysisJob(current.user.id, params.jobId) : null;
    if (!job) return notFoundJson("The analysis");
    if (job.status === "done" && job.result) return Response.json(job.result);
    if (job.status === "failed") return invalidCase(job.problems ?? []);
    const { result: _result, problems: _problems, ...status } = job;
    return Response.json({ job: { ...status, links: { self: href("/api/v1/analyze/jobs/:jobId", { jobId: job.id }) } } }, { status: 202, headers: { "Retry-After": "2" } });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
