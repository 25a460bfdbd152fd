import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { Form } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { signaturesVoidedByEdit } from "~/services/review.server";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { MAX_PLANFORM_STATIONS, PlanformSchema } from "~/domain/step-data";
import { caseUnits, stepData } from "~/services/case-steps.server";
import { planformGeometry } from "~/services/planform.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/planform";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { PanelEntryPanel, planformForm, PreviewPanels, StationsPanel } from "./planform.panels";
import { saveStepAnswer } from "./step-action.server";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepsOf } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, { planformFormValues }] = await Promise.all([readStepsOf(["basis", "planform"]), planformForm()]);
  const units = caseUnits(steps);
  const saved = stepData(steps, "planform");
  return {
    caseId: c.id,
    units,
    revision: steps.planform.revision,
    status: steps.planform.status,
    values: planformFormValues(saved, units),
    saved: {
      stations: saved?.stations ?? [],
      axis: { root: saved?.axisRoot ?? 0.25, tip: saved?.axisTip ?? 0.25 },
      geometry: saved ? planformGeometry(saved.stations) : null,
    },
    canEdit: hasPermission(current.roles, "case:edit") && steps.planform.status !== "submitted",
    voids: await signaturesVoidedByEdit(c.id, "planform"),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const { PlanformFormSchema, planformToSI } = await planformForm();
  const parsed = await parseBody(request, PlanformFormSchema, { maxRows: MAX_PLANFORM_STATIONS });
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const units = caseUnits(await readSteps());
  const si = PlanformSchema.safeParse(planformToSI(parsed.value, units));
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "planform", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
}

export default function PlanformRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const { units, saved } = loaderData;
  const { form, onSubmit } = useZodForm(() => planformForm().then((m) => m.PlanformFormSchema), { ...loaderData.values, revision: loaderData.revision }, loaderData.revision);
  const busy = useSaving();
  const server = shown?.fieldErrors;
  const disabled = !loaderData.canEdit;
  return (
    <>
      <PageHeader title="Planform" description="The wing from root to tip: stations where chord, leading edge or twist change; straight lines between them." />
      <UnsavedGuard dirty={form.formState.isDirty && !shown?.ok} />
      <StepAnswer answer={shown} inline={["stations.", "axisRoot", "axisTip"]} />
      <div className="grid grid-cols-1 gap-5 2xl:grid-cols-2">
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("revision")} />
          <fieldset disabled={disabled || busy}>
            <StationsPanel form={form} server={server} units={units} disabled={disabled} />
            {disabled ? null : <PanelEntryPanel units={units} onStations={(rows) => form.setValue("stations", rows, { shouldDirty: true })} />}
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save planform" voids={loaderData.voids} />
        </Form>
        <div className="space-y-5">
          <PreviewPanels form={form} saved={saved} units={units} />
        </div>
      </div>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Planform · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
