import { requireApiUser } from "~/auth/api-auth.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { getCase } from "~/services/programmes.server";
import type { Route } from "./+types/case";
import { apiHandler, methodNotAllowed, notFoundJson } from "./respond.server";

/** GET /api/v1/cases/:caseId — the case header with each step's status and revision. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "case:read");
    // Another organisation's case answers exactly like an unknown or malformed id.
    const found = await getCase(current.organisation.id, params.caseId);
    if (!found) return notFoundJson("The case");
    const steps = await getCaseSteps(found.case.id);
    return Response.json({
      id: found.case.id,
      reference: found.case.reference,
      title: found.case.title,
      description: found.case.description,
      programme: { id: found.programme.id, code: found.programme.code, name: found.programme.name },
      status: found.case.status,
      revision: found.case.revision,
      createdBy: found.createdByName,
      createdAt: found.case.createdAt.toISOString(),
      updatedAt: found.case.updatedAt.toISOString(),
      steps: Object.values(steps).map((s) => ({ step: s.step, status: s.status, revision: s.revision, updatedAt: s.updatedAt?.toISOString() ?? null })),
    });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
