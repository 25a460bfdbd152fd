import { href, Link } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { STEP_STATUS_LABELS } from "~/domain/vocabulary";
import { caseOverview } from "~/services/case-overview.server";
import { formatUtc } from "~/utils/format";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/overview";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c, programme, createdByName, readStepStates } = await requireCase({ request, context }, params.caseId, "case:read");
  const { steps, history } = await caseOverview(c.id, await readStepStates());
  return { case: { id: c.id, reference: c.reference, title: c.title, description: c.description, createdAt: c.createdAt, updatedAt: c.updatedAt }, programme: { id: programme.id, code: programme.code, name: programme.name, aircraft: programme.aircraft }, createdByName, steps, history };
}

export default function CaseOverviewRoute({ loaderData }: Route.ComponentProps) {
  const { case: c, programme, steps, history } = loaderData;
  return (
    <>
      <PageHeader title={`${c.reference} — overview`} description={c.description || undefined} />
      <Panel title="Steps" className="mb-5">
        <table className="w-full text-left text-sm">
          <thead className="text-xs uppercase tracking-wide text-ink-muted">
            <tr>
              <th className="py-1.5 pr-3">Step</th>
              <th className="py-1.5 pr-3">Status</th>
              <th className="py-1.5 pr-3 text-right">Revision</th>
              <th className="py-1.5 pr-3">Last changed by</th>
              <th className="py-1.5 pr-3">When</th>
              <th className="py-1.5">Check</th>
            </tr>
          </thead>
          <tbody>
            {steps.map((s, i) => (
              <tr key={s.key} className="border-t border-line">
                <td className="py-1.5 pr-3">
                  <Link to={href(`/cases/:caseId/${s.key}`, { caseId: c.id })} className="font-semibold">
                    {i + 1}. {s.label}
                  </Link>
                  <span className="block text-xs text-ink-muted">{s.summary}</span>
                </td>
                <td className="py-1.5 pr-3">
                  <span aria-hidden="true">{STEP_STATUS_LABELS[s.status].icon}</span> {STEP_STATUS_LABELS[s.status].label}
                </td>
                <td className="py-1.5 pr-3 text-right tabular">{s.revision || "—"}</td>
                <td className="py-1.5 pr-3">{s.updatedByName ?? "—"}</td>
                <td className="py-1.5 pr-3 tabular text-ink-muted">{s.updatedAt && s.revision ? formatUtc(s.updatedAt) : "—"}</td>
                <td className="py-1.5 text-xs">
                  {s.approval?.kind === "signed" ? <span className="text-status-approved">✓ {s.approval.text}</span> : s.approval?.kind === "voided" ? <strong className="text-warn">⚠ {s.approval.text}</strong> : "—"}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Panel>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        <Panel title="Case file">
          <dl className="grid grid-cols-[10rem_1fr] gap-y-1.5 text-sm">
            <dt className="text-ink-muted">Programme</dt>
            <dd>
              {programme.code} — {programme.name}
            </dd>
            <dt className="text-ink-muted">Aircraft</dt>
            <dd>{programme.aircraft}</dd>
            <dt className="text-ink-muted">Started by</dt>
            <dd>
              {loaderData.createdByName}, {formatUtc(c.createdAt)}
            </dd>
            <dt className="text-ink-muted">Last change</dt>
            <dd>{formatUtc(c.updatedAt)}</dd>
          </dl>
        </Panel>
        <Panel title="History">
          <ol className="space-y-1 text-sm">
            {history.map((h) => (
              <li key={h.id} className="flex gap-3">
                <span className="tabular w-40 shrink-0 text-ink-muted">{formatUtc(h.at)}</span>
                <span title={`${h.action}${h.actorEmail ? ` · ${h.actorEmail}` : ""}`}>
                  {h.what} — {h.who}
                </span>
              </li>
            ))}
          </ol>
        </Panel>
      </div>
    </>
  );
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `${loaderData?.case.reference ?? "Case"} · Spanwright` }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
