import { useMemo } from "react";
import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { Form } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { signaturesVoidedByEdit } from "~/services/review.server";
import { ResultsCaution } from "~/components/case/caution";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { EnvelopeSchema } from "~/domain/step-data";
import { caseInputs } from "~/services/analysis.server";
import { caseUnits, stepData } from "~/services/case-steps.server";
import { envelopeDrawings } from "~/charts/drawings.server";
import { regeneratedCases, vnView } from "~/services/envelope.server";
import { editLoadCases, envelopeOutline } from "~/services/load-cases.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { accepted, answer, parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/envelope";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { caseCells, caseRows } from "./envelope.cells";
import { CaseRowErrors, CasesPanel, CasesWindowPanel, FIRST_ROWS, MethodPanel, VnPanel } from "./envelope.panels";
import { saveStepAnswer } from "./step-action.server";

// The form's schema and conversions (zod and the step schemas) are imported on demand, here as in the
// browser: the page answers its first click without them (useZodForm loads the schema at the first focus or check).
// One way of importing the module on both sides keeps the dynamic import a real chunk boundary.
const envelopeForm = () => import("./envelope.schema");

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepsOf } = await requireCase({ request, context }, params.caseId, "case:read");
  const { DEFAULT_METHOD, envelopeFormValues, WHOLE_GRID_LOAD_CASES } = await envelopeForm();
  // A large case file is not read, nor sent, whole: the page carries the first rows, the grid fetches the rest as they scroll into view.
  const [steps, envelope] = await Promise.all([readStepsOf(["basis", "planform", "sections", "masses"]), envelopeOutline(c.id, { first: FIRST_ROWS, whole: WHOLE_GRID_LOAD_CASES })]);
  const units = caseUnits(steps);
  const inputs = { basis: stepData(steps, "basis"), planform: stepData(steps, "planform"), sections: stepData(steps, "sections"), masses: stepData(steps, "masses"), envelope: envelope.data };
  const vn = vnView(inputs, DEFAULT_METHOD);
  const stall = inputs.basis ? { area: inputs.basis.wingArea, clMax: inputs.basis.clMax, clMaxNegative: inputs.basis.clMaxNegative } : null;
  const { cases, ...values } = envelopeFormValues(envelope.data, units);
  const total = envelope.data ? envelope.total : 0;
  const windowed = total > WHOLE_GRID_LOAD_CASES;
  return {
    caseId: c.id,
    units,
    revision: envelope.revision,
    status: envelope.status,
    /** The method fields of the form, and its rows (envelope.cells: each an array of its cells). */
    values,
    cases: windowed ? [] : caseCells(cases),
    window: windowed ? { total, rows: caseCells(cases.slice(0, FIRST_ROWS)) } : null,
    sets: vn.sets,
    vnProblem: vn.problem,
    stall,
    // The charts shown first, drawn here: the page shows them without the chart library.
    drawings: vn.problem ? null : envelopeDrawings(vn.sets, stall, units),
    canEdit: hasPermission(current.roles, "case:edit") && envelope.status !== "submitted",
    voids: await signaturesVoidedByEdit(c.id, "envelope"),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const { casesToSI, EnvelopeFormSchema, MAX_EDITED_ROWS, WHOLE_GRID_LOAD_CASES } = await envelopeForm();
  const parsed = await parseBody(request, EnvelopeFormSchema, { maxRows: Math.max(WHOLE_GRID_LOAD_CASES, MAX_EDITED_ROWS) });
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const steps = await readSteps();
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  const form = parsed.value;
  if (form.intent === "rows") {
    return answer(async () => {
      const edited = await editLoadCases({
        caseId: c.id,
        baseRevision: form.revision,
        changed: form.changed.map((r) => ({ index: r.index, values: casesToSI([r.row], units)[0]! })),
        removed: form.removed,
        added: casesToSI(form.added, units),
        actor: current.user,
      });
      return edited.ok ? accepted(`Saved as revision ${edited.revision}.`, { revision: edited.revision }) : refused(edited.fieldErrors);
    });
  }
  // The page does not offer the output kind: a saved file keeps its own (an imported sweep stored as a summary stays one).
  const output = inputs.envelope?.output ?? "full";
  const method = { compressibility: form.compressibility, spanwise: form.spanwise, stations: form.stations, output, ...(form.strips !== undefined ? { strips: form.strips } : {}) };
  return answer(async () => {
    const cases = form.intent === "generate" ? regeneratedCases(inputs, method) : form.intent === "method" ? (inputs.envelope?.cases ?? []) : casesToSI(form.cases, units);
    const si = EnvelopeSchema.safeParse({ ...method, cases });
    if (!si.success) return refused(fieldErrorsOf(si.error));
    return saveStepAnswer({ caseId: c.id, step: "envelope", baseRevision: form.revision, data: si.data, actor: current.user });
  });
}

