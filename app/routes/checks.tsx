import { href, Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { StatusBadge } from "~/components/ui/status-badge";
import { EmptyState, PageHeader } from "~/components/ui/page-header";
import { listCases } from "~/services/programmes.server";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/checks";

/** The checker's queue: case files an engineer has submitted for check. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "step:check");
  return { waiting: await listCases(current.organisation.id, { status: "submitted" }) };
}

export default function ChecksRoute({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Waiting for your check" description="Work submitted by engineers. You cannot approve work whose current revision you edited yourself." />
      {loaderData.waiting.length === 0 ? (
        <EmptyState title="Nothing is waiting for a check">Submitted case files appear here, oldest first, with a link to each.</EmptyState>
      ) : (
        <ul className="divide-y divide-line rounded border border-line bg-surface">
          {loaderData.waiting.map((c) => (
            <li key={c.id} className="flex items-center gap-4 px-4 py-2 text-sm">
              <Link to={href("/cases/:caseId", { caseId: c.id })} className="w-32 font-semibold">
                {c.reference}
              </Link>
              <span className="flex-1">{c.title}</span>
              <span className="text-ink-muted">{c.createdByName}</span>
              <StatusBadge status={c.status} />
              <span className="w-40 text-right text-ink-muted">{formatUtc(c.updatedAt)}</span>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

export function meta() {
  return [{ title: "Checks · Spanwright" }];
}
