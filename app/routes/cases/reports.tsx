import { href, Link } from "react-router";
import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { requireCase } from "~/auth/case-access.server";
import { canSignWithSso, sign } from "~/auth/signing.server";
import { ResultsCaution } from "~/components/case/caution";
import { Alert, EmptyState, PageHeader } from "~/components/ui/page-header";
import { hasPermission } from "~/domain/permissions";
import { signatureOutcomeMessage } from "~/domain/sso";
import { latestVersionChanges, listReports, requestReport } from "~/services/reports.server";
import { accepted, answer, clientAddress, forbidden, parseBody, refused } from "~/utils/http.server";
import { latestReruns, requestRerun } from "~/services/reproduction.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/reports";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { isPending, isRerunPending, ReportPanel, RequestReportForm, useReportProgress, useRerunProgress, VersionChangesPanel } from "./reports.panels";
import { ReportsActionSchema } from "./reports.schema";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "report:read");
  const [list, diff, canSso] = await Promise.all([listReports(current.organisation.id, c.id), latestVersionChanges(c.id), canSignWithSso(current)]);
  const reruns = await latestReruns(current.organisation.id, list.map((r) => r.id));
  return {
    caseId: c.id,
    signature: signatureOutcomeMessage(new URL(request.url).searchParams.get("signature")),
    canSso,
    reports: list,
    reruns,
    rerunning: Object.values(reruns).some((r) => isRerunPending(r.status)),
    diff,
    canRequest: hasPermission(current.roles, "case:edit"),
    canRelease: hasPermission(current.roles, "report:release"),
    pending: list.some((r) => isPending(r.status)),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "report:read");
  const parsed = await parseBody(request, ReportsActionSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors, { message: Object.values(parsed.fieldErrors).flat().join(" ") });
  const input = parsed.value;
  return answer(async () => {
    if (input.intent === "request") {
      if (!hasPermission(current.roles, "case:edit")) forbidden("Only an engineer of the case requests its report.");
      const r = await requestReport({ caseId: c.id, actor: current.user });
      return accepted(`Report ${r.reportNumber} requested: it is being generated.`);
    }
    if (input.intent === "rerun") {
      await requestRerun({ organisationId: current.organisation.id, caseId: c.id, reportId: input.reportId, actor: current.user });
      return accepted("Re-run queued: the report's numbers are being recomputed from its stored inputs with the current engine.");
    }
    if (!hasPermission(current.roles, "report:release")) forbidden("Only quality staff release reports.");
    // The report must be one of this case's: another case's report is not found here.
    await sign(current, { intent: "release", caseId: c.id, reportId: input.reportId }, { ...input, address: clientAddress(request) });
    return accepted("Report released and signed.");
  });
}

export default function ReportsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const busy = useSaving();
  const live = useReportProgress(loaderData.caseId, loaderData.pending);
  useRerunProgress(loaderData.rerunning);
  return (
    <>
      <PageHeader title="Reports" description="Issued versions of this case's report. Each is kept in storage unchanged, with its SHA-256 and every signature behind it." />
      <ResultsCaution />
      {loaderData.signature && !actionData ? <div className="mb-4"><Alert tone={loaderData.signature.ok ? "info" : "danger"}>{loaderData.signature.message}</Alert></div> : null}
      {shown?.message ? <div className="mb-4"><Alert tone={shown.ok ? "info" : "danger"}>{shown.message}</Alert></div> : null}
      {loaderData.canRequest ? <RequestReportForm first={loaderData.reports.length === 0} busy={busy} pending={loaderData.pending} /> : null}
      {loaderData.reports.length === 0 ? (
        <EmptyState title="No report yet">When the case is approved for issue, the engineer requests the report; it is generated in the background.</EmptyState>
      ) : (
        <div className="space-y-4">
          {loaderData.reports.map((r) => (
            <ReportPanel key={r.id} report={r} live={live?.find((x) => x.id === r.id)} canRelease={loaderData.canRelease} canSso={loaderData.canSso} busy={busy} rerun={loaderData.reruns[r.id] ?? null} />
          ))}
        </div>
      )}
      {loaderData.diff ? (
        <>
          <VersionChangesPanel diff={loaderData.diff} />
          <p className="mt-2 text-sm">
            <Link to={href("/cases/:caseId/reports/compare", { caseId: loaderData.caseId })} className="font-semibold">
              Compare any two versions
            </Link>{" "}
            <span className="text-ink-muted">— every changed input field by field, root loads and the envelope at each station, with overlay charts and a PDF.</span>
          </p>
        </>
      ) : null}
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Reports · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
