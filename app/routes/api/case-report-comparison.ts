import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { comparisonPdf } from "~/services/report-comparison.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-report-comparison";

/** GET ?from=&to= (report ids): the comparison of two issued versions of the case's report as a PDF (unsigned, not a report). */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "report:read");
  const url = new URL(request.url);
  try {
    const { fileName, bytes } = await comparisonPdf({ organisationId: current.organisation.id, caseId: c.id, fromId: url.searchParams.get("from"), toId: url.searchParams.get("to") });
    return new Response(bytes as unknown as BodyInit, {
      headers: { "Content-Type": "application/pdf", "Content-Length": String(bytes.byteLength), "Content-Disposition": `attachment; filename="${fileName}"`, "Cache-Control": "private, no-store" },
    });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
