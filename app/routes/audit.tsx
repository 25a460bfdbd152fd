import { Link } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { Alert, PageHeader } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { checkAuditTrail, listAuditEntries } from "~/services/audit-trail.server";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/audit";

/**
 * The organisation's audit trail, newest first, with a check of its whole chain (only this
 * organisation's entries are read) against the anchors kept outside the database.
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "audit:read");
  const before = Number(new URL(request.url).searchParams.get("before"));
  const [page, check] = await Promise.all([listAuditEntries(current.organisation.id, before), checkAuditTrail(current.organisation.id)]);
  return {
    check: { intact: check.intact, entries: check.chain.entries, brokenAt: check.brokenAt ?? null, anchors: check.anchors, anchorsUnavailable: check.anchorsUnavailable ?? null },
    entries: page.entries,
    next: page.next,
  };
}

export default function AuditRoute({ loaderData }: Route.ComponentProps) {
  const { check, entries } = loaderData;
  const newest = check.anchors?.newest;
  return (
    <>
      <PageHeader title="Audit trail" description="Every change, who made it and when, with the values before and after. Entries are chained by hash and the chain is anchored outside the database: any alteration or removal shows below." />
      <div className="mb-4 space-y-2">
        {check.intact ? (
          <Alert tone="info">
            ✓ Trail intact: all {check.entries} entries verified from the first one
            {newest ? `, and against ${check.anchors!.count} checkpoint${check.anchors!.count === 1 ? "" : "s"} in storage (the newest at entry ${newest.seq}, ${formatUtc(newest.at)})` : ""}.
          </Alert>
        ) : (
          <Alert>
            ✗ Trail broken at entry {check.brokenAt!.seq}: {check.brokenAt!.reason}.
          </Alert>
        )}
        {check.anchorsUnavailable ? <Alert tone="warn">Checked within the database only: {check.anchorsUnavailable}.</Alert> : null}
      </div>
      <ListTable columns={[{ label: "#", numeric: true }, { label: "When" }, { label: "Who" }, { label: "What" }, { label: "Record" }, { label: "Change" }, { label: "Hash" }]}>
        {entries.map((e) => (
          <tr key={e.id} className="border-b border-line align-top last:border-0">
            <td className="px-3 py-1.5 text-right tabular">{e.seq}</td>
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
