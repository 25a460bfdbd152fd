import { useEffect } from "react";
import { Form, useFetcher, useNavigation, useRevalidator } from "react-router";
import { z } from "zod";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { formatNumber } from "~/domain/units";
import { ResultsCaution } from "~/components/case/caution";
import { Button } from "~/components/ui/button";
import { Alert, EmptyState, PageHeader, Panel } from "~/components/ui/page-header";
import type { ReportSnapshot } from "~/reports/snapshot";
import { db } from "~/db/client.server";
import { reports } from "~/db/schema";
import { listReports, releaseReport, requestReport } from "~/services/reports.server";
import { confirmIdentity } from "~/services/review.server";
import { formatUtc } from "~/utils/format";
import { accepted, answer, forbidden, parseBody, refused } from "~/utils/http.server";
import { and, eq, inArray } from "drizzle-orm";
import type { Route } from "./+types/reports";

const ReportsActionSchema = z.discriminatedUnion("intent", [
  z.strictObject({ intent: z.literal("request") }),
  z.strictObject({ intent: z.literal("release"), reportId: z.uuid("Unknown report"), password: z.string().max(256).default("") }),
]);

/** Inputs and root loads of two report versions side by side. */
function changes(older: ReportSnapshot, newer: ReportSnapshot) {
  const rows: { item: string; before: string; after: string }[] = [];
  for (const key of Object.keys(newer.revisions)) {
    if (older.revisions[key] !== newer.revisions[key]) rows.push({ item: `${key} revision`, before: String(older.revisions[key]), after: String(newer.revisions[key]) });
  }
  const flat = (s: ReportSnapshot) => ({
    "MTOW [kg]": s.inputs.basis.mtow,
    "VC [m/s]": s.inputs.basis.vc,
    "VD [m/s]": s.inputs.basis.vd,
    "Stations": s.inputs.planform.stations.length,
    "Root chord [m]": s.inputs.planform.stations[0]?.chord,
    "Semispan [m]": s.inputs.planform.stations[s.inputs.planform.stations.length - 1]?.y,
    "Load cases": s.exchange.cases.length,
    "Compressibility rule": s.inputs.envelope.compressibility,
    "Spanwise solver": s.inputs.envelope.spanwise,
    "Semispan mass [kg]": s.inputs.loads.semispanMass,
  });
  const a = flat(older);
  const b = flat(newer);
  for (const k of Object.keys(b) as (keyof typeof b)[]) if (a[k] !== b[k]) rows.push({ item: k, before: String(a[k]), after: String(b[k]) });
  const root = (s: ReportSnapshot) => s.result.envelope[0];
  const ra = root(older);
  const rb = root(newer);
  if (ra && rb) {
    for (const [label, x, y] of [
      ["Root shear max [kN]", ra.shearMax / 1000, rb.shearMax / 1000],
      ["Root bending max [kN·m]", ra.bendingMax / 1000, rb.bendingMax / 1000],
      ["Root bending min [kN·m]", ra.bendingMin / 1000, rb.bendingMin / 1000],
      ["Root torsion max [kN·m]", ra.torsionMax / 1000, rb.torsionMax / 1000],
    ] as const) {
      rows.push({ item: label, before: formatNumber(x, 5), after: formatNumber(y, 5) });
    }
  }
  return rows;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "report:read");
  const list = await listReports(current.organisation.id, c.id);
  const issued = await db.select({ version: reports.version, snapshot: reports.snapshot }).from(reports).where(and(eq(reports.caseId, c.id), inArray(reports.status, ["issued", "released"])));
  const byVersion = issued.sort((x, y) => x.version - y.version);
  const diff =
    byVersion.length >= 2
      ? { from: byVersion[byVersion.length - 2]!.version, to: byVersion[byVersion.length - 1]!.version, rows: changes(byVersion[byVersion.length - 2]!.snapshot as unknown as ReportSnapshot, byVersion[byVersion.length - 1]!.snapshot as unknown as ReportSnapshot) }
      : null;
  return {
    caseId: c.id,
    reports: list,
    diff,
    canRequest: hasPermission(current.roles, "case:edit"),
    canRelease: hasPermission(current.roles, "report:release"),
    pending: list.some((r) => r.status === "queued" || r.status === "generating"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "report:read");
  const parsed = await parseBody(request, ReportsActionSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors, { message: Object.values(parsed.fieldErrors).flat().join(" ") });
  const input = parsed.value;
  return answer(async () => {
    if (input.intent === "request") {
      if (!hasPermission(current.roles, "case:edit")) forbidden("Only an engineer of the case requests its report.");
      const r = await requestReport({ caseId: c.id, actor: current.user });
      return accepted(`Report ${r.reportNumber} requested: it is being generated.`);
    }
    if (!hasPermission(current.roles, "report:release")) forbidden("Only quality staff release reports.");
    const confirmedBy = await confirmIdentity(current, input.password || undefined);
    await releaseReport({ reportId: input.reportId, organisationId: current.organisation.id, current, role: "quality", confirmedBy });
    return accepted("Report released and signed.");
  });
}

