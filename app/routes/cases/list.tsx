import { Form, href, Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { hasPermission } from "~/domain/permissions";
import { CASE_STATUSES, type CaseStatus } from "~/domain/vocabulary";
import { StatusBadge } from "~/components/ui/status-badge";
import { EmptyState, PageHeader } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { listCases, listProgrammes } from "~/services/programmes.server";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/list";

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "case:read");
  const url = new URL(request.url);
  const programmes = await listProgrammes(current.organisation.id);
  const programmeId = programmes.some((p) => p.id === url.searchParams.get("programme")) ? url.searchParams.get("programme")! : undefined;
  const statusParam = url.searchParams.get("status");
  const status = CASE_STATUSES.includes(statusParam as CaseStatus) ? (statusParam as CaseStatus) : undefined;
  const cases = await listCases(current.organisation.id, { programmeId, status });
  return { cases, programmes, filters: { programmeId: programmeId ?? "", status: status ?? "" }, canCreate: hasPermission(current.roles, "case:create") };
}

export default function CasesRoute({ loaderData }: Route.ComponentProps) {
  const { cases, programmes, filters, canCreate } = loaderData;
  return (
    <>
      <PageHeader
        title="Cases"
        description="Loads case files of your organisation's programmes."
        actions={
          canCreate ? (
            <Link to={href("/cases/new")} className="rounded border border-accent bg-accent px-3 py-1.5 text-sm font-semibold text-white no-underline hover:bg-accent-strong hover:text-white">
              New case
            </Link>
          ) : null
        }
      />
      <Form method="get" className="mb-4 flex flex-wrap items-end gap-3 text-sm">
        <label className="flex flex-col">
          <span className="font-semibold">Programme</span>
          <select name="programme" defaultValue={filters.programmeId} className="mt-1 rounded border border-line-strong bg-surface px-2 py-1">
            <option value="">All programmes</option>
            {programmes.map((p) => (
              <option key={p.id} value={p.id}>
                {p.code} — {p.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col">
          <span className="font-semibold">Status</span>
          <select name="status" defaultValue={filters.status} className="mt-1 rounded border border-line-strong bg-surface px-2 py-1">
            <option value="">Any status</option>
            {CASE_STATUSES.map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
        <button type="submit" className="rounded border border-line-strong bg-surface px-3 py-1 font-semibold hover:bg-canvas">
          Filter
        </button>
      </Form>
      {cases.length === 0 ? (
        <EmptyState title="No cases match">
          {canCreate ? "Start one with “New case”: it opens with the certification basis step." : "Cases appear here once an engineer starts one."}
        </EmptyState>
      ) : (
        <ListTable columns={[{ label: "Reference" }, { label: "Title" }, { label: "Programme" }, { label: "Status" }, { label: "Revision", numeric: true }, { label: "Started by" }, { label: "Last change" }]}>
          {cases.map((c) => (
            <tr key={c.id} className="border-b border-line last:border-0 hover:bg-canvas">
              <td className="px-3 py-2 font-semibold">
                <Link to={href("/cases/:caseId", { caseId: c.id })}>{c.reference}</Link>
              </td>
              <td className="px-3 py-2">{c.title}</td>
              <td className="px-3 py-2">{c.programmeCode}</td>
              <td className="px-3 py-2">
                <StatusBadge status={c.status} />
              </td>
              <td className="px-3 py-2 text-right">{c.revision}</td>
              <td className="px-3 py-2">{c.createdByName}</td>
              <td className="px-3 py-2 text-ink-muted">{formatUtc(c.updatedAt)}</td>
            </tr>
          ))}
        </ListTable>
      )}
    </>
  );
}

export function meta() {
  return [{ title: "Cases · Spanwright" }];
}
