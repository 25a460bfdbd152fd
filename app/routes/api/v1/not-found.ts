import { apiError } from "~/utils/http.server";
import type { Route } from "./+types/not-found";

/** Any other path under /api/v1 answers JSON, as the rest of the API does, not the HTML error page. */
export async function loader({ request }: Route.LoaderArgs) {
  return noSuchEndpoint(request);
}

export async function action({ request }: Route.ActionArgs) {
  return noSuchEndpoint(request);
}

function noSuchEndpoint(request: Request): Response {
  return apiError(404, "not-found", `There is no API endpoint ${request.method} ${new URL(request.url).pathname}. See /api/v1/openapi.json.`);
}
