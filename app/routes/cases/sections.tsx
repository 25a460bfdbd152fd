import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { data, Form } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { sectionFitDrawings } from "~/charts/drawings.server";
import { signaturesVoidedByEdit } from "~/services/review.server";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { MAX_SECTION_CSV_BYTES, type CsvProblem } from "~/domain/section-csv";
import { MAX_SECTION_ROWS, SectionsSchema } from "~/domain/step-data";
import { caseUnits, stepData } from "~/services/case-steps.server";
import { receiveSectionCsv, sectionsFromUpload, sectionsWithoutPressures } from "~/services/uploads.server";
import { fieldErrorsOf, FormFieldError, formDataToObject, type ActionRefusal } from "~/utils/form-data";
import { accepted, answer, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/sections";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { AileronPanel, FlapsPanel, previewOf, RicherDataPanel, SectionFitCharts, SectionGridPanel, UploadPanel } from "./sections.panels";
import { saveStepAnswer } from "./step-action.server";

// The form's schema and conversions (zod and the step schemas) are imported on demand, here as in the
// browser: the page answers its first click without them (useZodForm loads the schema at first focus).
// One way of importing the module on both sides keeps the dynamic import a real chunk boundary.
const sectionsForm = () => import("./sections.schema");

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepsOf } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, { sectionsFormValues }] = await Promise.all([readStepsOf(["basis", "planform", "sections"]), sectionsForm()]);
  const saved = stepData(steps, "sections");
  const units = caseUnits(steps);
  return {
    units,
    revision: steps.sections.revision,
    status: steps.sections.status,
    saved,
    // The fit charts, drawn here: the page shows them without the chart library.
    drawings: sectionFitDrawings(saved, units),
    values: sectionsFormValues(saved, stepData(steps, "planform"), units),
    canEdit: hasPermission(current.roles, "case:edit") && steps.sections.status !== "submitted",
    voids: await signaturesVoidedByEdit(c.id, "sections"),
    maxKiB: MAX_SECTION_CSV_BYTES / 1024,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const length = Number(request.headers.get("Content-Length") ?? 0);
  if (length > MAX_SECTION_CSV_BYTES + 64 * 1024) return refused({ file: [`The file is larger than ${MAX_SECTION_CSV_BYTES / 1024} KiB.`] }, { status: 413 });
  const body = await request.formData().catch(() => null);
  if (!body) return refused({ form: ["The request body could not be read."] });
  if (body.has("file")) {
    const file = body.get("file");
    if (!(file instanceof File) || file.size === 0) return refused({ file: ["Choose a CSV file to upload."] });
    const received = await receiveSectionCsv({ organisationId: c.organisationId, caseId: c.id, filename: file.name, bytes: new Uint8Array(await file.arrayBuffer()), actor: current.user });
    if (!received.parsed.ok) {
      const problems = received.parsed.problems;
      const refusal: ActionRefusal & { problems: CsvProblem[] } = { ok: false, message: null, fieldErrors: { file: [`${file.name} was not accepted: ${problems.length} problem(s).`] }, problems };
      return data(refusal, { status: 400 });
    }
    return accepted(null, { revision: null, preview: previewOf(received.upload!, received.parsed) });
  }

  let fields: Record<string, unknown>;
  try {
    fields = formDataToObject(body, { maxRows: MAX_SECTION_ROWS });
  } catch (error) {
    if (error instanceof FormFieldError) return refused({ [error.field]: [error.message] });
    throw error;
  }
  const { SectionsFormSchema, sectionsToSI } = await sectionsForm();
  const checked = SectionsFormSchema.safeParse(fields);
  if (!checked.success) return refused(fieldErrorsOf(checked.error));
  const input = checked.data;
  return answer(async () => {
    const steps = await readSteps();
    const saved = stepData(steps, "sections");
    const candidate =
      input.intent === "save" ? sectionsToSI(input, caseUnits(steps), saved) : input.intent === "remove-pressures" ? sectionsWithoutPressures(saved) : await sectionsFromUpload(c.id, input.uploadId, saved);
    const si = SectionsSchema.safeParse(candidate);
    if (!si.success) return refused(fieldErrorsOf(si.error));
    return saveStepAnswer({ caseId: c.id, step: "sections", baseRevision: input.revision, data: si.data, actor: current.user });
  });
}

export default function SectionsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const { form, onSubmit } = useZodForm(() => sectionsForm().then((m) => m.SectionsFormSchema), { intent: "save", revision: loaderData.revision, ...loaderData.values }, loaderData.revision);
  const busy = useSaving();
  const saved = loaderData.saved;
  return (
    <>
      <PageHeader title="Sections" description="Incompressible 2-D section data along the span, from a wind tunnel or a 2-D analysis. Linear between stations; the compressibility rule is applied later." />
      <UnsavedGuard dirty={form.formState.isDirty && !shown?.ok} />
      <StepAnswer answer={shown} inline={["rows.", "file", "flaps.", "aileron."]} />
      {saved?.source.kind === "upload" ? (
        <p className="mb-3 text-sm text-ink-muted">
          Current data from the uploaded file <strong>{saved.source.filename}</strong> (SHA-256 <code className="text-xs">{saved.source.sha256?.slice(0, 16)}…</code>).
        </p>
      ) : null}
      <div className="grid grid-cols-1 gap-5 2xl:grid-cols-2">
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("intent")} />
          <input type="hidden" {...form.register("revision")} />
          <fieldset disabled={!loaderData.canEdit || busy}>
            <SectionGridPanel form={form} server={shown?.fieldErrors} units={loaderData.units} disabled={!loaderData.canEdit} />
            <FlapsPanel form={form} server={shown?.fieldErrors} units={loaderData.units} />
            <AileronPanel form={form} server={shown?.fieldErrors} units={loaderData.units} />
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save typed section data" voids={loaderData.voids} />
        </Form>
        <div className="space-y-5">
          {loaderData.canEdit ? <UploadPanel revision={loaderData.revision} maxKiB={loaderData.maxKiB} units={loaderData.units} /> : null}
          <RicherDataPanel rows={saved?.rows ?? []} canEdit={loaderData.canEdit} revision={loaderData.revision} units={loaderData.units} />
          <SectionFitCharts saved={saved} units={loaderData.units} drawings={loaderData.drawings} />
        </div>
      </div>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Sections · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
