import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { getCaseUnits } from "~/services/case-steps.server";
import { flagWindow } from "~/services/distribution.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-flagged-cases";

/**
 * GET /api/cases/:caseId/flagged-cases?offset=&limit= — a range of the distribution page's flagged
 * cases with their reasons and dispositions, fetched as the table scrolls instead of all of them.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const query = new URL(request.url).searchParams;
  try {
    const window = await flagWindow({ caseId: c.id, title: c.title, units: await getCaseUnits(c.id), offset: Number(query.get("offset") ?? "0"), limit: Number(query.get("limit") ?? "100") });
    return Response.json(window, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