export default function ReportsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const revalidator = useRevalidator();
  const status = useFetcher<{ reports: { id: string; status: string; progress: number }[] }>();
  // While a report is generated, poll its progress and refresh the page when it finishes.
  useEffect(() => {
    if (!loaderData.pending) return;
    const t = setInterval(() => {
      status.load(`/api/v1/cases/${loaderData.caseId}/reports`);
    }, 1500);
    return () => clearInterval(t);
  }, [loaderData.pending, loaderData.caseId]);
  const live = status.data?.reports;
  useEffect(() => {
    if (loaderData.pending && live && !live.some((r) => r.status === "queued" || r.status === "generating")) revalidator.revalidate();
  }, [live, loaderData.pending]);

  return (
    <>
      <PageHeader title="Reports" description="Issued versions of this case's report. Each is kept in storage unchanged, with its SHA-256 and every signature behind it." />
      <ResultsCaution />
      {actionData?.message ? <div className="mb-4"><Alert tone={actionData.ok ? "info" : "danger"}>{actionData.message}</Alert></div> : null}
      {loaderData.canRequest ? (
        <Form method="post" className="mb-5">
          <input type="hidden" name="intent" value="request" />
          <Button type="submit" disabled={busy || loaderData.pending}>
            {loaderData.reports.length ? "Issue the next version" : "Request the report"}
          </Button>
          <span className="ml-3 text-xs text-ink-muted">Needs every step approved and the case approved for issue by a checker.</span>
        </Form>
      ) : null}
      {loaderData.reports.length === 0 ? (
        <EmptyState title="No report yet">When the case is approved for issue, the engineer requests the report; it is generated in the background.</EmptyState>
      ) : (
        <div className="space-y-4">
          {loaderData.reports.map((r) => {
            const progress = live?.find((x) => x.id === r.id)?.progress ?? r.progress;
            return (
              <Panel key={r.id} title={`${r.reportNumber} · version ${r.version}`}>
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
                    {r.status === "queued" || r.status === "generating" ? (
                      <div role="status" aria-live="polite">
                        <p>Generating… {progress}% — {r.progressNote}</p>
                        <div className="mt-1 h-2 rounded bg-canvas">
                          <div className="h-2 rounded bg-accent" style={{ width: `${Math.max(5, progress)}%` }} />
                        </div>
                      </div>
                    ) : null}
                    {r.status === "failed" ? <Alert>Generation failed after its retries: {r.failure}. Request the report again when the cause is fixed.</Alert> : null}
                    {r.sha256 ? (
                      <p className="mb-2">
                        <a href={`/api/v1/reports/${r.id}/pdf`} className="font-semibold">
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
                    {loaderData.canRelease && r.status === "issued" ? (
                      <Form method="post" className="mt-3 flex flex-wrap items-end gap-2">
                        <input type="hidden" name="intent" value="release" />
                        <input type="hidden" name="reportId" value={r.id} />
                        <label>
                          <span className="block font-semibold">Your password, to sign</span>
                          <input name="password" type="password" autoComplete="current-password" className="rounded border border-line-strong px-2 py-1" />
                        </label>
                        <Button type="submit" disabled={busy}>
                          Release (sign: released)
                        </Button>
                      </Form>
                    ) : null}
                  </div>
                </div>
              </Panel>
            );
          })}
        </div>
      )}
      {loaderData.diff ? (
        <Panel title={`What changed from version ${loaderData.diff.from} to ${loaderData.diff.to}`} className="mt-5">
          <table className="w-full text-sm tabular">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th className="py-1 text-left">Item</th>
                <th className="py-1 text-right">Version {loaderData.diff.from}</th>
                <th className="py-1 text-right">Version {loaderData.diff.to}</th>
              </tr>
            </thead>
            <tbody>
              {loaderData.diff.rows.map((row) => (
                <tr key={row.item} className={`border-t border-line ${row.before !== row.after ? "font-semibold" : ""}`}>
                  <td className="py-1">{row.item}</td>
                  <td className="py-1 text-right">{row.before}</td>
                  <td className="py-1 text-right">{row.after}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Panel>
      ) : null}
    </>
  );
}

export function meta() {
  return [{ title: "Reports · Spanwright" }];
}
