import { redirect } from "react-router";
import { signOut } from "~/auth/auth.server";
import type { Route } from "./+types/logout";

export async function loader() {
  throw redirect("/");
}

/** Sign-out is a POST (a link could be triggered by another site); `everywhere=1` ends every session of the person. */
export async function action({ request, context }: Route.ActionArgs) {
  const form = await request.formData().catch(() => new FormData());
  const setCookie = await signOut({ request, context }, { everywhere: form.get("everywhere") === "1" });
  throw redirect("/login?reason=signed-out", { headers: { "Set-Cookie": setCookie } });
}
