import { redirect } from "react-router";
import { readSession, clearSessionCookie, deleteAllSessions, deleteSession } from "~/auth/session.server";
import { db } from "~/db/client.server";
import { writeAudit } from "~/db/audit.server";
import type { Route } from "./+types/logout";

/** Sign-out is a POST (a link could be triggered by another site); `everywhere=1` ends every session of the person. */
export async function action({ request }: Route.ActionArgs) {
  const state = await readSession(request);
  const form = await request.formData().catch(() => new FormData());
  if (state.status === "valid") {
    const { current } = state;
    const everywhere = form.get("everywhere") === "1";
    if (everywhere) await deleteAllSessions(current.user.id);
    else await deleteSession(current.sessionId);
    await db.transaction((tx) =>
      writeAudit(tx, {
        organisationId: current.organisation.id,
        actor: { id: current.user.id, email: current.user.email },
        action: everywhere ? "auth.sign-out.everywhere" : "auth.sign-out",
        entityType: "user",
        entityId: current.user.id,
      }),
    );
  }
  throw redirect("/login?reason=signed-out", { headers: { "Set-Cookie": await clearSessionCookie() } });
}

export async function loader() {
  throw redirect("/");
}
