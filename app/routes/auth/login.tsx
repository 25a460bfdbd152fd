import { Form, redirect, useNavigation } from "react-router";
import { landingPath } from "~/domain/permissions";
import { ssoErrorMessage } from "~/domain/sso";
import { getOptionalUser, signInWithPassword } from "~/auth/auth.server";
import { ssoEnabled } from "~/auth/sso.server";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { TextField } from "~/components/forms/field";
import { Button } from "~/components/ui/button";
import { Alert } from "~/components/ui/page-header";
import { env } from "~/utils/env.server";
import { clientAddress, parseBody, refused, safeRedirectPath } from "~/utils/http.server";
import type { Route } from "./+types/login";
import { LoginSchema } from "./login.schema";

const REASONS: Record<string, string> = {
  session: "Your session has ended or is not valid any more. Sign in again.",
  "signed-out": "You have signed out.",
};

export async function loader({ request, context }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const current = await getOptionalUser({ request, context });
  if (current) throw redirect(safeRedirectPath(url.searchParams.get("redirectTo"), landingPath(current.roles)));
  const reason = url.searchParams.get("reason");
  const ssoError = url.searchParams.get("sso-error");
  return {
    redirectTo: safeRedirectPath(url.searchParams.get("redirectTo"), ""),
    notice: reason ? (REASONS[reason] ?? null) : null,
    // Only our own fixed messages: the link that brought the person here may have been written by anyone.
    ssoError: ssoErrorMessage(ssoError),
    sso: ssoEnabled() ? { label: env().OIDC_LABEL } : null,
  };
}

export async function action({ request }: Route.ActionArgs) {
  const parsed = await parseBody(request, LoginSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const result = await signInWithPassword({
    email: parsed.value.email,
    password: parsed.value.password,
    address: clientAddress(request),
    userAgent: request.headers.get("User-Agent"),
    cookieHeader: request.headers.get("Cookie"),
  });
  if (!result.ok) return refused({}, { status: result.status, message: result.message, headers: result.retryAfterSeconds ? { "Retry-After": String(result.retryAfterSeconds) } : undefined });
  const headers = new Headers({ "Set-Cookie": result.setCookie });
  if (result.deviceCookie) headers.append("Set-Cookie", result.deviceCookie);
  throw redirect(safeRedirectPath(parsed.value.redirectTo, landingPath(result.current.roles)), { headers });
}

export default function LoginRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { form, onSubmit } = useZodForm(LoginSchema, { email: "", password: "", redirectTo: loaderData.redirectTo });
  const navigation = useNavigation();
  const busy = navigation.state !== "idle" && navigation.formAction === "/login";
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-md">
        <p className="mb-1 text-2xl font-semibold tracking-tight">Spanwright</p>
        <p className="mb-6 text-sm text-ink-muted">Wing loads casework: distributions, loads, checks and signed reports.</p>
        <div className="rounded border border-line bg-surface p-6 shadow-sm">
          <h1 className="mb-4 text-lg font-semibold">Sign in</h1>
          {loaderData.notice ? <div className="mb-4"><Alert tone="info">{loaderData.notice}</Alert></div> : null}
          {loaderData.ssoError ? <div className="mb-4"><Alert>{loaderData.ssoError}</Alert></div> : null}
          {actionData?.message ? <div className="mb-4"><Alert>{actionData.message}</Alert></div> : null}
          <Form method="post" action="/login" onSubmit={onSubmit} noValidate>
            <input type="hidden" {...form.register("redirectTo")} />
            <TextField label="E-mail" type="email" autoComplete="username" autoFocus {...form.register("email")} errors={errorsFor(form, actionData?.fieldErrors, "email")} />
            <TextField label="Password" type="password" autoComplete="current-password" {...form.register("password")} errors={errorsFor(form, actionData?.fieldErrors, "password")} />
            <Button type="submit" className="mt-2 w-full" disabled={busy}>
              {busy ? "Signing in…" : "Sign in"}
            </Button>
          </Form>
          {loaderData.sso ? (
            <div className="mt-6 border-t border-line pt-5">
              <h2 className="mb-2 text-sm font-semibold">{loaderData.sso.label}</h2>
              <Form method="get" action="/auth/sso">
                <input type="hidden" name="redirectTo" value={loaderData.redirectTo} />
                <TextField label="Company e-mail" name="email" type="email" id="sso-email" autoComplete="email" required />
                <Button type="submit" variant="secondary" className="w-full">
                  Continue with company sign-in
                </Button>
              </Form>
            </div>
          ) : null}
        </div>
        <p className="mt-6 text-xs text-ink-faint">
          Spanwright supports analysis that the certifying authority accepts; it does not replace it. The applicable regulations and licensed practice govern.
        </p>
      </div>
    </main>
  );
}

/** A refused sign-in says when to try again (Retry-After) in the page's own answer. */
export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
}

export function meta() {
  return [{ title: "Sign in · Spanwright" }];
}
