import { Form, Link, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { numberInput } from "~/domain/form-values";
import { DistributionSchema, RULE_LABELS } from "~/domain/step-data";
import { formatNumber } from "~/domain/units";
import { clOption, loadingOption, machCriticalOption, rulesOption } from "~/charts/distribution";
import { Chart } from "~/components/charts/chart";
import { ResultsCaution } from "~/components/case/caution";
import { Button } from "~/components/ui/button";
import { Alert, EmptyState, PageHeader, Panel } from "~/components/ui/page-header";
import { buildCaseFile, caseInputs, resultsFor } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { distributionViewForPage, flaggedCases, undispositioned } from "~/services/distribution.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/distribution";
import { saveStepAnswer } from "./step-action.server";
import { DomainError } from "~/domain/errors";

const DispositionFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  // Indexed rows, since case ids may hold characters that form field names cannot.
  dispositions: z.array(z.strictObject({ id: z.string(), action: z.enum(["none", "exclude", "justify"]).default("none"), comment: z.string().default("") })).default([]),
});

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const inputs = caseInputs(steps);
  const base = { caseId: c.id, revision: steps.distribution.revision, status: steps.distribution.status, canEdit: hasPermission(current.roles, "case:edit") && steps.distribution.status !== "submitted" };
  let file;
  try {
    file = buildCaseFile(c.title, inputs, "envelope");
  } catch (error) {
    if (error instanceof DomainError) return { ...base, problem: error.message, view: null, flags: [], open: [], dispositions: {} };
    throw error;
  }
  try {
    const { result } = await resultsFor(c.id, file, current.user.id);
    const flags = flaggedCases(result);
    const requested = new URL(request.url).searchParams.get("case");
    const view = distributionViewForPage(file, requested && file.cases.some((k) => k.id === requested) ? requested : (flags[0]?.id ?? file.cases[0]!.id));
    return { ...base, problem: null, view, flags, open: undispositioned(flags, inputs.distribution), dispositions: inputs.distribution?.dispositions ?? {} };
  } catch (error) {
    if (error instanceof DomainError) return { ...base, problem: error.message, view: null, flags: [], open: [], dispositions: {} };
    throw error;
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, DispositionFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const chosen = Object.fromEntries(parsed.value.dispositions.filter((d) => d.action !== "none").map((d) => [d.id, { action: d.action, comment: d.comment }]));
  const si = DistributionSchema.safeParse({ dispositions: chosen });
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "distribution", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
}