export default function EnvelopeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const { units } = loaderData;
  const windowed = loaderData.window !== null;
  const saveIntent: "method" | "save" = windowed ? "method" : "save";
  // Built once per page data: the form's values are read at its start and again only when a new revision resets it.
  const { values, cases, revision, window: firstRows } = loaderData;
  const defaults = useMemo(() => ({ intent: saveIntent, revision, ...values, cases: caseRows(cases) }), [saveIntent, revision, values, cases]);
  const first = useMemo(() => (firstRows ? { total: firstRows.total, rows: caseRows(firstRows.rows) } : null), [firstRows]);
  const { form, onSubmit } = useZodForm(() => envelopeForm().then((m) => m.EnvelopeFormSchema), defaults, loaderData.revision);
  const busy = useSaving();
  const server = shown?.fieldErrors;
  const disabled = !loaderData.canEdit;
  // Enter in a field saves what was typed. The browser would press the form's first button, which
  // is "Generate cases": it would replace the cases typed into the grid with generated ones.
  const saveOnEnter = (e: React.KeyboardEvent<HTMLFormElement>) => {
    if (e.key !== "Enter" || !(e.target instanceof HTMLInputElement) || e.defaultPrevented) return;
    e.preventDefault();
    form.setValue("intent", saveIntent);
    e.currentTarget.requestSubmit();
  };
  return (
    <>
      <PageHeader title="Envelope" description="Load cases from the manoeuvre and gust rules of the basis, drawn on the V–n diagram, and the method used for every case of this file." />
      <ResultsCaution />
      <UnsavedGuard dirty={form.formState.isDirty && !shown?.ok} />
      <StepAnswer answer={shown} inline={["compressibility", "spanwise", "stations", "strips", "cases."]} />
      <CaseRowErrors server={server} />
      <div className="grid grid-cols-1 gap-5 2xl:grid-cols-2">
        <VnPanel sets={loaderData.sets} problem={loaderData.vnProblem} stall={loaderData.stall} units={units} drawings={loaderData.drawings} />
        <div>
          <Form method="post" onSubmit={onSubmit} onKeyDown={saveOnEnter} noValidate>
            <input type="hidden" {...form.register("revision")} />
            <input type="hidden" {...form.register("intent")} />
            <fieldset disabled={disabled || busy}>
              <MethodPanel form={form} server={server} disabled={disabled} busy={busy} noDiagram={Boolean(loaderData.vnProblem)} />
              {windowed ? null : <CasesPanel form={form} server={server} units={units} disabled={disabled} count={cases.length} />}
            </fieldset>
            <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label={windowed ? "Save method" : "Save envelope"} onSave={() => form.setValue("intent", saveIntent)} voids={loaderData.voids} />
          </Form>
          {first ? <CasesWindowPanel caseId={loaderData.caseId} first={first} revision={loaderData.revision} units={units} canEdit={loaderData.canEdit} status={loaderData.status} /> : null}
        </div>
      </div>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Envelope · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
