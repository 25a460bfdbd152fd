import { useVirtualizer } from "@tanstack/react-virtual";
import { memo, useEffect, useRef, useState } from "react";
import { href, useFetcher, type FetcherWithComponents } from "react-router";
import { spanwiseWaysChartOption } from "~/charts/comparisons";
import { distributionChartOptions } from "~/charts/distribution";
import { Chart } from "~/components/charts/chart";
import { Button } from "~/components/ui/button";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useLoadAfterInteractive } from "~/components/ui/use-after-interactive";
import { useRowPages } from "~/components/ui/use-row-pages";
import { measureWhenLaidOut } from "~/components/ui/virtual-rows";
import { Alert, Panel } from "~/components/ui/page-header";
import type { FlagReason } from "~/domain/results";
import { RULE_LABELS, type StepStatus } from "~/domain/vocabulary";
import { formatChange, formatPercent, sensitivityProgressText, SPANWISE_WAY_LABELS, type RuleSensitivity, type SensitivityProgress, type SpanwiseComparison } from "~/domain/comparisons";
import { formatNumber, formatQuantity, fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { DistributionDrawings } from "~/charts/drawings.server";
import type { DistributionPageView, DistributionSummary, FlagWindow } from "~/services/distribution.server";
import type { FieldErrors } from "~/utils/form-data";
import type { action as restoreAction } from "../api/case-step-restore";
import { methodUsedLines } from "~/domain/method-statement";
import type { ResultMethod } from "~/exchange";

type View = DistributionPageView;

/** The answer of a dispositions save, as the page's fetcher holds it. */
export type SaveAnswer = { ok: boolean; message: string | null; fieldErrors: FieldErrors };
export type SaveFetcher = FetcherWithComponents<SaveAnswer>;

type Suggestions = { matches: { id: string; flagged: boolean }[]; more: boolean };

/**
 * The case shown: found by typing part of its id (the server suggests matching cases, a few at a
 * time, flagged ones marked), and its condition once its distribution has been computed.
 */
export function CasePicker({ caseId, shownId, view, units, computing, failed, show }: { caseId: string; shownId: string; view: View | null; units: UnitSystem; computing: boolean; failed: string | null; show: (id: string) => void }) {
  const [text, setText] = useState("");
  const search = useFetcher<Suggestions>();
  const { load } = search;
  useEffect(() => {
    if (text.trim()) load(`${href("/api/cases/:caseId/load-case-search", { caseId })}?q=${encodeURIComponent(text.trim())}`);
  }, [load, caseId, text]);
  const matches = text.trim() && search.data && "matches" in search.data ? search.data : null;
  return (
    <>
      <div className="mb-4 flex flex-wrap items-start gap-3 text-sm">
        <search aria-label="Find a load case" className="relative">
          <form
            className="flex items-center gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              if (text.trim()) show(text.trim());
            }}
          >
            <label className="font-semibold" htmlFor="case-search">
              Case
            </label>
            <input id="case-search" value={text} onChange={(e) => setText(e.target.value)} placeholder={shownId} autoComplete="off" aria-describedby="case-search-help" className="w-44 rounded border border-line-strong px-2 py-1" />
            <Button type="submit" variant="secondary">
              Show
            </Button>
          </form>
          <p id="case-search-help" className="mt-1 text-xs text-ink-muted">
            Type part of a case id; matching cases are suggested (⚠ flagged).
          </p>
          {matches ? (
            <ul aria-label="Matching cases" className="mt-1 max-h-64 w-64 overflow-auto rounded border border-line bg-surface">
              {matches.matches.length === 0 ? <li className="px-2 py-1 text-ink-muted">No case id holds “{text.trim()}”.</li> : null}
              {matches.matches.map((m) => (
                <li key={m.id}>
                  <button
                    type="button"
                    className="w-full px-2 py-1 text-left hover:bg-canvas"
                    onClick={() => {
                      show(m.id);
                      setText("");
                    }}
                  >
                    {m.id}
                    {m.flagged ? " ⚠" : ""}
                  </button>
                </li>
              ))}
              {matches.more ? <li className="px-2 py-1 text-xs text-ink-muted">More cases match: type more of the id.</li> : null}
            </ul>
          ) : null}
        </search>
        <span className="tabular text-ink-muted">
          <strong className="text-ink">Case {shownId}</strong>
          {view ? (
            <>
              {" "}
              · Mach {formatNumber(view.mach)} · {formatQuantity(units, "altitude", view.altitude, 5)} · CL {formatNumber(view.CL)} · α {formatNumber(view.alphaDeg)}° · {RULE_LABELS[view.rule]} ·{" "}
              {view.regime === "supercritical" ? <strong className="text-danger">supercritical (critical Mach {formatNumber(view.machCritical)})</strong> : view.regime === "subcritical" ? `subcritical (critical Mach ${formatNumber(view.machCritical)})` : "critical Mach not checked (no Cp,min)"}
              {view.machCriticalSwept !== null && view.machCritical !== null && view.machCriticalSwept > view.machCritical + 1e-9 ? ` · simple sweep theory ${view.machCriticalSwept >= 1 ? "above 1" : formatNumber(view.machCriticalSwept)} (optimistic)` : ""}
            </>
          ) : null}
        </span>
        {computing ? (
          <span className="text-xs text-ink-muted" role="status">
            Computing the distribution of case {shownId}…
          </span>
        ) : null}
      </div>
      {failed ? <p className="mb-4 text-sm text-danger">{failed}</p> : null}
      {view?.warnings.length ? (
        <ul className="mb-4 list-disc pl-5 text-sm text-warn">
          {view.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : null}
    </>
  );
}

// The panels are memoised: the route renders again at each step of its fetchers (the shown case's
// distribution, the methods compared, the rule sensitivity), and a panel whose props did not change
// need not (the flagged-cases table with its rows least of all).

/** What the solve used, and how far its resolution can be trusted: strips, convergence, section scaling, critical-Mach basis. */
export const MethodUsedPanel = memo(function MethodUsedPanel({ method, machCriticalSwept }: { method: ResultMethod; machCriticalSwept: number | null }) {
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
});

/** The solver's loading beside Schrenk's, cl, cl and cm under each rule, critical Mach by station. */
export const DistributionCharts = memo(function DistributionCharts({ view, units }: { view: View & { drawings: DistributionDrawings }; units: UnitSystem }) {
  const options = distributionChartOptions(view, units);
  const svg = view.drawings;
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <Chart option={options.loading} svg={svg.loading} label="Spanwise loading" fileName={`loading-${view.caseId}`} />
      <Chart option={options.cl} svg={svg.cl} label="Section lift coefficient" fileName={`cl-${view.caseId}`} />
      <Chart option={options.rulesCl} svg={svg.rulesCl} label="cl by compressibility rule" fileName={`rules-cl-${view.caseId}`} />
      <Chart option={options.rulesCm} svg={svg.rulesCm} label="cm by compressibility rule" fileName={`rules-cm-${view.caseId}`} />
      <Chart option={options.machCritical} svg={svg.machCritical} label="Critical Mach number" fileName={`mcrit-${view.caseId}`} />
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
});

/**
 * How many cases are flagged for each reason and how many of them still wait for a disposition, with
 * one disposition for every case of a reason: at the scale of a large case file, a loads engineer
 * excludes, or justifies with one comment, all the cases flagged for the same cause.
 */
export const FlagSummaryPanel = memo(function FlagSummaryPanel({ summary, revision, canEdit, save }: { summary: DistributionSummary; revision: number; canEdit: boolean; save: SaveFetcher }) {
  if (summary.flagged === 0) return null;
  return (
    <Panel title="Flagged cases by reason" className="mt-5">
      <table className="w-full text-sm tabular" aria-label="Flagged cases by reason">
        <thead className="text-xs text-ink-muted">
          <tr>
            <th className="py-1 pr-3 text-left">Reason</th>
            <th className="py-1 pl-3 text-right">Cases</th>
            <th className="py-1 pl-3 text-right">Without a disposition</th>
            {canEdit ? <th className="py-1 pl-3 text-left">Disposition for every case of this reason</th> : null}
          </tr>
        </thead>
        <tbody>
          {summary.byReason.map((r) => (
            <tr key={r.reason} className="border-t border-line align-top">
              <td className="py-2 pr-3">{r.label}</td>
              <td className="py-2 pl-3 text-right">{formatNumber(r.count, 15)}</td>
              <td className="py-2 pl-3 text-right">{formatNumber(r.open, 15)}</td>
              {canEdit ? (
                <td className="py-2 pl-3">
                  <BulkDisposition reason={r.reason} label={r.label} count={r.count} revision={revision} save={save} />
                </td>
              ) : null}
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-ink-muted">A case may be flagged for more than one reason. A disposition for every case of a reason replaces the dispositions those cases had, and is saved and recorded as any other.</p>
    </Panel>
  );
});

function BulkDisposition({ reason, label, count, revision, save }: { reason: FlagReason; label: string; count: number; revision: number; save: SaveFetcher }) {
  const [action, setAction] = useState<"exclude" | "justify">("exclude");
  const [comment, setComment] = useState("");
  return (
    <form
      className="flex flex-wrap items-start gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.submit({ intent: "bulk", revision, reason, action, comment }, { method: "post", encType: "application/json" });
      }}
    >
      <select value={action} onChange={(e) => setAction(e.target.value as "exclude" | "justify")} aria-label={`Disposition for every case: ${label}`} className="rounded border border-line-strong px-2 py-1">
        <option value="exclude">Exclude from the loads</option>
        <option value="justify">Keep, justified</option>
      </select>
      {action === "justify" ? <input value={comment} onChange={(e) => setComment(e.target.value)} aria-label={`Justification for every case: ${label}`} placeholder="One justification for all" className="min-w-64 flex-1 rounded border border-line-strong px-2 py-1" /> : null}
      <Button type="submit" variant="secondary" disabled={save.state !== "idle"}>
        Apply to all {formatNumber(count, 15)}
      </Button>
    </form>
  );
}

type Row = FlagWindow["rows"][number];
type Edit = { action: "none" | "exclude" | "justify"; comment: string };
/** A flagged row's height with one reason (the two-line justification box sets it), and what each further reason adds. */
const FLAG_ROW_PX = 69;
const REASON_LINE_PX = 22;

/**
 * Each flagged case with why, and the engineer's disposition: exclude it, or keep it with a
 * justification. The page carries the first rows; the others are fetched by range as they scroll into
 * view. Changed rows are kept here until saved, in view or not, and the save sends only them, on the
 * revision they were made on.
 */
export const DispositionsPanel = memo(function DispositionsPanel({ caseId, total, first, revision, canEdit, status, save, show }: { caseId: string; total: number; first: Row[]; revision: number; canEdit: boolean; status: StepStatus; save: SaveFetcher; show: (id: string) => void }) {
  const [edits, setEdits] = useState<Map<string, Edit>>(() => new Map());
  const scroller = useRef<HTMLDivElement>(null);
  // A new revision (a save here, a disposition for a whole reason) drops the edits made on the old one.
  const [editedOn, setEditedOn] = useState(revision);
  if (editedOn !== revision) {
    setEditedOn(revision);
    setEdits(new Map());
  }
  // The first rows (those the page carries) estimated at the height they will have: measured, they are not drawn again.
  const estimate = (i: number) => FLAG_ROW_PX + Math.max(0, (first[i]?.reasons.length ?? 1) - 1) * REASON_LINE_PX;
  const virtualizer = useVirtualizer({ count: total, getScrollElement: () => scroller.current, estimateSize: estimate, measureElement: measureWhenLaidOut, overscan: 8, initialRect: { width: 0, height: 512 } });
  const items = virtualizer.getVirtualItems();
  const { rowAt, stale } = useRowPages({ source: href("/api/cases/:caseId/flagged-cases", { caseId }), first, total, revision, firstIndex: items[0]?.index ?? 0, lastIndex: items[items.length - 1]?.index ?? 0 });
  const valueOf = (row: Row): Edit => edits.get(row.id) ?? { action: row.disposition?.action ?? "none", comment: row.disposition?.comment ?? "" };
  const edit = (row: Row, change: Partial<Edit>) => setEdits((m) => new Map(m).set(row.id, { ...valueOf(row), ...change }));
  const busy = save.state !== "idle";
  const errors = save.state === "idle" && save.data && !save.data.ok ? save.data.fieldErrors : {};
  const padTop = items[0]?.start ?? 0;
  const padBottom = virtualizer.getTotalSize() - (items[items.length - 1]?.end ?? 0);
  return (
    <Panel title={`Flagged cases (${formatNumber(total, 15)})`} className="mt-5">
      <UnsavedGuard dirty={edits.size > 0} />
      {total === 0 ? (
        <p className="text-sm text-ink-muted">No case is above its critical Mach number or over a section clmax.</p>
      ) : (
        <>
          {stale ? (
            <div className="mb-2">
              <Alert tone="warn">The dispositions were saved again since this page was opened (revision {revision} shown). Reload the page before editing.</Alert>
            </div>
          ) : null}
          <div ref={scroller} className="max-h-[32rem] overflow-auto rounded border border-line" data-testid="flagged-cases">
            <table className="w-full text-left text-sm" aria-rowcount={total + 1}>
              <caption className="sr-only">Flagged cases and their dispositions</caption>
              <thead className="sticky top-0 z-10 bg-canvas text-xs uppercase tracking-wide text-ink-muted">
                <tr>
                  <th className="px-2 py-1.5">Case</th>
                  <th className="px-2 py-1.5">Why it is flagged</th>
                  <th className="px-2 py-1.5">Disposition</th>
                  <th className="px-2 py-1.5">Justification</th>
                </tr>
              </thead>
              <tbody>
                {padTop > 0 ? <tr aria-hidden="true" style={{ height: padTop }} /> : null}
                {items.map((item) => {
                  const row = rowAt(item.index);
                  if (!row)
                    return (
                      <tr key={item.key} data-index={item.index} ref={virtualizer.measureElement} aria-rowindex={item.index + 2} style={{ height: FLAG_ROW_PX }} className="border-t border-line">
                        <td colSpan={4} className="px-2 text-ink-faint">
                          …
                        </td>
                      </tr>
                    );
                  const value = valueOf(row);
                  const comment = errors[`dispositions.${row.id}.comment`] ?? [];
                  return (
                    <tr key={item.key} data-index={item.index} ref={virtualizer.measureElement} aria-rowindex={item.index + 2} className={`border-t border-line align-top ${edits.has(row.id) ? "bg-accent-soft" : ""}`}>
                      <td className="px-2 py-2 font-semibold">
                        {/* A plain link, not the router's: a router Link renders again at each change of the router's
                            state (every fetch of this page), and each row has one. Before the scripts run it opens the case. */}
                        <a
                          href={`?case=${encodeURIComponent(row.id)}`}
                          onClick={(e) => {
                            e.preventDefault();
                            show(row.id);
                          }}
                        >
                          {row.id}
                        </a>
                      </td>
                      <td className="px-2 py-2 text-danger">
                        {row.reasons.map((r) => (
                          <span key={r} className="block">
                            ⚠ {r}
                          </span>
                        ))}
                      </td>
                      <td className="px-2 py-2">
                        <select value={value.action} onChange={(e) => edit(row, { action: e.target.value as Edit["action"] })} disabled={!canEdit || busy} aria-label={`Disposition of ${row.id}`} className="rounded border border-line-strong px-2 py-1">
                          <option value="none">— not yet —</option>
                          <option value="exclude">Exclude from the loads</option>
                          <option value="justify">Keep, justified</option>
                        </select>
                      </td>
                      <td className="px-2 py-2">
                        <textarea
                          value={value.comment}
                          onChange={(e) => edit(row, { comment: e.target.value })}
                          disabled={!canEdit || busy}
                          rows={2}
                          aria-label={`Justification for ${row.id}`}
                          aria-invalid={comment.length > 0}
                          title={comment.join(" ")}
                          className="w-full rounded border border-line-strong px-2 py-1 text-sm aria-[invalid=true]:border-danger aria-[invalid=true]:bg-danger-soft"
                        />
                      </td>
                    </tr>
                  );
                })}
                {padBottom > 0 ? <tr aria-hidden="true" style={{ height: padBottom }} /> : null}
              </tbody>
            </table>
          </div>
          {canEdit ? (
            <div className="mt-3 flex flex-wrap items-center gap-3">
              <Button type="button" disabled={busy || edits.size === 0} onClick={() => save.submit({ intent: "rows", revision, changed: [...edits].map(([id, e]) => ({ id, ...e })) }, { method: "post", encType: "application/json" })}>
                Save dispositions
              </Button>
              <span className="text-xs text-ink-muted">
                {edits.size ? `${formatNumber(edits.size, 15)} changed, not saved` : "No change yet"} · revision {revision}
              </span>
            </div>
          ) : (
            <p className="mt-3 text-sm text-ink-muted">{status === "submitted" ? "Submitted for check: read-only until returned or approved." : "Read-only for your role."}</p>
          )}
        </>
      )}
    </Panel>
  );
});

type Refusal = { error: string; message: string };
const refusalOf = (d: unknown): string | null => (d && typeof d === "object" && "error" in d ? (d as Refusal).message : null);

/** A root load in the case's display units, without the symbol. */
const root = (units: UnitSystem, q: "shear" | "bending" | "torsion", si: number) => formatNumber(fromSI(units, q === "shear" ? "force" : "moment", si), 5);

/**
 * The root loads of the critical cases (those giving the six root extremes of the envelope) under
 * each compressibility rule side by side, with the spread between the rules. The job worker solves
 * them; the panel asks for them after the page shows, and each second while the worker runs.
 */
export const RuleSensitivityPanel = memo(function RuleSensitivityPanel({ caseId, revision }: { caseId: string; revision: number }) {
  const data = useFetcher<{ units: UnitSystem; sensitivity: RuleSensitivity } | { state: "pending"; progress: SensitivityProgress } | Refusal>();
  const { load } = data;
  const url = href("/api/cases/:caseId/rule-sensitivity", { caseId });
  // Asked again for a new revision of the step: the same address answers for the new inputs.
  useLoadAfterInteractive(load, url, revision);
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
});

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
export const SpanwiseMethodsPanel = memo(function SpanwiseMethodsPanel({ caseId, loadCase, revision }: { caseId: string; loadCase: string; revision: number }) {
  const data = useFetcher<{ units: UnitSystem; comparison: SpanwiseComparison; drawing: string } | Refusal>();
  useLoadAfterInteractive(data.load, `${href("/api/cases/:caseId/spanwise-methods", { caseId })}?case=${encodeURIComponent(loadCase)}`, revision);
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
        <SpanwiseMethods units={loaded.units} c={loaded.comparison} drawing={loaded.drawing} />
      )}
    </Panel>
  );
});

