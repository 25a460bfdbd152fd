import { requireApiUser } from "~/auth/api-auth.server";
import { analyze } from "~/services/analysis.server";
import type { Route } from "./+types/analyze";
import { apiHandler, methodNotAllowed, readJsonBody } from "./respond.server";

/**
 * POST /api/v1/analyze — body `spanwright.case/1` (or `{ case, sections }` with the richer section data
 * of `spanwright.sections/1` beside it), answer `spanwright.result/1`, exactly as the command line computes
 * it. Nothing is stored. A bad document answers 422 naming every field.
 */
export async function action({ request }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") return methodNotAllowed(request, "POST");
    await requireApiUser(request, "case:read");
    return Response.json(analyze(await readJsonBody(request)));
  });
}

export async function loader({ request }: Route.LoaderArgs) {
  return methodNotAllowed(request, "POST");
}
