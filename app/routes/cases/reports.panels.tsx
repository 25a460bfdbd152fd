import { useEffect } from "react";
import { Form, href, useFetcher, useRevalidator } from "react-router";
import { Button } from "~/components/ui/button";
import { Alert, Panel } from "~/components/ui/page-header";
import { PENDING_REPORT_STATUSES, reportStage, type ReportStatus } from "~/domain/vocabulary";
import type { latestVersionChanges, ReportListItem } from "~/services/reports.server";
import type { RerunView } from "~/services/reproduction.server";
import { formatUtc } from "~/utils/format";
import { SsoSignButton } from "~/components/case/sso-sign-button";

/** A report still being made: queued for a worker or being generated. */
export const isPending = (status: string) => (PENDING_REPORT_STATUSES as readonly string[]).includes(status);

/**
 * While a report is generated, its progress from the API each 1.5 s; the page is loaded again when
 * it is done, so the issued report appears with its hash and download.
 */
export function useReportProgress(caseId: string, pending: boolean) {
  const revalidator = useRevalidator();
  const status = useFetcher<{ reports: { id: string; status: ReportStatus; progress: number; progressNote: string }[] }>();
  const url = href("/api/v1/cases/:caseId/reports", { caseId });
  const { load } = status;
  const { revalidate } = revalidator;
  useEffect(() => {
    if (!pending) return;
    const t = setInterval(() => load(url), 1500);
    return () => clearInterval(t);
  }, [pending, url, load]);
  const live = status.data?.reports;
  useEffect(() => {
    if (pending && live && !live.some((r) => isPending(r.status))) void revalidate();
  }, [live, pending, revalidate]);
  return live;
}

/** A re-run still waiting for a worker or running. */
export const isRerunPending = (status: string) => status === "queued" || status === "running";

/** While a re-run is pending, the page's data again each 1.5 s (its progress, then its verdict). */
export function useRerunProgress(pending: boolean) {
  const revalidator = useRevalidator();
  useEffect(() => {
    if (!pending) return;
    const t = setInterval(() => {
      if (revalidator.state === "idle") void revalidator.revalidate();
    }, 1500);
    return () => clearInterval(t);
  }, [pending, revalidator]);
}

/** The engineer's request for the next version, once the case is approved for issue. */
export function RequestReportForm({ first, busy, pending }: { first: boolean; busy: boolean; pending: boolean }) {
  return (
    <Form method="post" className="mb-5">
      <input type="hidden" name="intent" value="request" />
      <Button type="submit" disabled={busy || pending}>
        {first ? "Request the report" : "Issue the next version"}
      </Button>
      <span className="ml-3 text-xs text-ink-muted">Needs every step approved and the case approved for issue by a checker.</span>
    </Form>
  );
}

/** One version of the report: state, hashes, download, the signatures behind it, and quality's release. */
export function ReportPanel({ report: r, live, canRelease, canSso, busy, rerun }: { report: ReportListItem; live: { status: ReportStatus; progress: number; progressNote: string } | undefined; canRelease: boolean; canSso: boolean; busy: boolean; rerun: RerunView | null }) {
  // The polled state while the job runs; the page's own until the first answer.
  const now = live ?? r;
  return (
    <Panel title={`${r.reportNumber} · version ${r.version}`}>
      <div className="flex flex-wrap items-start gap-6 text-sm">
        <dl className="grid grid-cols-[8rem_1fr] gap-y-1">
          <dt className="text-ink-muted">Status</dt>
          <dd className="font-semibold">{r.status}</dd>
          <dt className="text-ink-muted">Requested</dt>
          <dd>{formatUtc(r.createdAt)}</dd>
          <dt className="text-ink-muted">Issued</dt>
          <dd>{formatUtc(r.issuedAt)}</dd>
          <dt className="text-ink-muted">Released</dt>
          <dd>{formatUtc(r.releasedAt)}</dd>
          <dt className="text-ink-muted">SHA-256</dt>
          <dd>
            <code className="break-all text-xs">{r.sha256 ?? "—"}</code>
          </dd>
        </dl>
        <div className="min-w-64 flex-1">
          {isPending(r.status) ? (
            <div role="status" aria-live="polite">
              <p>
                <strong>{reportStage(now.status, now.progressNote)}</strong> · {now.progress}% — {now.progressNote}
              </p>
              <div className="mt-1 h-2 rounded bg-canvas" role="progressbar" aria-label={`Report ${r.reportNumber}`} aria-valuemin={0} aria-valuemax={100} aria-valuenow={now.progress}>
                <div className="h-2 rounded bg-accent" style={{ width: `${Math.max(5, now.progress)}%` }} />
              </div>
            </div>
          ) : null}
          {r.status === "failed" ? <Alert>Generation failed after its retries: {r.failure}. Request the report again when the cause is fixed.</Alert> : null}
          {r.sha256 ? (
            <p className="mb-2">
              <a href={href("/api/v1/reports/:reportId/pdf", { reportId: r.id })} className="font-semibold">
                Download PDF
              </a>{" "}
              <span className="text-xs text-ink-muted">({((r.size ?? 0) / 1024).toFixed(0)} KiB)</span>
            </p>
          ) : null}
          {r.signatures.length ? (
            <ul className="space-y-0.5 text-xs">
              {r.signatures.map((g, i) => (
                <li key={i}>
                  ✓ {g.meaning} — {g.name} ({g.role}), {formatUtc(g.signedAt)}, <code>{g.revisionHash.slice(0, 12)}…</code>
                </li>
              ))}
            </ul>
          ) : null}
          {r.status === "issued" || r.status === "released" ? <Reproduction reportId={r.id} rerun={rerun} busy={busy} /> : null}
          {canRelease && r.status === "issued" ? (
            <Form method="post" className="mt-3 flex flex-wrap items-end gap-2">
              <input type="hidden" name="intent" value="release" />
              <input type="hidden" name="reportId" value={r.id} />
              <label>
                <span className="block font-semibold">Your password, to sign</span>
                <input name="password" type="password" autoComplete="current-password" className="rounded border border-line-strong px-2 py-1" />
              </label>
              <Button type="submit" name="confirm" value="password" disabled={busy}>
                Release (sign: released)
              </Button>
              {canSso ? <SsoSignButton busy={busy} label="Release with company sign-in" /> : null}
            </Form>
          ) : null}
        </div>
      </div>
    </Panel>
  );
}

