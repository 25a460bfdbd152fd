import { requireApiUser } from "~/auth/api-auth.server";
import { getCase } from "~/services/programmes.server";
import { listReports } from "~/services/reports.server";
import type { Route } from "./+types/case-reports";
import { apiHandler, methodNotAllowed, notFoundJson } from "./respond.server";

/**
 * GET /api/v1/cases/:caseId/reports — every version of the case's report with the SHA-256 of its
 * PDF bytes and the signatures behind it (also polled by the reports page for progress).
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "report:read");
    const found = await getCase(current.organisation.id, params.caseId);
    if (!found) return notFoundJson("The case");
    const list = await listReports(current.organisation.id, found.case.id);
    return Response.json(
      {
        reports: list.map((r) => ({
          id: r.id,
          version: r.version,
          reportNumber: r.reportNumber,
          status: r.status,
          progress: r.progress,
          progressNote: r.progressNote,
          sha256: r.sha256,
          createdAt: r.createdAt.toISOString(),
          issuedAt: r.issuedAt?.toISOString() ?? null,
          releasedAt: r.releasedAt?.toISOString() ?? null,
          signatures: r.signatures.map((s) => ({ name: s.name, role: s.role, meaning: s.meaning, signedAt: s.signedAt.toISOString(), revisionHash: s.revisionHash })),
        })),
      },
      { headers: { "Cache-Control": "no-store" } },
    );
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
