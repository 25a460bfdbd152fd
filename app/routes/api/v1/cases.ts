import { requireApiUser } from "~/auth/api-auth.server";
import { listCases } from "~/services/programmes.server";
import type { Route } from "./+types/cases";
import { apiHandler, methodNotAllowed } from "./respond.server";

/** GET /api/v1/cases — the caller's organisation's cases, most recently changed first. */
export async function loader({ request, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "case:read");
    const rows = await listCases(current.organisation.id);
    return Response.json({
      cases: rows.map((c) => ({
        id: c.id,
        reference: c.reference,
        title: c.title,
        programme: { id: c.programmeId, code: c.programmeCode, name: c.programmeName },
        status: c.status,
        updatedAt: c.updatedAt.toISOString(),
      })),
    });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