/**
 * "Re-run this report": recompute every number from the report's stored inputs with the current
 * engine, and say whether they are identical, with both engine versions.
 */
function Reproduction({ reportId, rerun, busy }: { reportId: string; rerun: RerunView | null; busy: boolean }) {
  const pending = rerun ? isRerunPending(rerun.status) : false;
  return (
    <section className="mt-3 border-t border-line pt-2" aria-label="Reproduction">
      <Form method="post" className="flex flex-wrap items-center gap-2">
        <input type="hidden" name="intent" value="rerun" />
        <input type="hidden" name="reportId" value={reportId} />
        <Button type="submit" disabled={busy || pending}>
          Re-run this report
        </Button>
        <span className="text-xs text-ink-muted">Recomputes every number from the report's stored inputs with the current engine and compares them with the issued ones.</span>
      </Form>
      {rerun && pending ? (
        <div role="status" aria-live="polite" className="mt-2">
          <p>Re-running… {rerun.progress}% — {rerun.progressNote}</p>
          <div className="mt-1 h-2 rounded bg-canvas">
            <div className="h-2 rounded bg-accent" style={{ width: `${Math.max(5, rerun.progress)}%` }} />
          </div>
        </div>
      ) : null}
      {rerun?.status === "failed" ? <div className="mt-2"><Alert>Re-run of {formatUtc(rerun.createdAt)} failed: {rerun.failure}</Alert></div> : null}
      {rerun?.status === "done" ? (
        <div className="mt-2" role="status">
          <p className={rerun.identical ? "font-semibold text-ink" : "font-semibold text-warn"}>
            {rerun.identical ? "✓ Identical" : "⚠ Differs"}: {rerun.identical ? `all ${rerun.compared} numbers recomputed equal the issued ones` : `${rerun.differing} of ${rerun.compared} values differ from the issued ones`}.
          </p>
          <p className="text-xs text-ink-muted">
            Recomputed with engine {rerun.engineVersion}; issued with engine {rerun.issuedEngine ?? "—"}. Re-run by {rerun.requestedBy}, {formatUtc(rerun.finishedAt)}.
          </p>
          {rerun.differences.length ? (
            <table className="mt-1 w-full text-xs tabular" aria-label="Values that differ on re-running">
              <thead className="text-ink-muted">
                <tr>
                  <th className="py-0.5 pr-2 text-left">Where</th>
                  <th className="py-0.5 pr-2 text-right">Issued</th>
                  <th className="py-0.5 text-right">Now</th>
                </tr>
              </thead>
              <tbody>
                {rerun.differences.map((d) => (
                  <tr key={d.path} className="border-t border-line">
                    <td className="py-0.5 pr-2"><code>{d.path}</code></td>
                    <td className="py-0.5 pr-2 text-right">{d.issued}</td>
                    <td className="py-0.5 text-right">{d.now}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}

/** Inputs and root loads of the two newest versions side by side. */
export function VersionChangesPanel({ diff }: { diff: NonNullable<Awaited<ReturnType<typeof latestVersionChanges>>> }) {
  return (
    <Panel title={`What changed from version ${diff.from} to ${diff.to}`} className="mt-5">
      <table className="w-full text-sm tabular">
        <thead className="text-xs text-ink-muted">
          <tr>
            <th className="py-1 text-left">Item</th>
            <th className="py-1 text-right">Version {diff.from}</th>
            <th className="py-1 text-right">Version {diff.to}</th>
          </tr>
        </thead>
        <tbody>
          {diff.rows.map((row) => (
            <tr key={row.item} className={`border-t border-line ${row.before !== row.after ? "font-semibold" : ""}`}>
              <td className="py-1">{row.item}</td>
              <td className="py-1 text-right">{row.before}</td>
              <td className="py-1 text-right">{row.after}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </Panel>
  );
}
