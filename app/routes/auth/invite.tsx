import { data, Form, redirect, useNavigation } from "react-router";
import { completeSignIn } from "~/auth/auth.server";
import { joinByInvitation } from "~/auth/invitation.server";
import { landingPath } from "~/domain/permissions";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { Button } from "~/components/ui/button";
import { Alert } from "~/components/ui/page-header";
import { findInvitation } from "~/services/organisation.server";
import { answer, clientAddress, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/invite";
import { AcceptExistingSchema, AcceptNewSchema } from "./invite.schema";

export async function loader({ params }: Route.LoaderArgs) {
  const found = await findInvitation(params.token);
  if (!found) throw data({ message: "This invitation link is not valid any more: it was used, withdrawn, or it expired. Ask for a new one." }, { status: 404 });
  return { email: found.invitation.email, organisationName: found.organisationName, roles: found.invitation.roles, accountExists: found.accountExists };
}

export async function action({ request, params }: Route.ActionArgs) {
  const found = await findInvitation(params.token);
  if (!found) throw data({ message: "This invitation link is not valid any more." }, { status: 404 });
  const parsed = await parseBody(request, found.accountExists ? AcceptExistingSchema : AcceptNewSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const input = parsed.value as { name?: string; password: string };
  return answer(async () => {
    const joined = await joinByInvitation({ token: params.token, name: input.name, password: input.password, address: clientAddress(request) });
    const signedIn = await completeSignIn({ id: joined.userId, email: joined.email }, joined, "password", request.headers.get("User-Agent"));
    throw redirect(landingPath(joined.roles), { headers: { "Set-Cookie": signedIn.setCookie } });
  });
}

export default function InviteRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-md rounded border border-line bg-surface p-6 shadow-sm">
        <p className="text-sm text-ink-muted">Spanwright</p>
        <h1 className="mb-1 text-lg font-semibold">Join {loaderData.organisationName}</h1>
        <p className="mb-4 text-sm text-ink-muted">
          As {loaderData.roles.join(", ")}, with the e-mail address {loaderData.email}.
        </p>
        {actionData?.fieldErrors?.form || actionData?.fieldErrors?.token ? (
          <div className="mb-3"><Alert>{[...(actionData.fieldErrors.form ?? []), ...(actionData.fieldErrors.token ?? [])].join(" ")}</Alert></div>
        ) : null}
        {loaderData.accountExists ? <ExistingAccount serverErrors={actionData?.fieldErrors} /> : <NewAccount serverErrors={actionData?.fieldErrors} />}
      </div>
    </main>
  );
}

function NewAccount({ serverErrors }: { serverErrors?: Record<string, string[] | undefined> }) {
  const { form, onSubmit } = useZodForm(AcceptNewSchema, { name: "", password: "", confirm: "" });
  const busy = useNavigation().state === "submitting";
  return (
    <Form method="post" onSubmit={onSubmit} noValidate>
      <TextField label="Full name" autoComplete="name" {...form.register("name")} errors={errorsFor(form, serverErrors, "name")} />
      <TextField label="Password" type="password" autoComplete="new-password" hint="At least 12 characters" {...form.register("password")} errors={errorsFor(form, serverErrors, "password")} />
      <TextField label="Password again" type="password" autoComplete="new-password" {...form.register("confirm")} errors={errorsFor(form, serverErrors, "confirm")} />
      <Button type="submit" disabled={busy} className="w-full">
        Create account and join
      </Button>
    </Form>
  );
}

function ExistingAccount({ serverErrors }: { serverErrors?: Record<string, string[] | undefined> }) {
  const { form, onSubmit } = useZodForm(AcceptExistingSchema, { password: "" });
  const busy = useNavigation().state === "submitting";
  return (
    <Form method="post" onSubmit={onSubmit} noValidate>
      <p className="mb-3 text-sm">You already have a Spanwright account. Confirm it with your password.</p>
      <TextField label="Password" type="password" autoComplete="current-password" {...form.register("password")} errors={errorsFor(form, serverErrors, "password")} />
      <Button type="submit" disabled={busy} className="w-full">
        Join
      </Button>
    </Form>
  );
}

export function meta() {
  return [{ title: "Invitation · Spanwright" }];
}