function SpanwiseMethods({ units, c, drawing }: { units: UnitSystem; c: SpanwiseComparison; drawing: string }) {
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
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <Chart option={spanwiseWaysChartOption(c, units)} svg={drawing} label={`Running lift of case ${c.caseId} by spanwise method`} fileName={`methods-${c.caseId}`} />
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

/** The restore's fetcher, shared by key with the page, which shows its answer once the step is back (this panel is then gone). */
export const RESTORE_FETCHER_KEY = "restore-saved-revision";

/**
 * Where the stored dispositions were changed outside Spanwright: an administrator puts back the
 * step's current revision as it was saved (its record is checked against its hash by the server).
 * The page reloads its data after the answer, and shows the step again, with the answer, once it is put back.
 */
export function RestoreRevisionPanel({ caseId, revision }: { caseId: string; revision: number }) {
  const restore = useFetcher<typeof restoreAction>({ key: RESTORE_FETCHER_KEY });
  const answered = restore.state === "idle" ? restore.data : undefined;
  const refusal = answered && !answered.ok ? [answered.message, ...Object.values(answered.fieldErrors).flat()].filter(Boolean).join(" ") : null;
  return (
    <div className="mt-4">
      <Panel title="Put back the saved revision">
        <restore.Form method="post" action={href("/api/cases/:caseId/steps/:step/restore", { caseId, step: "distribution" })}>
          <input type="hidden" name="revision" value={revision} />
          <p className="mb-3 text-sm text-ink-muted">
            As an administrator you can put back revision {revision} of the dispositions as it was saved in Spanwright, once the server has checked its record against the hash taken when it was written. The revision keeps its
            number and its signatures; what is stored now is kept in the audit log.
          </p>
          <Button type="submit" variant="danger" disabled={restore.state !== "idle"}>
            Put back revision {revision}
          </Button>
        </restore.Form>
        {refusal ? (
          <div className="mt-3">
            <Alert>{refusal}</Alert>
          </div>
        ) : null}
      </Panel>
    </div>
  );
}
