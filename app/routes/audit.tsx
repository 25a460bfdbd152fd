import { Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { auditTrail } from "~/services/audit.server";
import { Alert, PageHeader } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/audit";

/** The organisation's audit trail, newest first, with a check of the whole hash chain. */
export async function loader({ request }: Route.LoaderArgs) {
  const current = await requirePermission(request, "audit:read");
  const before = Number(new URL(request.url).searchParams.get("before"));
  return auditTrail(current.organisation.id, { before });
}

export default function AuditRoute({ loaderData }: Route.ComponentProps) {
  const { chain, entries } = loaderData;
  return (
    <>
      <PageHeader title="Audit trail" description="Every change, who made it and when, with the values before and after. Entries are chained by hash: any alteration shows below." />
      <div className="mb-4">
        {chain.intact ? (
          <Alert tone="info">✓ Chain intact: every entry verified from the first one.</Alert>
        ) : (
          <Alert>
            ✗ Chain broken at entry {chain.brokenAt!.id}: {chain.brokenAt!.reason}.
          </Alert>
        )}
      </div>
      <ListTable columns={[{ label: "#", numeric: true }, { label: "When" }, { label: "Who" }, { label: "What" }, { label: "Record" }, { label: "Change" }, { label: "Hash" }]}>
        {entries.map((e) => (
          <tr key={e.id} className="border-b border-line align-top last:border-0">
            <td className="px-3 py-1.5 text-right tabular">{e.id}</td>
            <td className="whitespace-nowrap px-3 py-1.5 tabular">{formatUtc(e.at)}</td>
            <td className="px-3 py-1.5">{e.actorEmail ?? "system"}</td>
            <td className="px-3 py-1.5 font-semibold">{e.action}</td>
            <td className="px-3 py-1.5 text-ink-muted">
              {e.entityType} {e.entityId ? <code className="text-xs">{e.entityId.slice(0, 8)}</code> : null}
            </td>
            <td className="max-w-md px-3 py-1.5">
              {e.before || e.after ? (
                <details>
                  <summary className="cursor-pointer text-accent">before / after</summary>
                  <pre className="mt-1 max-h-48 overflow-auto whitespace-pre-wrap bg-canvas p-2 text-xs">{JSON.stringify({ before: e.before, after: e.after }, null, 1)}</pre>
                </details>
              ) : (
                "—"
              )}
            </td>
            <td className="px-3 py-1.5">
              <code className="text-xs text-ink-faint">{e.hash.slice(0, 12)}</code>
            </td>
          </tr>
        ))}
      </ListTable>
      {loaderData.next ? (
        <p className="mt-3 text-sm">
          <Link to={`?before=${loaderData.next}`}>Older entries</Link>
        </p>
      ) : null}
    </>
  );
}

export function meta() {
  return [{ title: "Audit trail · Spanwright" }];
}
