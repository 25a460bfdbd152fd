import { Form, useNavigation } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { ROLE_LABELS } from "~/domain/permissions";
import { ROLES } from "~/domain/vocabulary";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { inviteMember, listMembers, listOpenInvitations, revokeInvitation, setMemberRoles } from "~/services/organisation.server";
import { formatUtc } from "~/utils/format";
import { accepted, answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/members";
import { InviteSchema, MembersActionSchema } from "./members.schema";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "org:admin");
  const [members, invitations] = await Promise.all([listMembers(current.organisation.id), listOpenInvitations(current.organisation.id)]);
  return { members, invitations, selfId: current.user.id };
}

export async function action({ request, context }: Route.ActionArgs) {
  const current = await requirePermission({ request, context }, "org:admin");
  const parsed = await parseBody(request, MembersActionSchema, { arrays: ["roles"] });
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const input = parsed.value;
  const base = { organisationId: current.organisation.id, actor: current.user };
  return answer(
    async () => {
      if (input.intent === "invite") {
        await inviteMember({ ...base, email: input.email, roles: input.roles });
        return accepted(`Invitation sent to ${input.email}.`);
      }
      if (input.intent === "set-roles") {
        await setMemberRoles({ ...base, userId: input.userId, roles: input.roles });
        return accepted("Roles saved.");
      }
      await revokeInvitation({ ...base, invitationId: input.invitationId });
      return accepted("Invitation withdrawn.");
    },
    { intent: input.intent },
  );
}

export default function MembersRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Members" description="Who belongs to your organisation and in which roles. A person may hold several roles; nobody may check their own work." />
      {actionData?.ok && actionData.message ? <div className="mb-4"><Alert tone="info">{actionData.message}</Alert></div> : null}
      {actionData?.fieldErrors.form || (actionData?.intent && actionData.intent !== "invite" && Object.keys(actionData.fieldErrors).length) ? (
        <div className="mb-4"><Alert>{Object.values(actionData.fieldErrors).flat().join(" ")}</Alert></div>
      ) : null}
      <div className="grid gap-5 xl:grid-cols-[1fr_22rem]">
        <ListTable columns={[{ label: "Name" }, { label: "E-mail" }, { label: "Roles" }, { label: "Last sign-in" }]}>
          {loaderData.members.map((m) => (
            <tr key={m.userId} className="border-b border-line align-top last:border-0">
              <td className="px-3 py-2 font-semibold">{m.name}</td>
              <td className="px-3 py-2">{m.email}</td>
              <td className="px-3 py-2">
                <Form method="post" className="flex flex-wrap items-center gap-3" aria-label={`Roles of ${m.name}`}>
                  <input type="hidden" name="intent" value="set-roles" />
                  <input type="hidden" name="userId" value={m.userId} />
                  {ROLES.map((r) => (
                    <label key={r} className="flex items-center gap-1">
                      <input type="checkbox" name="roles" value={r} defaultChecked={m.roles.includes(r)} />
                      {ROLE_LABELS[r]}
                    </label>
                  ))}
                  <Button type="submit" variant="secondary" className="py-0.5">
                    Save
                  </Button>
                </Form>
              </td>
              <td className="px-3 py-2 text-ink-muted">{formatUtc(m.lastSignInAt)}</td>
            </tr>
          ))}
        </ListTable>
        <div className="space-y-5">
          <InviteForm serverErrors={actionData && (actionData.intent ?? "invite") === "invite" ? actionData.fieldErrors : undefined} />
          <Panel title="Open invitations">
            {loaderData.invitations.length === 0 ? (
              <p className="text-sm text-ink-muted">None.</p>
            ) : (
              <ul className="space-y-2 text-sm">
                {loaderData.invitations.map((i) => (
                  <li key={i.id} className="flex items-center justify-between gap-2">
                    <span>
                      {i.email}
                      <span className="block text-xs text-ink-muted">
                        {i.roles.join(", ")} · expires {formatUtc(i.expiresAt)}
                      </span>
                    </span>
                    <Form method="post">
                      <input type="hidden" name="intent" value="revoke" />
                      <input type="hidden" name="invitationId" value={i.id} />
                      <Button type="submit" variant="danger" className="py-0.5">
                        Withdraw
                      </Button>
                    </Form>
                  </li>
                ))}
              </ul>
            )}
          </Panel>
        </div>
      </div>
    </>
  );
}

function InviteForm({ serverErrors }: { serverErrors?: Record<string, string[] | undefined> }) {
  const { form, onSubmit } = useZodForm(InviteSchema, { intent: "invite", email: "", roles: ["engineer"] });
  const busy = useNavigation().state === "submitting";
  const roleErrors = errorsFor(form, serverErrors, "roles").filter(Boolean);
  return (
    <Panel title="Invite by e-mail">
      <Form method="post" onSubmit={onSubmit} noValidate>
        <input type="hidden" {...form.register("intent")} />
        <TextField label="E-mail" type="email" {...form.register("email")} errors={errorsFor(form, serverErrors, "email")} />
        <fieldset className="mb-3">
          <legend className="text-sm font-semibold">Roles</legend>
          <div className="mt-1 grid grid-cols-2 gap-1 text-sm">
            {ROLES.map((r) => (
              <label key={r} className="flex items-center gap-1.5">
                <input type="checkbox" value={r} defaultChecked={r === "engineer"} {...form.register("roles")} />
                {ROLE_LABELS[r]}
              </label>
            ))}
          </div>
          {roleErrors.map((m) => (
            <p key={m} className="mt-1 text-xs font-semibold text-danger">
              {m}
            </p>
          ))}
        </fieldset>
        <Button type="submit" disabled={busy}>
          Send invitation
        </Button>
      </Form>
    </Panel>
  );
}

export function meta() {
  return [{ title: "Members · Spanwright" }];
}
