import { useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import { createApiToken, listApiTokens, revokeApiToken } from "~/auth/api-auth.server";
import { requireUser } from "~/auth/auth.server";
import { API_TOKEN_SCOPE_LABELS } from "~/domain/permissions";
import { API_TOKEN_SCOPES } from "~/domain/vocabulary";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { Button } from "~/components/ui/button";
import { Alert, EmptyState, PageHeader, Panel } from "~/components/ui/page-header";
import { formatUtc } from "~/utils/format";
import { accepted, answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/account-tokens";
import { CreateTokenSchema, TokenActionSchema } from "./account-tokens.schema";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requireUser({ request, context });
  return { organisation: current.organisation.name, tokens: await listApiTokens(current.user.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const current = await requireUser({ request, context });
  const parsed = await parseBody(request, TokenActionSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const input = parsed.value;
  return answer(async () => {
    if (input.intent === "create") {
      // The token belongs to the organisation the person is working in now.
      const { token } = await createApiToken({ userId: current.user.id, organisationId: current.organisation.id, name: input.name, scope: input.scope, actor: current.user });
      return accepted(`Token “${input.name}” created.`, { created: { name: input.name, token, scope: input.scope } });
    }
    await revokeApiToken({ tokenId: input.tokenId, userId: current.user.id, actor: current.user });
    return accepted("Token revoked.", { created: null });
  });
}

export default function AccountTokensRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="API tokens"
        description={
          <>
            Personal tokens let scripts and other programs use the <Link to="/api">Spanwright API</Link> as you, in {loaderData.organisation}, with your roles. A
            read-only token can never change a record, whatever your roles allow; give a token write access only when its script imports cases. Treat a token
            like a password; revoke it when it is no longer needed.
          </>
        }
      />
      <div className="grid gap-5 xl:grid-cols-[1fr_22rem]">
        <TokenList tokens={loaderData.tokens} />
        <div className="space-y-5">
          {actionData?.ok && actionData.created ? <NewToken {...actionData.created} /> : null}
          <CreateTokenForm serverErrors={actionData?.fieldErrors} createdToken={actionData?.ok ? actionData.created?.token : undefined} />
        </div>
      </div>
    </>
  );
}

function TokenList({ tokens }: { tokens: Route.ComponentProps["loaderData"]["tokens"] }) {
  const busy = useNavigation().state === "submitting";
  if (tokens.length === 0) return <EmptyState title="No tokens yet">Create one with the form to call the API from a script.</EmptyState>;
  return (
    <div className="overflow-x-auto rounded border border-line bg-surface">
      <table className="w-full text-left text-sm">
        <thead className="border-b border-line bg-canvas text-xs uppercase tracking-wide text-ink-muted">
          <tr>
            <th className="px-3 py-2">Name</th>
            <th className="px-3 py-2">Starts with</th>
            <th className="px-3 py-2">Scope</th>
            <th className="px-3 py-2">Created</th>
            <th className="px-3 py-2">Last used</th>
            <th className="px-3 py-2">State</th>
            <th className="px-3 py-2" />
          </tr>
        </thead>
        <tbody>
          {tokens.map((t) => (
            <tr key={t.id} className="border-b border-line last:border-0">
              <td className="px-3 py-2 font-semibold">{t.name}</td>
              <td className="px-3 py-2 font-mono text-xs">{t.prefix}…</td>
              <td className="px-3 py-2" title={API_TOKEN_SCOPE_LABELS[t.scope]}>
                {t.scope === "read" ? "read only" : "read and write"}
              </td>
              <td className="px-3 py-2">{formatUtc(t.createdAt)}</td>
              <td className="px-3 py-2">{t.lastUsedAt ? formatUtc(t.lastUsedAt) : "never"}</td>
              <td className="px-3 py-2">{t.revokedAt ? `revoked ${formatUtc(t.revokedAt)}` : `active · ${t.organisationName}`}</td>
              <td className="px-3 py-2 text-right">
                {t.revokedAt ? null : (
                  <Form method="post">
                    <input type="hidden" name="intent" value="revoke" />
                    <input type="hidden" name="tokenId" value={t.id} />
                    <Button type="submit" variant="danger" disabled={busy} aria-label={`Revoke token ${t.name}`}>
                      Revoke
                    </Button>
                  </Form>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function NewToken({ name, token, scope }: { name: string; token: string; scope: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <Panel title="New token">
      <Alert tone="warn">Copy the token “{name}” ({scope === "read" ? "read only" : "read and write"}) now: it is shown only once and cannot be shown again.</Alert>
      <output aria-label="New API token" className="mt-3 block break-all rounded border border-line-strong bg-canvas px-2.5 py-1.5 font-mono text-sm">
        {token}
      </output>
      <Button
        type="button"
        variant="secondary"
        className="mt-3"
        onClick={() => {
          void navigator.clipboard.writeText(token).then(() => setCopied(true));
        }}
      >
        {copied ? "Copied" : "Copy token"}
      </Button>
    </Panel>
  );
}

/**
 * One radio button of a registered field: its own value, checked when it is the saved one. The
 * registered field's defaultValue (the saved value, for text inputs) must not reach a radio.
 */
function radio<F extends object>(field: F, value: string, saved: string) {
  const { defaultValue: _saved, ...rest } = field as F & { defaultValue?: unknown };
  return { ...rest, value, defaultChecked: value === saved };
}

function CreateTokenForm({ serverErrors, createdToken }: { serverErrors?: Record<string, string[] | undefined>; createdToken?: string }) {
  // A token just created empties the form for the next one.
  const { form, onSubmit } = useZodForm(CreateTokenSchema, { intent: "create", name: "", scope: "read" }, createdToken);
  const busy = useNavigation().state === "submitting";
  return (
    <Panel title="Create a token">
      <Form method="post" onSubmit={onSubmit} noValidate>
        {serverErrors?.form ? (
          <div className="mb-3">
            <Alert>{serverErrors.form.join(" ")}</Alert>
          </div>
        ) : null}
        <input type="hidden" {...form.register("intent")} />
        <TextField label="Name" hint="What will use it, e.g. “nightly loads export”" {...form.register("name")} errors={errorsFor(form, serverErrors, "name")} />
        <fieldset className="mb-3">
          <legend className="text-sm font-semibold">What it may do</legend>
          {API_TOKEN_SCOPES.map((scope) => (
            <label key={scope} className="mt-1 flex items-start gap-2 text-sm">
              <input type="radio" className="mt-1" {...radio(form.register("scope"), scope, "read")} />
              <span>{API_TOKEN_SCOPE_LABELS[scope]}</span>
            </label>
          ))}
          {errorsFor(form, serverErrors, "scope").filter(Boolean).map((m) => (
            <p key={m} className="mt-1 text-xs font-semibold text-danger">
              {m}
            </p>
          ))}
        </fieldset>
        <Button type="submit" disabled={busy}>
          Create token
        </Button>
      </Form>
    </Panel>
  );
}

export function meta() {
  return [{ title: "API tokens · Spanwright" }];
}
