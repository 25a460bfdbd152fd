import { Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { Alert, PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { MassesSchema } from "~/domain/step-data";
import { caseUnits, stepData } from "~/services/case-steps.server";
import { effectiveMasses, itemsOutsideWing, massesOverview } from "~/services/masses.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { answer, parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/masses";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { BalancePanel, ItemsPanel, MassCasesPanel, MassesDrawingPanel, MassRowErrors, SavedMassCasesPanel, StructurePanel } from "./masses.panels";
import { saveStepAnswer } from "./step-action.server";

// The form's schema and conversions (zod and the step schemas) are imported on demand, here as in the
// browser: the page answers its first click without them (useZodForm loads the schema at first focus).
// One way of importing the module on both sides keeps the dynamic import a real chunk boundary.
const massesForm = () => import("./masses.schema");

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, readStepsOf } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, { massesFormValues }] = await Promise.all([readStepsOf(["basis", "planform", "masses", "loads"]), massesForm()]);
  const units = caseUnits(steps);
  const inputs = { basis: stepData(steps, "basis"), masses: stepData(steps, "masses"), loads: stepData(steps, "loads") };
  const masses = effectiveMasses(inputs);
  const planform = stepData(steps, "planform");
  return {
    units,
    revision: steps.masses.revision,
    status: steps.masses.status,
    values: massesFormValues(masses, units),
    legacy: !inputs.masses && masses !== null,
    planform,
    overview: massesOverview({ planform, basis: inputs.basis, masses }),
    canEdit: hasPermission(current.roles, "case:edit") && steps.masses.status !== "submitted",
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const { MassesFormSchema, massesToSI } = await massesForm();
  const parsed = await parseBody(request, MassesFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  return answer(async () => {
    const steps = await readSteps();
    const si = MassesSchema.safeParse(massesToSI(parsed.value, caseUnits(steps)));
    if (!si.success) return refused(fieldErrorsOf(si.error));
    const planform = stepData(steps, "planform");
    const outside = planform ? itemsOutsideWing(si.data, planform) : {};
    if (Object.keys(outside).length) return refused(outside);
    return saveStepAnswer({ caseId: c.id, step: "masses", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
  });
}

export default function MassesRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { units, overview, planform } = loaderData;
  const { form, onSubmit } = useZodForm(() => massesForm().then((m) => m.MassesFormSchema), { ...loaderData.values, revision: loaderData.revision }, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors;
  const disabled = !loaderData.canEdit;
  const fields = { form, server, units, disabled };
  return (
    <>
      <PageHeader
        title="Masses"
        description="What one semispan carries — its structure, engines, gear and fuel — the aircraft's mass states with their weight and centre of gravity, and the inputs of its balance. The loads subtract each mass's inertia relief; the envelope is generated per mass state."
      />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      <StepAnswer answer={actionData} inline={["structureKg", "cmBody", "tailArm", "items.", "massCases."]} />
      <MassRowErrors server={server} />
      {loaderData.legacy ? (
        <div className="mb-3">
          <Alert tone="warn">This case was saved before the masses step existed: its semispan structural mass is shown from the loads step. Save this step to keep it here.</Alert>
        </div>
      ) : null}
      <div className="grid grid-cols-1 gap-5 2xl:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)]">
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("revision")} />
          <input type="hidden" {...form.register("sourceKind")} />
          <input type="hidden" {...form.register("sourceFile")} />
          <fieldset disabled={disabled} className="space-y-5">
            <StructurePanel {...fields} />
            <ItemsPanel {...fields} />
            <MassCasesPanel {...fields} />
            <BalancePanel {...fields} />
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save masses" />
        </Form>
        <div className="space-y-5">
          <MassesDrawingPanel form={form} planform={planform} overview={overview} units={units} />
          <SavedMassCasesPanel overview={overview} hasPlanform={Boolean(planform)} units={units} />
        </div>
      </div>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Masses · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
