import { href, Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { hasPermission } from "~/domain/permissions";
import { StatusBadge } from "~/components/ui/status-badge";
import { EmptyState, PageHeader } from "~/components/ui/page-header";
import { getProgramme, listCases } from "~/services/programmes.server";
import { formatUtc } from "~/utils/format";
import { notFound } from "~/utils/http.server";
import type { Route } from "./+types/detail";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "programme:read");
  const programme = await getProgramme(current.organisation.id, params.programmeId);
  if (!programme) notFound("Programme");
  const cases = await listCases(current.organisation.id, { programmeId: programme.id });
  return { programme, cases, canCreate: hasPermission(current.roles, "case:create") };
}

export default function ProgrammeRoute({ loaderData }: Route.ComponentProps) {
  const { programme, cases } = loaderData;
  return (
    <>
      <PageHeader
        title={`${programme.code} — ${programme.name}`}
        description={`${programme.aircraft}${programme.description ? `. ${programme.description}` : ""}`}
        actions={
          loaderData.canCreate ? (
            <Link to={`${href("/cases/new")}?programme=${programme.id}`} className="rounded border border-accent bg-accent px-3 py-1.5 text-sm font-semibold text-white no-underline hover:text-white">
              New case
            </Link>
          ) : null
        }
      />
      {cases.length === 0 ? (
        <EmptyState title="No cases in this programme yet" />
      ) : (
        <ul className="divide-y divide-line rounded border border-line bg-surface">
          {cases.map((c) => (
            <li key={c.id} className="flex items-center gap-4 px-4 py-2 text-sm">
              <Link to={href("/cases/:caseId", { caseId: c.id })} className="w-32 font-semibold">
                {c.reference}
              </Link>
              <span className="flex-1">{c.title}</span>
              <StatusBadge status={c.status} />
              <span className="w-40 text-right text-ink-muted">{formatUtc(c.updatedAt)}</span>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `${loaderData?.programme.code ?? "Programme"} · Spanwright` }];
}
