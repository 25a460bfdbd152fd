import { redirect } from "react-router";
import { requireUser } from "~/auth/auth.server";
import { landingPath } from "~/domain/permissions";
import { clearSsoFlowCookie, completeSsoSignIn, readSsoCallback, ssoEnabled } from "~/auth/sso.server";
import { abandonSsoSignature, completeSsoSignature } from "~/auth/signing.server";
import { notFound, safeRedirectPath } from "~/utils/http.server";
import type { Route } from "./+types/sso-callback";

/**
 * The identity provider's answer: a company sign-in opens a session; a signature's round trip
 * completes that one signature (signing.server.ts) and goes back to the page it was asked from.
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  if (!ssoEnabled()) notFound("Company sign-in");
  const read = await readSsoCallback(request);
  const headers = new Headers({ "Set-Cookie": await clearSsoFlowCookie() });
  if (read.flow?.kind === "signature") {
    const current = await requireUser({ request, context });
    const { page, outcome } = read.ok ? await completeSsoSignature(current, read.flow, read.identity) : await abandonSsoSignature(current, read.flow, read.code);
    throw redirect(`${page}?${new URLSearchParams({ signature: outcome })}`, { headers });
  }
  if (!read.ok) throw redirect(`/login?${new URLSearchParams({ "sso-error": read.code })}`, { headers });
  const outcome = await completeSsoSignIn(read.identity, read.flow as typeof read.flow & { kind: "sign-in" }, request.headers.get("User-Agent"));
  if (!outcome.ok) throw redirect(`/login?${new URLSearchParams({ "sso-error": outcome.code })}`, { headers });
  headers.append("Set-Cookie", outcome.setCookie);
  throw redirect(safeRedirectPath(outcome.redirectTo || undefined, landingPath(outcome.current.roles)), { headers });
}
