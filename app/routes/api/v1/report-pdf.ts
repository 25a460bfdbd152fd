import { requireApiUser } from "~/auth/api-auth.server";
import { downloadReport } from "~/services/reports.server";
import type { Route } from "./+types/report-pdf";
import { apiHandler, methodNotAllowed } from "./respond.server";

/**
 * GET /api/v1/reports/:reportId/pdf — the stored PDF bytes exactly as issued (checked against their
 * recorded SHA-256), for people of the report's organisation who may read reports. Downloads are audited.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "report:read");
    const { report, bytes } = await downloadReport({ organisationId: current.organisation.id, reportId: params.reportId, actor: current.user });
    return new Response(bytes as unknown as BodyInit, {
      headers: {
        "Content-Type": "application/pdf",
        "Content-Length": String(bytes.byteLength),
        "Content-Disposition": `attachment; filename="${report.reportNumber}.pdf"`,
        "X-Content-SHA256": report.sha256!,
        "Cache-Control": "private, no-store",
      },
    });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
