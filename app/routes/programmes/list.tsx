import { Form, href, Link, useNavigation } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { hasPermission } from "~/domain/permissions";
import { TextAreaField, TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { Button } from "~/components/ui/button";
import { EmptyState, PageHeader, Panel } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { createProgramme, listProgrammes } from "~/services/programmes.server";
import { accepted, answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/list";
import { NewProgrammeSchema } from "./list.schema";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "programme:read");
  return { programmes: await listProgrammes(current.organisation.id), canManage: hasPermission(current.roles, "programme:manage") };
}

export async function action({ request, context }: Route.ActionArgs) {
  const current = await requirePermission({ request, context }, "programme:manage");
  const parsed = await parseBody(request, NewProgrammeSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const input = parsed.value;
  return answer(async () => {
    const created = await createProgramme({ organisationId: current.organisation.id, actor: current.user, ...input });
    return accepted(`Programme ${created.code} created.`);
  });
}

export default function ProgrammesRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Programmes" description="Aircraft type programmes of your organisation. Each holds the loads case files of its certification." />
      <div className="grid gap-5 xl:grid-cols-[1fr_22rem]">
        {loaderData.programmes.length === 0 ? (
          <EmptyState title="No programmes yet">{loaderData.canManage ? "Create the first one with the form." : "An administrator creates programmes."}</EmptyState>
        ) : (
          <ListTable columns={[{ label: "Code" }, { label: "Name" }, { label: "Aircraft" }, { label: "Cases", numeric: true }]}>
            {loaderData.programmes.map((p) => (
              <tr key={p.id} className="border-b border-line last:border-0">
                <td className="px-3 py-2 font-semibold">
                  <Link to={href("/programmes/:programmeId", { programmeId: p.id })}>{p.code}</Link>
                </td>
                <td className="px-3 py-2">{p.name}</td>
                <td className="px-3 py-2">{p.aircraft}</td>
                <td className="px-3 py-2 text-right">{p.caseCount}</td>
              </tr>
            ))}
          </ListTable>
        )}
        {loaderData.canManage ? <NewProgrammeForm serverErrors={actionData?.fieldErrors} created={actionData?.ok} /> : null}
      </div>
    </>
  );
}

function NewProgrammeForm({ serverErrors, created }: { serverErrors?: Record<string, string[] | undefined>; created?: boolean }) {
  const { form, onSubmit } = useZodForm(NewProgrammeSchema, { code: "", name: "", aircraft: "", description: "" });
  const busy = useNavigation().state === "submitting";
  return (
    <Panel title="New programme">
      <Form method="post" onSubmit={onSubmit} noValidate>
        {created ? <p role="status" className="mb-3 text-sm text-status-approved">Programme created.</p> : null}
        <TextField label="Code" {...form.register("code")} errors={errorsFor(form, serverErrors, "code")} />
        <TextField label="Name" {...form.register("name")} errors={errorsFor(form, serverErrors, "name")} />
        <TextField label="Aircraft type" {...form.register("aircraft")} errors={errorsFor(form, serverErrors, "aircraft")} />
        <TextAreaField label="Description" {...form.register("description")} errors={errorsFor(form, serverErrors, "description")} />
        <Button type="submit" disabled={busy}>
          Create programme
        </Button>
      </Form>
    </Panel>
  );
}

export function meta() {
  return [{ title: "Programmes · Spanwright" }];
}
