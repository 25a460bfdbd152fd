import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { Form } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { signaturesVoidedByEdit } from "~/services/review.server";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
import { toSIKeepingShown } from "~/domain/form-values";
import { hasPermission } from "~/domain/permissions";
import { BasisSchema } from "~/domain/step-data";
import { basisChecks } from "~/services/basis.server";
import { stepData } from "~/services/case-steps.server";
import { flapsChecks, rollingChecks, vbChecks } from "~/services/envelope.server";
import { envelopeOutline } from "~/services/load-cases.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/basis";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { BasisChecksPanel, BasisFlapsPanel, BasisRulesPanel, BasisSpeedsPanel, BasisWeightsPanel, BasisWingPanel } from "./basis.panels";
import { BASIS_FIELDS, BASIS_QUANTITIES } from "./basis.quantities";
import { saveStepAnswer } from "./step-action.server";

// The form's schema (zod and the step schemas) is imported on demand, here as in the browser: the
// page answers its first click without it (useZodForm loads it once the page first takes the focus).
// One way of importing the module on both sides keeps the dynamic import a real chunk boundary.
const basisForm = () => import("./basis.schema");

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepsOf } = await requireCase({ request, context }, params.caseId, "case:read");
  // The envelope's method only (its first row checks it), not its load cases.
  const [steps, envelope] = await Promise.all([readStepsOf(["basis", "planform", "sections"]), envelopeOutline(c.id, { first: 1, whole: 0 })]);
  const saved = stepData(steps, "basis");
  const { basisFormValues } = await basisForm();
  return {
    caseId: c.id,
    revision: steps.basis.revision,
    status: steps.basis.status,
    values: basisFormValues(saved),
    saved,
    derived: saved ? [...basisChecks(saved), ...vbChecks(saved, stepData(steps, "planform"), stepData(steps, "sections"), envelope.data ?? { compressibility: "prandtl-glauert", spanwise: "vortex-lattice" }), ...flapsChecks(saved, stepData(steps, "sections")), ...rollingChecks(saved, stepData(steps, "sections"))] : null,
    canEdit: hasPermission(current.roles, "case:edit") && steps.basis.status !== "submitted",
    voids: await signaturesVoidedByEdit(c.id, "basis"),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const { BasisFormSchema } = await basisForm();
  const parsed = await parseBody(request, BasisFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const { revision, ...typed } = parsed.value;
  const saved = stepData(await readSteps(), "basis");
  const si = BasisSchema.safeParse(toSIKeepingShown(typed, typed.units, BASIS_QUANTITIES, saved));
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "basis", baseRevision: revision, data: si.data, actor: current.user });
}

export default function BasisRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const { form, onSubmit } = useZodForm(() => basisForm().then((m) => m.BasisFormSchema), { ...loaderData.values, revision: loaderData.revision }, loaderData.revision);
  const busy = useSaving();
  const fields = { form, server: shown?.fieldErrors, units: form.watch("units") ?? "SI", saved: loaderData.saved };
  return (
    <>
      <PageHeader title="Basis" description="The certification basis of the case: the rules that apply, weights, design speeds (equivalent airspeed) and altitudes." />
      <UnsavedGuard dirty={form.formState.isDirty && !shown?.ok} />
      <StepAnswer answer={shown} inline={BASIS_FIELDS} />
      <Form method="post" onSubmit={onSubmit} noValidate>
        <input type="hidden" {...form.register("revision")} />
        <fieldset disabled={!loaderData.canEdit || busy} className="grid grid-cols-1 gap-5 xl:grid-cols-2">
          <BasisRulesPanel {...fields} />
          <BasisWeightsPanel {...fields} />
          <BasisSpeedsPanel {...fields} />
          <BasisWingPanel {...fields} />
          <BasisFlapsPanel {...fields} />
        </fieldset>
        {loaderData.derived ? <BasisChecksPanel checks={loaderData.derived} /> : null}
        <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save basis" voids={loaderData.voids} />
      </Form>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Basis · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
