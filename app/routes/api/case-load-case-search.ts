import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { getCaseUnits } from "~/services/case-steps.server";
import { searchLoadCases } from "~/services/distribution.server";
import { apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-load-case-search";

/**
 * GET /api/cases/:caseId/load-case-search?q= — the load cases whose id holds the text typed, a few at
 * a time: the distribution page's case picker, which cannot list 100 000 cases.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  try {
    const found = await searchLoadCases({ caseId: c.id, title: c.title, units: await getCaseUnits(c.id), text: new URL(request.url).searchParams.get("q") ?? "" });
    return Response.json(found, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
