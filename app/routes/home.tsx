import { redirect } from "react-router";
import { landingPath } from "~/domain/permissions";
import { getOptionalUser } from "~/auth/auth.server";
import type { Route } from "./+types/home";

/** The start page is the page made for the person's role, or the sign-in page. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await getOptionalUser({ request, context });
  throw redirect(current ? landingPath(current.roles) : "/login");
}
