import { Form, href, redirect, useNavigation } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { SelectField, TextAreaField, TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { Button } from "~/components/ui/button";
import { Alert, EmptyState, PageHeader } from "~/components/ui/page-header";
import { createCase, listProgrammes } from "~/services/programmes.server";
import { answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/new";
import { NewCaseSchema } from "./new.schema";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "case:create");
  const url = new URL(request.url);
  return { programmes: await listProgrammes(current.organisation.id), programmeId: url.searchParams.get("programme") ?? "" };
}

export async function action({ request, context }: Route.ActionArgs) {
  const current = await requirePermission({ request, context }, "case:create");
  const parsed = await parseBody(request, NewCaseSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const input = parsed.value;
  return answer(async () => {
    const row = await createCase({ organisationId: current.organisation.id, actor: current.user, ...input });
    throw redirect(href("/cases/:caseId", { caseId: row.id }));
  });
}

export default function NewCaseRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { form, onSubmit } = useZodForm(NewCaseSchema, { programmeId: loaderData.programmeId || loaderData.programmes[0]?.id || "", reference: "", title: "", description: "" });
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors;
  if (loaderData.programmes.length === 0) {
    return (
      <>
        <PageHeader title="New case" />
        <EmptyState title="No programme yet">An administrator creates the aircraft programme first; cases belong to a programme.</EmptyState>
      </>
    );
  }
  return (
    <>
      <PageHeader title="New case" description="A case file holds the wing-loads part of one certification case. Its steps start with the certification basis." />
      <Form method="post" onSubmit={onSubmit} noValidate className="max-w-xl rounded border border-line bg-surface p-5">
        {server?.form ? <div className="mb-3"><Alert>{server.form.join(" ")}</Alert></div> : null}
        <SelectField label="Programme" {...form.register("programmeId")} errors={errorsFor(form, server, "programmeId")}>
          {loaderData.programmes.map((p) => (
            <option key={p.id} value={p.id}>
              {p.code} — {p.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Case reference" hint="Your document reference, e.g. TN-WL-012" {...form.register("reference")} errors={errorsFor(form, server, "reference")} />
        <TextField label="Title" {...form.register("title")} errors={errorsFor(form, server, "title")} />
        <TextAreaField label="Description" {...form.register("description")} errors={errorsFor(form, server, "description")} />
        <Button type="submit" disabled={busy}>
          {busy ? "Creating…" : "Create case"}
        </Button>
      </Form>
    </>
  );
}

export function meta() {
  return [{ title: "New case · Spanwright" }];
}
