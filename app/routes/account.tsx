import { Form, href, Link } from "react-router";
import { requireUser } from "~/auth/auth.server";
import { listSessions } from "~/auth/session.server";
import { ROLE_LABELS } from "~/domain/permissions";
import { Button } from "~/components/ui/button";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/account";

export async function loader({ request }: Route.LoaderArgs) {
  const current = await requireUser(request);
  return { current, sessions: await listSessions(current.user.id) };
}

export default function AccountRoute({ loaderData }: Route.ComponentProps) {
  const { current } = loaderData;
  return (
    <>
      <PageHeader title="Your account" />
      <div className="grid gap-5 lg:grid-cols-2">
        <Panel title="You">
          <dl className="grid grid-cols-[9rem_1fr] gap-y-1.5 text-sm">
            <dt className="text-ink-muted">Name</dt>
            <dd>{current.user.name}</dd>
            <dt className="text-ink-muted">E-mail</dt>
            <dd>{current.user.email}</dd>
            <dt className="text-ink-muted">Organisation</dt>
            <dd>{current.organisation.name}</dd>
            <dt className="text-ink-muted">Roles</dt>
            <dd>{current.roles.map((r) => ROLE_LABELS[r]).join(", ") || "none"}</dd>
          </dl>
          <p className="mt-4 text-sm">
            <Link to={href("/account/tokens")}>API tokens</Link> — personal tokens for scripts that use the <Link to={href("/api")}>Spanwright API</Link>.
          </p>
        </Panel>
        <Panel title="Where you are signed in">
          <ul className="mb-4 space-y-2 text-sm">
            {loaderData.sessions.map((s) => (
              <li key={s.id}>
                <span className="font-semibold">{s.id === current.sessionId ? "This browser" : (s.userAgent?.slice(0, 60) ?? "Unknown browser")}</span>
                <span className="block text-xs text-ink-muted">
                  {s.method === "sso" ? "company sign-in" : "password"} · since {formatUtc(s.createdAt)} · last seen {formatUtc(s.lastSeenAt)}
                </span>
              </li>
            ))}
          </ul>
          <Form method="post" action={href("/logout")}>
            <input type="hidden" name="everywhere" value="1" />
            <Button type="submit" variant="danger">
              Sign out everywhere
            </Button>
          </Form>
        </Panel>
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Account · Spanwright" }];
}
