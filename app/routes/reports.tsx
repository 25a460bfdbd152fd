import { Form, href, Link, useNavigation } from "react-router";
import { requirePermission } from "~/auth/auth.server";
import { Button } from "~/components/ui/button";
import { Alert, EmptyState, PageHeader, Panel } from "~/components/ui/page-header";
import { ListTable } from "~/components/ui/list-table";
import { listReportsWithCases, verifyPdf } from "~/services/reports.server";
import { formatUtc } from "~/utils/format";
import { accepted, refused } from "~/utils/http.server";
import type { Route } from "./+types/reports";

/** Largest PDF accepted for verification, bytes. */
const MAX_VERIFY_BYTES = 50 * 1024 * 1024;

export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requirePermission({ request, context }, "report:read");
  return { reports: await listReportsWithCases(current.organisation.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const current = await requirePermission({ request, context }, "report:read");
  const tooLarge = "The file is larger than 50 MiB.";
  if (Number(request.headers.get("Content-Length") ?? 0) > MAX_VERIFY_BYTES) return refused({ pdf: [tooLarge] }, { status: 413, message: tooLarge });
  const form = await request.formData().catch(() => null);
  const file = form?.get("pdf");
  const choose = "Choose a PDF file to verify.";
  if (!(file instanceof File) || file.size === 0) return refused({ pdf: [choose] }, { message: choose });
  const { sha256, report } = await verifyPdf(current.organisation.id, new Uint8Array(await file.arrayBuffer()));
  return accepted(null, {
    verdict: report
      ? { match: true as const, sha256, reportNumber: report.reportNumber, version: report.version, status: report.status, issuedAt: report.issuedAt, caseId: report.caseId }
      : { match: false as const, sha256 },
  });
}

export default function ReportsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const v = actionData?.ok ? actionData.verdict : null;
  return (
    <>
      <PageHeader title="Reports" description="Every issued report of your organisation. Release an issued report from its case's Reports page; verify any PDF against what was issued." />
      <div className="grid gap-5 xl:grid-cols-[1fr_24rem]">
        {loaderData.reports.length === 0 ? (
          <EmptyState title="No report has been issued yet" />
        ) : (
          <ListTable columns={[{ label: "Report" }, { label: "Case" }, { label: "Status" }, { label: "Issued" }, { label: "Released" }, { label: "PDF" }]}>
            {loaderData.reports.map((r) => (
              <tr key={r.id} className="border-b border-line last:border-0">
                <td className="px-3 py-2 font-semibold">
                  <Link to={href("/cases/:caseId/reports", { caseId: r.caseId })}>{r.reportNumber}</Link>
                  <span className="block text-xs font-normal text-ink-muted">version {r.version}</span>
                </td>
                <td className="px-3 py-2">{r.case ? `${r.case.reference} — ${r.case.title}` : "—"}</td>
                <td className="px-3 py-2">{r.status === "issued" ? <strong className="text-status-issued">■ issued, awaiting release</strong> : r.status === "released" ? <strong className="text-status-released">★ released</strong> : r.status}</td>
                <td className="px-3 py-2 tabular">{formatUtc(r.issuedAt)}</td>
                <td className="px-3 py-2 tabular">{formatUtc(r.releasedAt)}</td>
                <td className="px-3 py-2">{r.sha256 ? <a href={href("/api/v1/reports/:reportId/pdf", { reportId: r.id })}>Download</a> : "—"}</td>
              </tr>
            ))}
          </ListTable>
        )}
        <Panel title="Verify a PDF">
          <Form method="post" encType="multipart/form-data" className="space-y-2">
            <label htmlFor="verify-pdf" className="block text-sm font-semibold">
              PDF file
            </label>
            <input id="verify-pdf" name="pdf" type="file" accept="application/pdf,.pdf" className="block text-sm" />
            <Button type="submit" variant="secondary" disabled={busy}>
              Verify
            </Button>
          </Form>
          <div className="mt-3" aria-live="polite">
            {actionData && !actionData.ok ? <Alert>{actionData.message}</Alert> : null}
            {v?.match ? (
              <Alert tone="info">
                ✓ This is report {v.reportNumber}, version {v.version} ({v.status}), issued {formatUtc(v.issuedAt)}: its bytes are identical to the issued PDF.
              </Alert>
            ) : v ? (
              <Alert>✗ This file matches no report issued by your organisation (SHA-256 {v.sha256.slice(0, 16)}…). It may have been altered, or it is not ours.</Alert>
            ) : null}
          </div>
        </Panel>
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Reports · Spanwright" }];
}
