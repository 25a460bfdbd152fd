import { redirect } from "react-router";
import { landingPath } from "~/domain/permissions";
import { clearSsoFlowCookie, completeSso, ssoEnabled } from "~/auth/sso.server";
import { notFound, safeRedirectPath } from "~/utils/http.server";
import type { Route } from "./+types/sso-callback";

export async function loader({ request }: Route.LoaderArgs) {
  if (!ssoEnabled()) notFound("Company sign-in");
  const outcome = await completeSso(request);
  const headers = new Headers({ "Set-Cookie": await clearSsoFlowCookie() });
  if (!outcome.ok) {
    throw redirect(`/login?${new URLSearchParams({ "sso-error": outcome.code })}`, { headers });
  }
  headers.append("Set-Cookie", outcome.setCookie);
  const target = "redirectTo" in outcome ? outcome.redirectTo : undefined;
  throw redirect(safeRedirectPath(target || undefined, landingPath(outcome.current.roles)), { headers });
}
