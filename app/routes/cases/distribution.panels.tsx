import { useEffect } from "react";
import { Form, href, Link, useFetcher } from "react-router";
import { spanwiseWaysOption } from "~/charts/comparisons";
import { clOption, loadingOption, machCriticalOption, rulesOption } from "~/charts/distribution";
import { Chart } from "~/components/charts/chart";
import { Button } from "~/components/ui/button";
import { Panel } from "~/components/ui/page-header";
import { RULE_LABELS, type DistributionData } from "~/domain/step-data";
import { formatChange, formatPercent, sensitivityProgressText, SPANWISE_WAY_LABELS, type RuleSensitivity, type SensitivityProgress, type SpanwiseComparison } from "~/domain/comparisons";
import { formatNumber, formatQuantity, fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { CaseFlag, DistributionView } from "~/services/distribution.server";
import { methodUsedLines } from "~/domain/method-statement";
import type { ResultMethod } from "~/exchange";

type View = Omit<DistributionView, "cases"> & { cases: string[] };

/** The case shown, chosen from every case of the envelope (flagged ones marked), and its condition. */
export function CasePicker({ view, units, flags, computing, show }: { view: View; units: UnitSystem; flags: CaseFlag[]; computing: boolean; show: (id: string) => void }) {
  return (
    <>
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
          Mach {formatNumber(view.mach)} · {formatQuantity(units, "altitude", view.altitude, 5)} · CL {formatNumber(view.CL)} · α {formatNumber(view.alphaDeg)}° · {RULE_LABELS[view.rule]} ·{" "}
          {view.regime === "supercritical" ? <strong className="text-danger">supercritical (critical Mach {formatNumber(view.machCritical)})</strong> : view.regime === "subcritical" ? `subcritical (critical Mach ${formatNumber(view.machCritical)})` : "critical Mach not checked (no Cp,min)"}
          {view.machCriticalSwept !== null && view.machCritical !== null && view.machCriticalSwept > view.machCritical + 1e-9 ? ` · simple sweep theory ${view.machCriticalSwept >= 1 ? "above 1" : formatNumber(view.machCriticalSwept)} (optimistic)` : ""}
        </span>
        {computing ? <span className="text-xs text-ink-muted" role="status">Computing…</span> : null}
      </div>
      {view.warnings.length ? (
        <ul className="mb-4 list-disc pl-5 text-sm text-warn">
          {view.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : null}
    </>
  );
}

/** What the solve used, and how far its resolution can be trusted: strips, convergence, section scaling, critical-Mach basis. */
export function MethodUsedPanel({ method, machCriticalSwept }: { method: ResultMethod; machCriticalSwept: number | null }) {
  return (
    <Panel title="Method used for this case file" className="mb-4">
      <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]" data-testid="method-used">
        {methodUsedLines(method).map(([label, text]) => (
          <div key={label} className="contents">
            <dt className="font-semibold">{label}</dt>
            <dd>
              {text}
              {label === "Critical Mach number"
                ? `; unswept sections, conservative${machCriticalSwept !== null ? ` (simple sweep theory, optimistic, would give ${machCriticalSwept >= 1 ? "above 1" : formatNumber(machCriticalSwept)} for the case shown)` : ""}`
                : ""}
            </dd>
          </div>
        ))}
      </dl>
    </Panel>
  );
}

/** The solver's loading beside Schrenk's, cl, cl and cm under each rule, critical Mach by station. */
export function DistributionCharts({ view, units }: { view: View; units: UnitSystem }) {
  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Chart option={loadingOption(view, units)} label="Spanwise loading" fileName={`loading-${view.caseId}`} />
      <Chart option={clOption(view, units)} label="Section lift coefficient" fileName={`cl-${view.caseId}`} />
      <Chart option={rulesOption(view, "cl", units)} label="cl by compressibility rule" fileName={`rules-cl-${view.caseId}`} />
      <Chart option={rulesOption(view, "cm", units)} label="cm by compressibility rule" fileName={`rules-cm-${view.caseId}`} />
      <Chart option={machCriticalOption(view, units)} label="Critical Mach number" fileName={`mcrit-${view.caseId}`} />
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
  );
}

/** Each flagged case with why, and the engineer's disposition: exclude it, or keep it with a justification. */
export function DispositionsPanel({ flags, dispositions, revision, canEdit, busy, show }: { flags: CaseFlag[]; dispositions: DistributionData["dispositions"]; revision: number; canEdit: boolean; busy: boolean; show: (id: string) => void }) {
  return (
    <Panel title={`Flagged cases (${flags.length})`} className="mt-5">
      {flags.length === 0 ? (
        <p className="text-sm text-ink-muted">No case is above its critical Mach number or over a section clmax.</p>
      ) : (
        <Form method="post">
          <input type="hidden" name="revision" value={revision} />
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
                const d = dispositions[f.id];
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
                      <select name={`dispositions.${i}.action`} defaultValue={d?.action ?? "none"} disabled={!canEdit} aria-label={`Disposition of ${f.id}`} className="rounded border border-line-strong px-2 py-1">
                        <option value="none">— not yet —</option>
                        <option value="exclude">Exclude from the loads</option>
                        <option value="justify">Keep, justified</option>
                      </select>
                    </td>
                    <td className="py-2">
                      <textarea name={`dispositions.${i}.comment`} defaultValue={d?.comment ?? ""} disabled={!canEdit} rows={2} aria-label={`Justification for ${f.id}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {canEdit ? (
            <Button type="submit" className="mt-3" disabled={busy}>
              Save dispositions
            </Button>
          ) : null}
        </Form>
      )}
    </Panel>
  );
}

type Refusal = { error: string; message: string };
const refusalOf = (d: unknown): string | null => (d && typeof d === "object" && "error" in d ? (d as Refusal).message : null);

/** A root load in the case's display units, without the symbol. */
const root = (units: UnitSystem, q: "shear" | "bending" | "torsion", si: number) => formatNumber(fromSI(units, q === "shear" ? "force" : "moment", si), 5);

/**
 * The root loads of the critical cases (those giving the six root extremes of the envelope) under
 * each compressibility rule side by side, with the spread between the rules. The job worker solves
 * them; the panel asks for them after the page shows, and each second while the worker runs.
 */
export function RuleSensitivityPanel({ caseId, revision }: { caseId: string; revision: number }) {
  const data = useFetcher<{ units: UnitSystem; sensitivity: RuleSensitivity } | { state: "pending"; progress: SensitivityProgress } | Refusal>();
  const { load } = data;
  const url = href("/api/cases/:caseId/rule-sensitivity", { caseId });
  // Asked again for a new revision of the step: the same address answers for the new inputs.
  useEffect(() => {
    load(url);
  }, [load, url, revision]);
  const failed = refusalOf(data.data);
  const loaded = data.data && "sensitivity" in data.data ? data.data : null;
  const progress = data.data && "progress" in data.data ? data.data.progress : null;
  useEffect(() => {
    if (!progress) return;
    const t = setTimeout(() => load(url), 1000);
    return () => clearTimeout(t);
  }, [progress, load, url]);
  return (
    <Panel title="Sensitivity to the compressibility rule" className="mt-5">
      {failed ? (
        <p className="text-sm text-danger">{failed}</p>
      ) : !loaded ? (
        <div className="text-sm" role="status">
          <p className="text-ink-muted">{progress ? sensitivityProgressText(progress) : "Solving the critical cases under each rule…"}</p>
          <div className="mt-2 h-1.5 w-full overflow-hidden rounded bg-canvas" role="progressbar" aria-label="Critical cases solved under each rule" aria-valuemin={0} aria-valuemax={100} aria-valuenow={progress && progress.total > 0 ? Math.round((100 * progress.done) / progress.total) : 0}>
            <div className="h-full rounded bg-accent" style={{ width: `${progress && progress.total > 0 ? ((100 * progress.done) / progress.total).toFixed(1) : 0}%` }} />
          </div>
        </div>
      ) : (
        <RuleSensitivityTable units={loaded.units} s={loaded.sensitivity} />
      )}
    </Panel>
  );
}

function RuleSensitivityTable({ units, s }: { units: UnitSystem; s: RuleSensitivity }) {
  const f = unitSymbol(units, "force");
  const m = unitSymbol(units, "moment");
  const spread = (c: RuleSensitivity["cases"][number], q: "shear" | "bending" | "torsion") => {
    const display = (si: number) => fromSI(units, q === "shear" ? "force" : "moment", si);
    const change = formatChange(display(c.spread[q]), Math.max(...c.rules.map((r) => Math.abs(display(r.root[q])))));
    return `${change.replace("+", "")} (${formatPercent(c.relative[q])})`;
  };
  return (
    <>
      <div className="overflow-x-auto">
        <table className="w-full text-sm tabular" aria-label="Root loads of the critical cases under each compressibility rule">
          <thead className="text-xs text-ink-muted">
            <tr>
              <th className="py-1 pr-3 text-left">Case</th>
              <th className="py-1 pr-3 text-left">Rule</th>
              <th className="py-1 pl-3 text-right">Root shear [{f}]</th>
              <th className="py-1 pl-3 text-right">Root bending [{m}]</th>
              <th className="py-1 pl-3 text-right">Root torsion [{m}]</th>
              <th className="py-1 pl-3 text-right">Critical Mach</th>
            </tr>
          </thead>
          {s.cases.map((c) => (
            <tbody key={c.id} className="border-t-2 border-line-strong">
              {c.rules.map((r, i) => (
                <tr key={r.rule} className={`border-t border-line ${r.rule === s.chosen ? "font-semibold" : ""}`}>
                  <td className="py-1 pr-3 align-top">{i === 0 ? <><span className="font-semibold">{c.id}</span> <span className="block text-xs font-normal text-ink-muted">{c.gives.join(", ")} · Mach {formatNumber(c.mach)}</span></> : null}</td>
                  <td className="py-1 pr-3">
                    {RULE_LABELS[r.rule]}
                    {r.rule === s.chosen ? " (this case's rule)" : ""}
                  </td>
                  <td className="py-1 pl-3 text-right">{root(units, "shear", r.root.shear)}</td>
                  <td className="py-1 pl-3 text-right">{root(units, "bending", r.root.bending)}</td>
                  <td className="py-1 pl-3 text-right">{root(units, "torsion", r.root.torsion)}</td>
                  <td className={`py-1 pl-3 text-right ${r.regime === "supercritical" ? "text-danger" : ""}`}>
                    {formatNumber(r.machCritical)}
                    {r.regime === "supercritical" ? " ⚠ below the case Mach" : ""}
                  </td>
                </tr>
              ))}
              <tr className="border-t border-line bg-canvas/60 text-ink-muted">
                <td className="py-1 pr-3" />
                <td className="py-1 pr-3">Spread (largest − smallest)</td>
                <td className="py-1 pl-3 text-right">{spread(c, "shear")}</td>
                <td className="py-1 pl-3 text-right">{spread(c, "bending")}</td>
                <td className="py-1 pl-3 text-right">{spread(c, "torsion")}</td>
                <td className="py-1 pl-3" />
              </tr>
            </tbody>
          ))}
        </table>
      </div>
      <p className="mt-2 text-xs text-ink-muted">{s.basis} The spread in per cent is of the largest magnitude of the three.</p>
    </>
  );
}

/**
 * The case shown, by the vortex lattice, the lifting line and Schrenk's approximation where each is
 * valid: running lift overlaid, root loads with their difference from the case's own method, and
 * why a method is absent.
 */
export function SpanwiseMethodsPanel({ caseId, loadCase, revision }: { caseId: string; loadCase: string; revision: number }) {
  const data = useFetcher<{ units: UnitSystem; comparison: SpanwiseComparison } | Refusal>();
  const { load } = data;
  useEffect(() => {
    load(`${href("/api/cases/:caseId/spanwise-methods", { caseId })}?case=${encodeURIComponent(loadCase)}`);
  }, [load, caseId, loadCase, revision]);
  const failed = refusalOf(data.data);
  const loaded = data.data && "comparison" in data.data && data.data.comparison.caseId === loadCase ? data.data : null;
  return (
    <Panel title={`Spanwise methods compared: case ${loadCase}`} className="mt-5">
      {failed ? (
        <p className="text-sm text-danger">{failed}</p>
      ) : !loaded ? (
        <p className="text-sm text-ink-muted" role="status">
          Solving case {loadCase} by each spanwise method…
        </p>
      ) : (
        <SpanwiseMethods units={loaded.units} c={loaded.comparison} />
      )}
    </Panel>
  );
}

function SpanwiseMethods({ units, c }: { units: UnitSystem; c: SpanwiseComparison }) {
  const base = c.ways.find((w) => w.way === c.chosen);
  const delta = (q: "shear" | "bending" | "torsion", v: number) => {
    if (!base?.valid) return "—";
    const display = (si: number) => fromSI(units, q === "shear" ? "force" : "moment", si);
    const d = v - base.root[q];
    const rel = base.root[q] !== 0 ? ` (${formatPercent(d / Math.abs(base.root[q]))})` : "";
    return `${formatChange(display(d), display(base.root[q]))}${rel}`;
  };
  const f = unitSymbol(units, "force");
  const m = unitSymbol(units, "moment");
  const lift = { symbol: unitSymbol(units, "runningLoad"), scale: (si: number) => fromSI(units, "runningLoad", si) };
  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Chart option={spanwiseWaysOption(c, lift, units)} label={`Running lift of case ${c.caseId} by spanwise method`} fileName={`methods-${c.caseId}`} />
      <div className="overflow-x-auto">
        <table className="w-full text-sm tabular" aria-label="Root loads by spanwise method">
          <thead className="text-xs text-ink-muted">
            <tr>
              <th className="py-1 pr-3 text-left">Method</th>
              <th className="py-1 pl-3 text-right">CL</th>
              <th className="py-1 pl-3 text-right">Root shear [{f}]</th>
              <th className="py-1 pl-3 text-right">Root bending [{m}]</th>
              <th className="py-1 pl-3 text-right">Root torsion [{m}]</th>
            </tr>
          </thead>
          <tbody>
            {c.ways.map((w) =>
              w.valid ? (
                <tr key={w.way} className={`border-t border-line align-top ${w.way === c.chosen ? "font-semibold" : ""}`}>
                  <td className="py-1 pr-3">
                    {SPANWISE_WAY_LABELS[w.way]}
                    {w.way === c.chosen ? " (this case's method)" : ""}
                  </td>
                  <td className="py-1 pl-3 text-right">{formatNumber(w.CL)}</td>
                  {(["shear", "bending", "torsion"] as const).map((q) => (
                    <td key={q} className="py-1 pl-3 text-right">
                      {root(units, q, w.root[q])}
                      {w.way !== c.chosen ? <span className="block text-xs text-ink-muted">{delta(q, w.root[q])}</span> : null}
                    </td>
                  ))}
                </tr>
              ) : (
                <tr key={w.way} className="border-t border-line align-top">
                  <td className="py-1 pr-3">{SPANWISE_WAY_LABELS[w.way]}</td>
                  <td colSpan={4} className="py-1 pl-3 text-warn">
                    ⚠ Not shown: {w.reason}
                  </td>
                </tr>
              ),
            )}
          </tbody>
        </table>
        <p className="mt-2 text-xs text-ink-muted">
          Differences are from the case's own method. Both solvers run at the case's Mach number under its rule; a case given by α carries each solver's own lift, Schrenk's approximation the lift of the case's method, its basic loading that of the incompressible sections.
        </p>
      </div>
    </div>
  );
}
