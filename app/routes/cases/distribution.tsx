import { useEffect, useState } from "react";
import { useLoadAfterInteractive } from "~/components/ui/use-after-interactive";
import { href, useFetcher, useRevalidator } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { ResultsCaution } from "~/components/case/caution";
import { Alert, EmptyState, PageHeader } from "~/components/ui/page-header";
import { ErrorPanel } from "~/components/ui/error-panel";
import { hasPermission } from "~/domain/permissions";
import { sweepFraction, sweepProgressText } from "~/domain/results";
import { formatCount } from "~/domain/units";
import { getCaseUnits } from "~/services/case-steps.server";
import type { DistributionDrawings } from "~/charts/drawings.server";
import { distributionPage, mergedDispositions, type DistributionPageView, type ProblemCause } from "~/services/distribution.server";
import { answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/distribution";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { CasePicker, DispositionsPanel, DistributionCharts, FlagSummaryPanel, MethodUsedPanel, RESTORE_FETCHER_KEY, RestoreRevisionPanel, RuleSensitivityPanel, SpanwiseMethodsPanel, type SaveFetcher } from "./distribution.panels";
import type { action as restoreAction } from "../api/case-step-restore";
import { DispositionFormSchema } from "./distribution.schema";
import { saveStepAnswer } from "./step-action.server";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c, readStepStates } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, units] = await Promise.all([readStepStates(), getCaseUnits(c.id)]);
  // From the stored result only: no solve here. The shown case's distribution is fetched after the page shows.
  const page = await distributionPage({ caseId: c.id, title: c.title, units, requested: new URL(request.url).searchParams.get("case") });
  return {
    caseId: c.id,
    units,
    revision: steps.distribution.revision,
    status: steps.distribution.status,
    canEdit: hasPermission(current.roles, "case:edit") && steps.distribution.status !== "submitted",
    canRestore: hasPermission(current.roles, "org:admin"),
    page,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:edit");
  const parsed = await parseBody(request, DispositionFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const form = parsed.value;
  return answer(async () => {
    const change = form.intent === "rows" ? { kind: "rows" as const, changed: form.changed } : { kind: "bulk" as const, reason: form.reason, action: form.action, comment: form.comment };
    const merged = await mergedDispositions({ caseId: c.id, title: c.title, units: await getCaseUnits(c.id), baseRevision: form.revision, change });
    if (!merged.ok) return refused(merged.fieldErrors);
    return saveStepAnswer({ caseId: c.id, step: "distribution", baseRevision: form.revision, data: merged.data, actor: current.user }, "Dispositions");
  });
}

// The problem panel's heading says whose move it is: the engineer's, the inputs', or an administrator's.
const PROBLEM_HEADINGS: Record<ProblemCause, string> = {
  incomplete: "Nothing to show yet",
  refused: "These inputs cannot be computed",
  damaged: "The stored dispositions cannot be used",
};

export default function DistributionRoute({ loaderData }: Route.ComponentProps) {
  const { page, caseId, units, revision } = loaderData;
  const save: SaveFetcher = useFetcher<typeof action>({ key: "dispositions" });
  const picked = useFetcher<(DistributionPageView & { drawings: DistributionDrawings }) | { error: string; message: string }>();
  const revalidator = useRevalidator();
  // The case chosen on the page, else the one the server picked (known once the results are stored).
  const [chosen, setShownId] = useState<string | null>(null);
  const shownId = chosen ?? (page.state === "ready" ? page.shown : null);
  useLoadAfterInteractive(picked.load, shownId === null ? null : `${href("/api/cases/:caseId/distribution", { caseId })}?case=${encodeURIComponent(shownId)}`);
  // While the worker sweeps the case file, ask again each second.
  const pending = page.state === "pending";
  const { revalidate } = revalidator;
  useEffect(() => {
    if (!pending) return;
    const t = setTimeout(() => void revalidate(), 1000);
    return () => clearTimeout(t);
  }, [pending, revalidate, page]);

  const view = picked.data && "y" in picked.data && picked.data.caseId === shownId ? picked.data : null;
  const failed = picked.state === "idle" && picked.data && "error" in picked.data ? picked.data.message : null;
  const answered = save.state === "idle" ? save.data : undefined;
  const restored = useFetcher<typeof restoreAction>({ key: RESTORE_FETCHER_KEY });
  const putBack = restored.state === "idle" && restored.data?.ok ? restored.data.message : null;
  const errors = Object.entries(answered && !answered.ok ? answered.fieldErrors : {});
  return (
    <>
      <PageHeader title="Distribution" description="Spanwise lift and pitching moment of each case, the solver beside Schrenk's approximation, the three compressibility rules side by side, and the critical Mach number of each station; the case by each spanwise method, and the critical cases' root loads under each rule." />
      <ResultsCaution />
      {page.state === "problem" ? (
        <>
          <EmptyState title={PROBLEM_HEADINGS[page.cause]}>{page.problem}</EmptyState>
          {page.cause === "damaged" && loaderData.canRestore ? <RestoreRevisionPanel caseId={caseId} revision={revision} /> : null}
        </>
      ) : page.state === "pending" ? (
        <div className="text-sm" role="status">
          <p className="text-ink-muted">Computing the results of the case file: {sweepProgressText(page.progress, page.cases)} The flagged cases show once they are stored.</p>
          <div className="mt-2 h-1.5 w-full overflow-hidden rounded bg-canvas" role="progressbar" aria-label="Load cases evaluated" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(100 * sweepFraction(page.progress))}>
            <div className="h-full rounded bg-accent" style={{ width: `${(100 * sweepFraction(page.progress)).toFixed(1)}%` }} />
          </div>
        </div>
      ) : (
        <>
          {page.summary.open ? (
            <div className="mb-4">
              <Alert tone="warn">
                ⚠ {formatCount(page.summary.open)} flagged case{page.summary.open > 1 ? "s" : ""} without a disposition: {page.summary.openIds.join(", ")}
                {page.summary.open > page.summary.openIds.length ? ` and ${formatCount(page.summary.open - page.summary.openIds.length)} more` : ""}. Exclude each, or justify it with a comment, before this step can be submitted.
              </Alert>
            </div>
          ) : null}
          {answered?.ok ? (
            <div className="mb-3">
              <Alert tone="info">{answered.message}</Alert>
            </div>
          ) : putBack ? (
            <div className="mb-3">
              <Alert tone="info">{putBack}</Alert>
            </div>
          ) : null}
          {errors.length ? (
            <div className="mb-3">
              <Alert>{errors.map(([k, m]) => `${k}: ${m?.join(" ")}`).join(" · ")}</Alert>
            </div>
          ) : null}
          <MethodUsedPanel method={page.method} machCriticalSwept={view?.machCriticalSwept ?? null} />
          <CasePicker caseId={caseId} shownId={shownId ?? page.shown} view={view} units={units} computing={picked.state !== "idle"} failed={failed} show={setShownId} />
          {view ? <DistributionCharts view={view} units={units} /> : null}
          <SpanwiseMethodsPanel caseId={caseId} loadCase={shownId ?? page.shown} revision={revision} />
          <RuleSensitivityPanel caseId={caseId} revision={revision} />
          <FlagSummaryPanel summary={page.summary} revision={revision} canEdit={loaderData.canEdit} save={save} />
          <DispositionsPanel caseId={caseId} total={page.summary.flagged} first={page.first} revision={revision} canEdit={loaderData.canEdit} status={loaderData.status} save={save} show={setShownId} />
        </>
      )}
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Distribution · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
