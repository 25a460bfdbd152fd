import { redirect } from "react-router";
import type { SsoErrorCode } from "~/domain/sso";
import { beginSso, ssoEnabled } from "~/auth/sso.server";
import { notFound, safeRedirectPath } from "~/utils/http.server";
import type { Route } from "./+types/sso";
import { SsoStartSchema } from "./login.schema";

/** Starts company sign-in: the e-mail goes to the identity provider as a login hint. */
export async function loader({ request }: Route.LoaderArgs) {
  if (!ssoEnabled()) notFound("Company sign-in");
  const url = new URL(request.url);
  const parsed = SsoStartSchema.safeParse(Object.fromEntries(url.searchParams));
  if (!parsed.success) {
    throw redirect(`/login?${new URLSearchParams({ "sso-error": "email" satisfies SsoErrorCode })}`);
  }
  const { url: target, setCookie } = await beginSso({
    kind: "sign-in",
    loginHint: parsed.data.email.toLowerCase(),
    redirectTo: safeRedirectPath(parsed.data.redirectTo, ""),
  });
  throw redirect(target, { headers: { "Set-Cookie": setCookie } });
}
