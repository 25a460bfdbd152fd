import { requireApiUser } from "~/auth/api-auth.server";
import { isEngineError } from "~/engine";
import { parseCase, runCase } from "~/exchange";
import type { Route } from "./+types/analyze";
import { apiHandler, invalidCase, methodNotAllowed, readJsonBody } from "./respond.server";

/**
 * POST /api/v1/analyze — body `spanwright.case/1`, answer `spanwright.result/1`, exactly as the
 * command line computes it. Nothing is stored. A bad document answers 422 naming every field.
 */
export async function action({ request }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") return methodNotAllowed(request, "POST");
    await requireApiUser(request, "case:read");
    const parsed = parseCase(await readJsonBody(request));
    if (!parsed.ok) return invalidCase(parsed.problems);
    try {
      return Response.json(runCase(parsed.value));
    } catch (error) {
      if (isEngineError(error)) return invalidCase([{ path: error.field ?? "(document)", message: error.message }]);
      throw error;
    }
  });
}

export async function loader({ request }: Route.LoaderArgs) {
  return methodNotAllowed(request, "POST");
}
