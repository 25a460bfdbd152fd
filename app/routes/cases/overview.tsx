import { Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { auditForEntity } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { StatusBadge } from "~/components/ui/status-badge";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { getCase } from "~/services/programmes.server";
import { formatUtc } from "~/utils/format";
import { notFound } from "~/utils/http.server";
import type { Route } from "./+types/overview";

export async function loader({ request, params }: Route.LoaderArgs) {
  const current = await requirePermission(request, "case:read");
  const found = await getCase(current.organisation.id, params.caseId);
  if (!found) notFound("Case");
  const history = await auditForEntity(db, "case", found.case.id, 20);
  return {
    case: found.case,
    programme: { id: found.programme.id, code: found.programme.code, name: found.programme.name, aircraft: found.programme.aircraft },
    createdByName: found.createdByName,
    history: history.map((h) => ({ id: h.id, at: h.at, action: h.action, actorEmail: h.actorEmail })),
  };
}

export default function CaseOverviewRoute({ loaderData }: Route.ComponentProps) {
  const { case: c, programme, history } = loaderData;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-muted">
        <Link to={`/programmes/${programme.id}`}>{programme.code}</Link> › {c.reference}
      </nav>
      <PageHeader title={`${c.reference} — ${c.title}`} description={c.description || undefined} actions={<StatusBadge status={c.status} />} />
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Case file">
          <dl className="grid grid-cols-[10rem_1fr] gap-y-1.5 text-sm">
            <dt className="text-ink-muted">Programme</dt>
            <dd>
              {programme.code} — {programme.name}
            </dd>
            <dt className="text-ink-muted">Aircraft</dt>
            <dd>{programme.aircraft}</dd>
            <dt className="text-ink-muted">Revision</dt>
            <dd className="tabular">{c.revision}</dd>
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
                <span>
                  {h.action} — {h.actorEmail ?? "system"}
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
