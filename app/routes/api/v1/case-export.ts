import { href } from "react-router";
import { requireApiUser } from "~/auth/api-auth.server";
import { exchangeDocumentText } from "~/exchange";
import { exportCaseDocuments } from "~/services/analysis.server";
import { getCase } from "~/services/programmes.server";
import type { Route } from "./+types/case-export";
import { apiHandler, methodNotAllowed, notFoundJson } from "./respond.server";

/**
 * GET /api/v1/cases/:caseId/export — the case as a `spanwright.case/1` document, as the command
 * line reads it; 409 naming the steps still to save when planform, sections or envelope is missing.
 * `?part=sections` gives its richer section data as `spanwright.sections/1` instead (the command line's
 * `--sections`; 404 when the case has none), so the pair reproduces the application's results.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "case:read");
    const part = new URL(request.url).searchParams.get("part") ?? "case";
    if (part !== "case" && part !== "sections") return Response.json({ error: "bad-request", message: `part must be "case" or "sections" (got "${part}").` }, { status: 400 });
    const found = await getCase(current.organisation.id, params.caseId);
    if (!found) return notFoundJson("The case");
    const { file, sections } = await exportCaseDocuments(found.case.id, found.case.title);
    // The same bytes an issued report attaches for an unchanged case (exchangeDocumentText).
    const json = (doc: unknown, name: string, extra: Record<string, string> = {}) =>
      new Response(exchangeDocumentText(doc), { headers: { "Content-Type": "application/json", "Content-Disposition": `inline; filename="${filenameOf(found.case.reference)}.${name}.json"`, ...extra } });
    if (part === "sections") {
      if (!sections) return notFoundJson("Richer section data of this case");
      return json(sections, "sections");
    }
    return json(file, "case", sections ? { Link: `<${href("/api/v1/cases/:caseId/export", { caseId: found.case.id })}?part=sections>; rel="related"; type="application/json"` } : {});
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}

/** A reference as a safe file name (references may hold "/"). */
export function filenameOf(reference: string): string {
  return reference.replace(/[^A-Za-z0-9._-]+/g, "_");
}
