import { requireCase } from "~/auth/case-access.server";
import { buildCaseFile, buildSectionsFile, caseInputs } from "~/services/analysis.server";
import { distributionViewForPage } from "~/services/distribution.server";
import type { Route } from "./+types/case-distribution";
import { DomainError } from "~/domain/errors";
import { apiRefusal } from "~/utils/http.server";

/**
 * The distribution of one case of a case file, as JSON for the distribution page: choosing another
 * case re-computes the plots with a fetcher, without a full navigation.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:read");
  const id = new URL(request.url).searchParams.get("case") ?? "";
  try {
    const inputs = caseInputs(await readSteps());
    const file = buildCaseFile(c.title, inputs, "envelope");
    if (!file.cases.some((k) => k.id === id)) return apiRefusal(new DomainError(`Case file ${c.reference} has no load case "${id}".`, { kind: "not-found" }));
    return Response.json(distributionViewForPage(file, id, inputs.basis?.units ?? "SI", buildSectionsFile(inputs)), { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DomainError) return apiRefusal(error);
    throw error;
  }
}