export default function DistributionRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const picked = useFetcher<typeof loaderData.view>();
  const { flags } = loaderData;
  // Another case is fetched from the resource route; the page itself does not navigate.
  const view = picked.data && "y" in picked.data ? picked.data : loaderData.view;
  const show = (id: string) => picked.load(`/api/cases/${loaderData.caseId}/distribution?case=${encodeURIComponent(id)}`);
  const errors = Object.entries((actionData?.fieldErrors ?? {}) as Record<string, string[] | undefined>);
  return (
    <>
      <PageHeader title="Distribution" description="Spanwise lift and pitching moment of each case, the solver beside Schrenk's approximation, the three compressibility rules side by side, and the critical Mach number of each station." />
      <ResultsCaution />
      {loaderData.problem ? (
        <EmptyState title="Nothing to show yet">{loaderData.problem}</EmptyState>
      ) : view ? (
        <>
          {loaderData.open.length ? (
            <div className="mb-4">
              <Alert tone="warn">
                ⚠ {loaderData.open.length} flagged case{loaderData.open.length > 1 ? "s" : ""} without a disposition: {loaderData.open.join(", ")}. Exclude each, or justify it with a comment, before this step can be submitted.
              </Alert>
            </div>
          ) : null}
          {actionData?.ok ? <div className="mb-3"><Alert tone="info">Dispositions saved as revision {actionData.revision}.</Alert></div> : null}
          {errors.length ? <div className="mb-3"><Alert>{errors.map(([k, m]) => `${k}: ${m?.join(" ")}`).join(" · ")}</Alert></div> : null}
          <div className="mb-4 flex flex-wrap items-center gap-3 text-sm">
            <label>
              <span className="mr-2 font-semibold">Case</span>
              <select value={view.caseId} onChange={(e) => show(e.target.value)} className="rounded border border-line-strong px-2 py-1" aria-label="Case shown">
                {view.cases.map((id) => (
                  <option key={id} value={id}>
                    {id}
                    {flags.some((f) => f.id === id) ? " ⚠" : ""}
                  </option>
                ))}
              </select>
            </label>
            <span className="tabular text-ink-muted">
              Mach {formatNumber(view.mach)} · {formatNumber(view.altitude)} m · CL {formatNumber(view.CL)} · α {formatNumber(view.alphaDeg)}° · {RULE_LABELS[view.rule]} ·{" "}
              {view.regime === "supercritical" ? <strong className="text-danger">supercritical (critical Mach {formatNumber(view.machCritical)})</strong> : view.regime === "subcritical" ? `subcritical (critical Mach ${formatNumber(view.machCritical)})` : "critical Mach not checked (no Cp,min)"}
            </span>
            {busy || picked.state !== "idle" ? <span className="text-xs text-ink-muted" role="status">Computing…</span> : null}
          </div>
          {view.warnings.length ? (
            <ul className="mb-4 list-disc pl-5 text-sm text-warn">
              {view.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          ) : null}
          <div className="grid gap-4 xl:grid-cols-2">
            <Chart option={loadingOption(view) as never} label="Spanwise loading" fileName={`loading-${view.caseId}`} />
            <Chart option={clOption(view) as never} label="Section lift coefficient" fileName={`cl-${view.caseId}`} />
            <Chart option={rulesOption(view, "cl") as never} label="cl by compressibility rule" fileName={`rules-cl-${view.caseId}`} />
            <Chart option={rulesOption(view, "cm") as never} label="cm by compressibility rule" fileName={`rules-cm-${view.caseId}`} />
            <Chart option={machCriticalOption(view) as never} label="Critical Mach number" fileName={`mcrit-${view.caseId}`} />
            <Panel title="The three rules for this case">
              <table className="w-full text-sm tabular">
                <thead className="text-xs text-ink-muted">
                  <tr>
                    <th className="py-1 text-left">Rule</th>
                    <th className="py-1 pl-3 text-right">CLα [/rad]</th>
                    <th className="py-1 pl-3 text-right">CL</th>
                    <th className="py-1 pl-3 text-right">Lowest critical Mach</th>
                  </tr>
                </thead>
                <tbody>
                  {view.rules.map((r) => (
                    <tr key={r.rule} className="border-t border-line">
                      <td className="py-1">{RULE_LABELS[r.rule]}</td>
                      <td className="py-1 pl-3 text-right">{formatNumber(r.clAlpha)}</td>
                      <td className="py-1 pl-3 text-right">{formatNumber(r.CL)}</td>
                      <td className="py-1 pl-3 text-right">{formatNumber(r.machCritical)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </Panel>
          </div>
          <Panel title={`Flagged cases (${flags.length})`} className="mt-5">
            {flags.length === 0 ? (
              <p className="text-sm text-ink-muted">No case is above its critical Mach number or over a section clmax.</p>
            ) : (
              <Form method="post">
                <input type="hidden" name="revision" value={loaderData.revision} />
                <table className="w-full text-left text-sm">
                  <thead className="text-xs uppercase tracking-wide text-ink-muted">
                    <tr>
                      <th className="py-1.5 pr-3">Case</th>
                      <th className="py-1.5 pr-3">Why it is flagged</th>
                      <th className="py-1.5 pr-3">Disposition</th>
                      <th className="py-1.5">Justification</th>
                    </tr>
                  </thead>
                  <tbody>
                    {flags.map((f, i) => {
                      const d = (loaderData.dispositions as Record<string, { action: string; comment: string } | undefined>)[f.id];
                      return (
                        <tr key={f.id} className="border-t border-line align-top">
                          <td className="py-2 pr-3 font-semibold">
                            <input type="hidden" name={`dispositions.${i}.id`} value={f.id} />
                            <Link
                              to={`?case=${encodeURIComponent(f.id)}`}
                              preventScrollReset
                              onClick={(e) => {
                                e.preventDefault();
                                show(f.id);
                              }}
                            >
                              {f.id}
                            </Link>
                          </td>
                          <td className="py-2 pr-3 text-danger">
                            {f.reasons.map((r) => (
                              <span key={r} className="block">
                                ⚠ {r}
                              </span>
                            ))}
                          </td>
                          <td className="py-2 pr-3">
                            <select name={`dispositions.${i}.action`} defaultValue={d?.action ?? "none"} disabled={!loaderData.canEdit} aria-label={`Disposition of ${f.id}`} className="rounded border border-line-strong px-2 py-1">
                              <option value="none">— not yet —</option>
                              <option value="exclude">Exclude from the loads</option>
                              <option value="justify">Keep, justified</option>
                            </select>
                          </td>
                          <td className="py-2">
                            <textarea name={`dispositions.${i}.comment`} defaultValue={d?.comment ?? ""} disabled={!loaderData.canEdit} rows={2} aria-label={`Justification for ${f.id}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                          </td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
                {loaderData.canEdit ? (
                  <Button type="submit" className="mt-3" disabled={busy}>
                    Save dispositions
                  </Button>
                ) : null}
              </Form>
            )}
          </Panel>
        </>
      ) : null}
    </>
  );
}

export function meta() {
  return [{ title: "Distribution · Spanwright" }];
}
