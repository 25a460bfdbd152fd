import { Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { ResultsCaution } from "~/components/case/caution";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { EnvelopeSchema, MAX_LOAD_CASES } from "~/domain/step-data";
import { caseInputs } from "~/services/analysis.server";
import { caseUnits, getCaseSteps } from "~/services/case-steps.server";
import { regeneratedCases, vnView } from "~/services/envelope.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/envelope";
import { CaseRowErrors, CasesPanel, MethodPanel, VnPanel } from "./envelope.panels";
import { casesToSI, DEFAULT_METHOD, EnvelopeFormSchema, envelopeFormValues } from "./envelope.schema";
import { saveStepAnswer } from "./step-action.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  const vn = vnView(inputs, DEFAULT_METHOD);
  return {
    units,
    revision: steps.envelope.revision,
    status: steps.envelope.status,
    values: envelopeFormValues(inputs.envelope, units),
    sets: vn.sets,
    vnProblem: vn.problem,
    stall: inputs.basis ? { area: inputs.basis.wingArea, clMax: inputs.basis.clMax, clMaxNegative: inputs.basis.clMaxNegative } : null,
    canEdit: hasPermission(current.roles, "case:edit") && steps.envelope.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, EnvelopeFormSchema, { maxRows: MAX_LOAD_CASES });
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  const form = parsed.value;
  const method = { compressibility: form.compressibility, spanwise: form.spanwise, stations: form.stations, ...(form.strips !== undefined ? { strips: form.strips } : {}) };
  return answer(async () => {
    const cases = form.intent === "generate" ? regeneratedCases(inputs, method) : casesToSI(form.cases, units);
    const si = EnvelopeSchema.safeParse({ ...method, cases });
    if (!si.success) return refused(fieldErrorsOf(si.error));
    return saveStepAnswer({ caseId: c.id, step: "envelope", baseRevision: form.revision, data: si.data, actor: current.user });
  });
}

export default function EnvelopeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { units } = loaderData;
  const { form, onSubmit } = useZodForm(EnvelopeFormSchema, { intent: "save", revision: loaderData.revision, ...loaderData.values }, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors;
  const disabled = !loaderData.canEdit;
  return (
    <>
      <PageHeader title="Envelope" description="Load cases from the manoeuvre and gust rules of the basis, drawn on the V–n diagram, and the method used for every case of this file." />
      <ResultsCaution />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      <StepAnswer answer={actionData} inline={["compressibility", "spanwise", "stations", "strips", "cases."]} />
      <CaseRowErrors server={server} />
      <div className="grid gap-5 2xl:grid-cols-2">
        <VnPanel sets={loaderData.sets} problem={loaderData.vnProblem} stall={loaderData.stall} units={units} />
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("revision")} />
          <input type="hidden" {...form.register("intent")} />
          <fieldset disabled={disabled}>
            <MethodPanel form={form} server={server} disabled={disabled} busy={busy} noDiagram={Boolean(loaderData.vnProblem)} />
            <CasesPanel form={form} server={server} units={units} disabled={disabled} count={loaderData.values.cases.length} />
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save envelope" onSave={() => form.setValue("intent", "save")} />
        </Form>
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Envelope · Spanwright" }];
}
