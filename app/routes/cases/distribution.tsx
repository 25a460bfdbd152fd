import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { href, useFetcher } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { ResultsCaution } from "~/components/case/caution";
import { Alert, EmptyState, PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { DistributionSchema, MAX_LOAD_CASES } from "~/domain/step-data";
import { caseInputs } from "~/services/analysis.server";
import { caseUnits } from "~/services/case-steps.server";
import { distributionStep } from "~/services/distribution.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/distribution";
import { CasePicker, DispositionsPanel, DistributionCharts, MethodUsedPanel, RuleSensitivityPanel, SpanwiseMethodsPanel } from "./distribution.panels";
import { DispositionFormSchema } from "./distribution.schema";
import { saveStepAnswer } from "./step-action.server";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readSteps } = await requireCase({ request, context }, params.caseId, "case:read");
  const steps = await readSteps();
  const shown = await distributionStep({ caseId: c.id, title: c.title, inputs: caseInputs(steps), requested: new URL(request.url).searchParams.get("case"), actorId: current.user.id });
  return { caseId: c.id, units: caseUnits(steps), revision: steps.distribution.revision, status: steps.distribution.status, canEdit: hasPermission(current.roles, "case:edit") && steps.distribution.status !== "submitted", ...shown };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:edit");
  const parsed = await parseBody(request, DispositionFormSchema, { maxRows: MAX_LOAD_CASES });
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const chosen = Object.fromEntries(parsed.value.dispositions.filter((d) => d.action !== "none").map((d) => [d.id, { action: d.action, comment: d.comment }]));
  const si = DistributionSchema.safeParse({ dispositions: chosen });
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "distribution", baseRevision: parsed.value.revision, data: si.data, actor: current.user }, "Dispositions");
}

export default function DistributionRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const busy = useSaving();
  const picked = useFetcher<typeof loaderData.view>();
  const { flags } = loaderData;
  // Another case is fetched from the resource route; the page itself does not navigate.
  const view = picked.data && "y" in picked.data ? picked.data : loaderData.view;
  const show = (id: string) => picked.load(`${href("/api/cases/:caseId/distribution", { caseId: loaderData.caseId })}?case=${encodeURIComponent(id)}`);
  const errors = Object.entries(shown && !shown.ok ? shown.fieldErrors : {});
  return (
    <>
      <PageHeader title="Distribution" description="Spanwise lift and pitching moment of each case, the solver beside Schrenk's approximation, the three compressibility rules side by side, and the critical Mach number of each station; the case by each spanwise method, and the critical cases' root loads under each rule." />
      <ResultsCaution />
      {loaderData.problem ? (
        <EmptyState title="Nothing to show yet">{loaderData.problem}</EmptyState>
      ) : view ? (
        <>
          {loaderData.open.length ? (
            <div className="mb-4">
              <Alert tone="warn">
                ⚠ {loaderData.open.length} flagged case{loaderData.open.length > 1 ? "s" : ""} without a disposition: {loaderData.open.join(", ")}. Exclude each, or justify it with a comment, before this step can be submitted.
              </Alert>
            </div>
          ) : null}
          {shown?.ok ? <div className="mb-3"><Alert tone="info">{shown.message}</Alert></div> : null}
          {errors.length ? <div className="mb-3"><Alert>{errors.map(([k, m]) => `${k}: ${m?.join(" ")}`).join(" · ")}</Alert></div> : null}
          {loaderData.method ? <MethodUsedPanel method={loaderData.method} machCriticalSwept={view.machCriticalSwept} /> : null}
          <CasePicker view={view} units={loaderData.units} flags={flags} computing={busy || picked.state !== "idle"} show={show} />
          <DistributionCharts view={view} units={loaderData.units} />
          <SpanwiseMethodsPanel caseId={loaderData.caseId} loadCase={view.caseId} revision={loaderData.revision} />
          <RuleSensitivityPanel caseId={loaderData.caseId} revision={loaderData.revision} />
          <DispositionsPanel flags={flags} dispositions={loaderData.dispositions} revision={loaderData.revision} canEdit={loaderData.canEdit} busy={busy} show={show} />
        </>
      ) : null}
    </>
  );
}

export function meta() {
  return [{ title: "Distribution · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
