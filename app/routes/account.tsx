import { Form, href, Link, useNavigation } from "react-router";
import { changeOwnPassword, requireUser } from "~/auth/auth.server";
import { listSessions } from "~/auth/session.server";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { ROLE_LABELS } from "~/domain/permissions";
import { PASSWORD_MIN_LENGTH } from "~/domain/password-policy";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { formatUtc } from "~/utils/format";
import { accepted, answer, clientAddress, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/account";
import { ChangePasswordSchema } from "./account.schema";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requireUser({ request, context });
  return { current, sessions: await listSessions(current.user.id) };
}

/** Changes the person's own password; every other session of theirs ends. */
export async function action({ request, context }: Route.ActionArgs) {
  const current = await requireUser({ request, context });
  const parsed = await parseBody(request, ChangePasswordSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  return answer(async () => {
    const ended = await changeOwnPassword({ current, currentPassword: parsed.value.current, newPassword: parsed.value.password, address: clientAddress(request) });
    return accepted(`Password changed. ${ended === 0 ? "You were signed in nowhere else." : `Signed out of ${ended} other session${ended === 1 ? "" : "s"}.`}`);
  });
}

export default function AccountRoute({ loaderData, actionData }: Route.ComponentProps) {
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
        <ChangePasswordPanel answer={actionData} />
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

function ChangePasswordPanel({ answer }: { answer: Route.ComponentProps["actionData"] }) {
  const { form, onSubmit } = useZodForm(ChangePasswordSchema, { current: "", password: "", confirm: "" }, answer?.ok ? answer.message : undefined);
  const busy = useNavigation().state === "submitting";
  const serverErrors = answer && !answer.ok ? answer.fieldErrors : undefined;
  return (
    <Panel title="Password">
      {answer?.message ? <div className="mb-3"><Alert tone={answer.ok ? "info" : "danger"}>{answer.message}</Alert></div> : null}
      <Form method="post" onSubmit={onSubmit} noValidate className="max-w-sm">
        <TextField label="Current password" type="password" autoComplete="current-password" {...form.register("current")} errors={errorsFor(form, serverErrors, "current")} />
        <TextField label="New password" type="password" autoComplete="new-password" hint={`At least ${PASSWORD_MIN_LENGTH} characters`} {...form.register("password")} errors={errorsFor(form, serverErrors, "password")} />
        <TextField label="New password again" type="password" autoComplete="new-password" {...form.register("confirm")} errors={errorsFor(form, serverErrors, "confirm")} />
        <p className="mb-3 text-xs text-ink-muted">Every other session of yours ends: wherever you are signed in elsewhere, you sign in again with the new password.</p>
        <Button type="submit" disabled={busy}>
          Change password
        </Button>
      </Form>
    </Panel>
  );
}

export function meta() {
  return [{ title: "Account · Spanwright" }];
}
