import { href, Link, NavLink, Outlet } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { STEPS } from "~/domain/steps";
import { STEP_STATUS_LABELS } from "~/domain/vocabulary";
import { StatusBadge } from "~/components/ui/status-badge";
import { ErrorPanel } from "~/components/ui/error-panel";
import { usePreloadChildRouteModules } from "~/components/ui/preload-route-modules";
import type { Route } from "./+types/case-layout";

/** Case header and step rail; each step route checks access again in its own loader. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { case: c, programme, readStepStates } = await requireCase({ request, context }, params.caseId, "case:read");
  const steps = await readStepStates();
  return {
    case: { id: c.id, reference: c.reference, title: c.title, status: c.status },
    programme: { id: programme.id, code: programme.code },
    steps: STEPS.map((s) => ({ key: s.key, label: s.label, status: steps[s.key].status, revision: steps[s.key].revision })),
  };
}

export default function CaseLayout({ loaderData }: Route.ComponentProps) {
  const { case: c, programme, steps } = loaderData;
  // The code of the case's pages (this layout's routes, id "case" in app/routes.ts), fetched once idle.
  usePreloadChildRouteModules("case");
  return (
    <div>
      <nav aria-label="Breadcrumb" className="mb-1 text-sm text-ink-muted">
        <Link to={href("/programmes/:programmeId", { programmeId: programme.id })}>{programme.code}</Link> › <Link to={href("/cases/:caseId", { caseId: c.id })}>{c.reference}</Link>
      </nav>
      <div className="mb-4 flex flex-wrap items-center gap-3">
        <p className="text-lg font-semibold">{c.title}</p>
        <StatusBadge status={c.status} />
      </div>
      <div className="flex flex-col gap-5 lg:flex-row">
        <nav aria-label="Steps" className="shrink-0 lg:w-48">
          <ol className="flex gap-1 overflow-x-auto lg:flex-col">
            <li>
              <NavLink end to={href("/cases/:caseId", { caseId: c.id })} className={stepClass}>
                <span className="font-semibold">Overview</span>
              </NavLink>
            </li>
            {steps.map((s, i) => (
              <li key={s.key}>
                <NavLink to={href(`/cases/:caseId/${s.key}`, { caseId: c.id })} className={stepClass}>
                  <span className="font-semibold">
                    {i + 1}. {s.label}
                  </span>
                  <span className="block text-xs text-ink-muted">
                    <span aria-hidden="true">{STEP_STATUS_LABELS[s.status].icon}</span> {STEP_STATUS_LABELS[s.status].label}
                    {s.revision ? ` · rev. ${s.revision}` : ""}
                  </span>
                </NavLink>
              </li>
            ))}
            <li className="mt-2 border-t border-line pt-2">
              <NavLink to={href("/cases/:caseId/review", { caseId: c.id })} className={stepClass}>
                <span className="font-semibold">Review</span>
                <span className="block text-xs text-ink-muted">submit, check, sign</span>
              </NavLink>
            </li>
            <li>
              <NavLink to={href("/cases/:caseId/reports", { caseId: c.id })} className={stepClass}>
                <span className="font-semibold">Reports</span>
                <span className="block text-xs text-ink-muted">issued versions</span>
              </NavLink>
            </li>
          </ol>
        </nav>
        <div className="min-w-0 flex-1">
          <Outlet />
        </div>
      </div>
    </div>
  );
}

function stepClass({ isActive, isPending }: { isActive: boolean; isPending: boolean }) {
  return `block whitespace-nowrap rounded border px-3 py-1.5 text-sm text-ink no-underline ${isActive ? "border-accent bg-accent-soft" : isPending ? "border-line-strong bg-canvas" : "border-transparent hover:bg-surface"}`;
}

/**
 * The case itself could not be shown (not found, not this organisation's, no access): there is no
 * header or step rail to draw, so the way back to the list stands in for them.
 */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return (
    <div>
      <nav aria-label="Breadcrumb" className="mb-1 text-sm text-ink-muted">
        <Link to={href("/cases")}>Cases</Link>
      </nav>
      <ErrorPanel error={error} />
    </div>
  );
}
