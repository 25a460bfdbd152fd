import { requireApiUser } from "~/auth/api-auth.server";
import { exchangeDocumentText } from "~/exchange";
import { exportCase } from "~/services/analysis.server";
import { getCase } from "~/services/programmes.server";
import type { Route } from "./+types/case-export";
import { apiHandler, methodNotAllowed, notFoundJson } from "./respond.server";

/**
 * GET /api/v1/cases/:caseId/export — the case as a `spanwright.case/1` document, as the command
 * line reads it; 409 naming the steps still to save when planform, sections or envelope is missing.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser(request, "case:read");
    const found = await getCase(current.organisation.id, params.caseId);
    if (!found) return notFoundJson("The case");
    const file = await exportCase(found.case.id, found.case.title);
    // The same bytes an issued report attaches for an unchanged case (exchangeDocumentText).
    return new Response(exchangeDocumentText(file), { headers: { "Content-Type": "application/json", "Content-Disposition": `inline; filename="${filenameOf(found.case.reference)}.case.json"` } });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}

/** A reference as a safe file name (references may hold "/"). */
export function filenameOf(reference: string): string {
  return reference.replace(/[^A-Za-z0-9._-]+/g, "_");
}
