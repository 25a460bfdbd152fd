import { requireCase } from "~/auth/case-access.server";
import { DomainError } from "~/domain/errors";
import { getCaseUnits } from "~/services/case-steps.server";
import { loadCaseWindow, MAX_WINDOW_ROWS } from "~/services/load-cases.server";
import { apiRefusal } from "~/utils/http.server";
import type { loadCaseRowValues } from "../cases/envelope.schema";
import type { Route } from "./+types/case-load-cases";

/** The answer: rows `offset…` of the stored load cases in the case's display units, with the revision they belong to. */
export type LoadCaseRows = {
  revision: number;
  total: number;
  offset: number;
  rows: ReturnType<typeof loadCaseRowValues>[];
};

/**
 * GET /api/cases/:caseId/load-cases?offset=&limit= — a window of the envelope's load cases for the
 * grid of a large case file, which fetches the rows as they scroll into view instead of all of them.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const query = new URL(request.url).searchParams;
  const offset = Number(query.get("offset") ?? "0");
  const limit = Number(query.get("limit") ?? "100");
  try {
    // Imported as the envelope page imports it (on demand), so that the page's dynamic import stays a chunk boundary.
    const { loadCaseRowValues } = await import("../cases/envelope.schema");
    const units = await getCaseUnits(c.id);
    const window = await loadCaseWindow(c.id, offset, Math.min(limit, MAX_WINDOW_ROWS));
    const body: LoadCaseRows = {
      revision: window.revision,
      total: window.total,
      offset,
      rows: window.cases.map((k) => loadCaseRowValues(k, units)),
    };
    return Response.json(body, { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
