import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { useState } from "react";
import { requireCase } from "~/auth/case-access.server";
import { signaturesVoidedByEdit } from "~/services/review.server";
import { ResultsCaution } from "~/components/case/caution";
import { StepAnswer } from "~/components/case/step-answer";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { LoadsSchema } from "~/domain/step-data";
import { caseInputs } from "~/services/analysis.server";
import { loadsPageView } from "~/services/case-loads.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { LoadsPageInfo } from "~/services/case-loads.server";
import type { Route } from "./+types/loads";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { BreakdownPanel, EnvelopeTable, LoadsCharts, NotesPanel, ResultsStatus, RollingSidesPanel, RootLoadsTable, useCaseResults } from "./loads.panels";
import { saveStepAnswer } from "./step-action.server";

// The form's schema (zod) is imported on demand, here as in the browser: the page answers its first
// click without it (useZodForm loads it once the page first takes the focus, or at the form's first check).
// One way of importing the module on both sides keeps the dynamic import a real chunk boundary.
const loadsForm = () => import("./loads.schema");

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepStates } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, view, voids] = await Promise.all([readStepStates(), loadsPageView(c.id, c.title), signaturesVoidedByEdit(c.id, "loads")]);
  return {
    caseId: c.id,
    units: view.units,
    revision: steps.loads.revision,
    status: steps.loads.status,
    values: { notes: view.notes },
    caseCount: view.caseCount,
    ready: view.ready,
    axisConvention: view.axisConvention,
    canEdit: hasPermission(current.roles, "case:edit") && steps.loads.status !== "submitted",
    voids,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:edit");
  const { LoadsFormSchema } = await loadsForm();
  const parsed = await parseBody(request, LoadsFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const inputs = caseInputs(await readSteps());
  // A case saved before the masses step kept its structural mass here: keep it until the masses step is saved.
  const legacy = !inputs.masses && inputs.loads?.semispanMass !== undefined ? { semispanMass: inputs.loads.semispanMass } : {};
  const si = LoadsSchema.safeParse({ notes: parsed.value.notes, ...legacy });
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "loads", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
}

const NO_INFO: LoadsPageInfo = { cases: {}, balance: [] };

export default function LoadsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const { units } = loaderData;
  const { form, onSubmit } = useZodForm(() => loadsForm().then((m) => m.LoadsFormSchema), { revision: loaderData.revision, ...loaderData.values }, loaderData.revision);
  const busy = useSaving();
  const [selected, setSelected] = useState<string | null>(null);
  const results = useCaseResults(loaderData.caseId, loaderData.ready, loaderData.revision, selected);
  const { result } = results;
  const current = result?.current ?? null;
  // Mass case, kind and balance come with the results, for the cases they list.
  const info = result?.info ?? NO_INFO;
  return (
    <>
      <PageHeader title="Loads" description="Shear, bending moment and torsion about the reference axis along the span for every case, net of inertia relief, and their envelope." />
      <ResultsCaution />
      {loaderData.axisConvention ? (
        <p className="mb-3 max-w-5xl text-sm text-ink-muted" data-testid="axis-convention">
          {loaderData.axisConvention}
        </p>
      ) : null}
      <StepAnswer answer={shown} inline={["notes"]} />
      <div className="mb-5 grid grid-cols-1 gap-5 xl:grid-cols-[22rem_minmax(0,1fr)]">
        <NotesPanel form={form} onSubmit={onSubmit} server={shown?.fieldErrors} canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} voids={loaderData.voids} />
        <ResultsStatus ready={loaderData.ready} caseCount={loaderData.caseCount} results={results} current={current} onSelect={setSelected} units={units} info={info} />
      </div>
      {result && current ? (
        <div className={results.loading ? "opacity-50" : undefined} aria-busy={results.loading}>
          <LoadsCharts envelope={result.envelope} current={current} units={units} drawings={result.drawings} />
          <RollingSidesPanel current={current} units={units} />
          <BreakdownPanel caseId={loaderData.caseId} current={current} result={result} units={units} info={info} />
          <Panel title={result.cases.length < result.caseCount ? `Root loads, the ${result.cases.length} most critical of ${result.caseCount} cases` : "Root loads, every case"} className="mt-5">
            <RootLoadsTable cases={result.cases} units={units} info={info} />
          </Panel>
          <EnvelopeTable envelope={result.envelope} units={units} info={info} />
        </div>
      ) : null}
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Loads · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
