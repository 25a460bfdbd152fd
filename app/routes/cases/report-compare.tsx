import { Form, href, Link } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { ResultsCaution } from "~/components/case/caution";
import { Alert, EmptyState, PageHeader } from "~/components/ui/page-header";
import { DomainError } from "~/domain/errors";
import { reportCompareDrawings } from "~/charts/drawings.server";
import { compareReportVersions } from "~/services/report-comparison.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/report-compare";
import { ComparisonTables, EnvelopeOverlays, VersionsCompared } from "./report-compare.panels";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "report:read");
  const url = new URL(request.url);
  const choice = { organisationId: current.organisation.id, caseId: c.id, fromId: url.searchParams.get("from"), toId: url.searchParams.get("to") };
  // With the server's drawings of the envelope overlays: the page shows them without the chart library.
  const drawn = (v: Awaited<ReturnType<typeof compareReportVersions>>) => ({ ...v, drawings: v.comparison ? reportCompareDrawings(v.comparison, v.units) : null });
  try {
    return { caseId: c.id, problem: null, ...drawn(await compareReportVersions(choice)) };
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    // A bad choice is said beside the picker; the two newest versions are shown meanwhile.
    return { caseId: c.id, problem: error.message, ...drawn(await compareReportVersions({ ...choice, fromId: null, toId: null })) };
  }
}

export default function ReportCompareRoute({ loaderData }: Route.ComponentProps) {
  const { caseId, versions, fromId, toId, comparison, units, problem, drawings } = loaderData;
  const pdf = comparison && fromId && toId ? `${href("/api/cases/:caseId/report-comparison", { caseId })}?${new URLSearchParams({ from: fromId, to: toId })}` : null;
  return (
    <>
      <PageHeader
        title="Compare report versions"
        description="Any two issued versions of this case's report side by side: every input that changed, step by step and field by field, and the change in the root loads and in the envelope at each station."
        actions={<Link to={href("/cases/:caseId/reports", { caseId })}>Back to the reports</Link>}
      />
      <ResultsCaution />
      {versions.length < 2 ? (
        <EmptyState title="Nothing to compare yet">A comparison needs two issued versions of the report. Issue the next version when the case has changed and been approved again.</EmptyState>
      ) : (
        <>
          <Form method="get" className="mb-4 flex flex-wrap items-end gap-3 text-sm">
            <VersionSelect name="from" label="Earlier version" versions={versions} value={fromId} />
            <VersionSelect name="to" label="Later version" versions={versions} value={toId} />
            <button type="submit" className="rounded border border-line-strong px-3 py-1 font-semibold">
              Compare
            </button>
            {pdf ? (
              <a href={pdf} className="font-semibold">
                Download this comparison (PDF)
              </a>
            ) : null}
          </Form>
          {problem ? <div className="mb-4"><Alert>{problem}</Alert></div> : null}
          {comparison ? (
            <>
              <VersionsCompared c={comparison} />
              <ComparisonTables c={comparison} units={units} />
              <EnvelopeOverlays c={comparison} units={units} drawings={drawings} />
            </>
          ) : null}
        </>
      )}
    </>
  );
}

function VersionSelect({ name, label, versions, value }: { name: string; label: string; versions: { id: string; version: number; reportNumber: string }[]; value: string | null }) {
  return (
    <label>
      <span className="block font-semibold">{label}</span>
      <select name={name} defaultValue={value ?? ""} className="rounded border border-line-strong px-2 py-1">
        {versions.map((v) => (
          <option key={v.id} value={v.id}>
            {v.reportNumber} · version {v.version}
          </option>
        ))}
      </select>
    </label>
  );
}

export function meta() {
  return [{ title: "Compare report versions · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
