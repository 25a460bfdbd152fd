import { useVirtualizer } from "@tanstack/react-virtual";
import { memo, useEffect, useRef, useState } from "react";
import { href, useFetcher } from "react-router";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import type { LoadCaseRows } from "../api/case-load-cases";
import { VORTEX_LATTICE_DEFAULT_STRIPS } from "~/engine";
import { tunedGustOptions } from "~/charts/gust";
import { vnSetOption } from "~/charts/vn";
import { DataTable } from "~/components/tables/data-table";
import { Chart } from "~/components/charts/chart";
import { SelectField, TextField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Alert, Panel } from "~/components/ui/page-header";
import { useDrawnInSteps } from "~/components/ui/use-after-interactive";
import { COMPRESSIBILITY_RULES, RULE_LABELS, SPANWISE_LABELS, SPANWISE_METHODS, type StepStatus } from "~/domain/vocabulary";
import { formatCount, fromSI, roundForDisplay, unitSymbol, type UnitSystem } from "~/domain/units";
import type { VnSet } from "~/services/envelope.server";
import type { EnvelopeDrawings } from "~/charts/drawings.server";
import type { FieldErrors } from "~/utils/form-data";
import type { EnvelopeFormSchema } from "./envelope.schema";


type EnvelopeForm = ZodForm<typeof EnvelopeFormSchema>;

// Memoised: the form beside it renders twice as the page hydrates (react-hook-form marks itself ready
// in a layout effect), and the diagram, its table and its charts do not depend on the form.
/** The V–n diagram of each design weight and altitude, one shown at a time, with its gust data. */
export const VnPanel = memo(function VnPanel({ sets, problem, stall, units, drawings }: { sets: VnSet[]; problem: string | null; stall: { area: number; clMax: number; clMaxNegative: number } | null; units: UnitSystem; drawings?: EnvelopeDrawings | null }) {
  const [setIndex, setSetIndex] = useState(0);
  const set = sets[setIndex];
  return (
    <Panel title="V–n diagram">
      {problem ? (
        <p className="text-sm text-ink-muted">{problem}</p>
      ) : set && stall ? (
        <>
          <label className="mb-2 block text-sm">
            <span className="mr-2 font-semibold">Weight and altitude</span>
            <select value={setIndex} onChange={(e) => setSetIndex(Number(e.target.value))} className="rounded border border-line-strong px-2 py-1">
              {sets.map((s, i) => (
                <option key={s.label} value={i}>
                  W{i + 1}: {s.label}
                </option>
              ))}
            </select>
          </label>
          <Chart
            option={vnSetOption(set, stall, units)}
            svg={setIndex === 0 ? drawings?.vn : null}
            label="V–n diagram"
            fileName={`vn-W${setIndex + 1}`}
          />
          <VnNotes set={set} units={units} />
          <VnPointsTable set={set} units={units} />
        </>
      ) : null}
      {set?.tuned && !problem ? <TunedGustPanel key={setIndex} set={set} units={units} drawings={setIndex === 0 ? drawings?.tuned : null} /> : null}
    </Panel>
  );
});

/** The compressibility rule, the spanwise solver, its strips and the output stations of every case of this file. */
export function MethodPanel({ form, server, disabled, busy, noDiagram }: { form: EnvelopeForm; server: FieldErrors | undefined; disabled: boolean; busy: boolean; noDiagram: boolean }) {
  return (
    <Panel title="Method for this case file">
      <div className="grid gap-x-4 sm:grid-cols-2 xl:grid-cols-4">
        <SelectField label="Compressibility rule" {...form.register("compressibility")} errors={errorsFor(form, server, "compressibility")}>
          {COMPRESSIBILITY_RULES.map((r) => (
            <option key={r} value={r}>
              {RULE_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Spanwise solver" {...form.register("spanwise")} errors={errorsFor(form, server, "spanwise")}>
          {SPANWISE_METHODS.map((r) => (
            <option key={r} value={r}>
              {SPANWISE_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <TextField label="Output stations per semispan" inputMode="numeric" {...form.register("stations")} errors={errorsFor(form, server, "stations")} />
        <TextField label="Vortex-lattice strips per semispan" inputMode="numeric" placeholder={String(VORTEX_LATTICE_DEFAULT_STRIPS)} {...form.register("strips")} errors={errorsFor(form, server, "strips")} />
      </div>
      <p className="mb-2 text-xs text-ink-muted">
        Strips set the resolution of the vortex-lattice solve ({VORTEX_LATTICE_DEFAULT_STRIPS} when empty, 8–2000; not used by the lifting line). The distribution page shows how much the result moves when they are halved.
      </p>
      {disabled ? null : (
        <Button type="submit" variant="secondary" disabled={busy || noDiagram} onClick={() => form.setValue("intent", "generate")}>
          Generate cases from the basis rules
        </Button>
      )}
      <p className="mt-1 text-xs text-ink-muted">Generating replaces the generated cases and keeps the ones you added by hand (kind “manual”).</p>
    </Panel>
  );
}

/** The load cases in a grid, with messages of the server by row. */
export function CasesPanel({ form, server, units, disabled, count }: { form: EnvelopeForm; server: FieldErrors | undefined; units: UnitSystem; disabled: boolean; count: number }) {
  return (
    <Panel title={`Load cases (${count})`} className="mt-5">
      <EditableGrid
        name="cases"
        caption="Load cases"
        columns={[
          { key: "id", label: "Case", type: "text" },
          { key: "kind", label: "Kind", type: "text" },
          { key: "mach", label: "Mach" },
          { key: "altitude", label: `Altitude [${unitSymbol(units, "altitude")}]` },
          { key: "weight", label: `Weight [${unitSymbol(units, "mass")}]` },
          { key: "nz", label: "nz" },
          { key: "alpha", label: "α [°]" },
          { key: "massCase", label: "Mass case", type: "text" },
          { key: "tailLoad", label: `Tail load [${unitSymbol(units, "force")}]` },
          { key: "flaps", label: "Flaps", type: "checkbox" },
          { key: "rollFraction", label: "Other side share" },
          { key: "rollAileron", label: "Aileron [°]" },
          { key: "excluded", label: "Excluded", type: "checkbox" },
          { key: "rule", label: "From rule", type: "text" },
        ]}
        form={form}
        serverErrors={server}
        emptyRow={{ id: "", kind: "manual", rule: "added by hand", mach: "", altitude: "", weight: "", nz: "", alpha: "", massCase: "", tailLoad: "", rollFraction: "", rollAileron: "" }}
        disabled={disabled}
        csvName="load-cases.csv"
        countField="casesCount"
      />
      <p className="mt-2 text-xs text-ink-muted">
        Give each case either weight and load factor (trimmed so that the wing carries nz·W less the tail load) or an angle of attack. A trimmed case names its mass case (masses step); its tail load (up positive) is taken
        from the balance of the masses step where left empty, or as typed. A rolling case gives the other side&apos;s share of the airload (0–1) and the aileron deflection: the loaded side carries the full airload and the
        down-going aileron, the other side the share and the up-going aileron (the aileron of the sections step).
      </p>
    </Panel>
  );
}

/** Messages of the server about rows of the case grid, by row. */
export function CaseRowErrors({ server }: { server: FieldErrors | undefined }) {
  const rowErrors = Object.entries(server ?? {}).filter(([k]) => k.startsWith("cases."));
  if (rowErrors.length === 0) return null;
  return (
    <div className="mb-3">
      <Alert>
        {rowErrors.map(([k, m]) => (
          <span key={k} className="block">
            Case row {Number(k.split(".")[1]) + 1}: {m?.join(" ")}
          </span>
        ))}
      </Alert>
    </div>
  );
}

/** Rows the page carries of a large case file, and the rows fetched at a time as the grid scrolls. */
export const FIRST_ROWS = 100;
const PAGE_ROWS = FIRST_ROWS;
const ROW_PX = 34;
/** The window's height (h-[32rem]), and the rows it adds in one commit while it first fills. */
const WINDOW_PX = 512;
const WINDOW_ROWS_PER_STEP = 8;

type CaseRow = LoadCaseRows["rows"][number];

const WINDOW_COLUMNS: {
  key: keyof CaseRow;
  label: (units: UnitSystem) => string;
  type?: "text" | "checkbox";
}[] = [
  { key: "id", label: () => "Case", type: "text" },
  { key: "kind", label: () => "Kind", type: "text" },
  { key: "mach", label: () => "Mach" },
  { key: "altitude", label: (u) => `Altitude [${unitSymbol(u, "altitude")}]` },
  { key: "weight", label: (u) => `Weight [${unitSymbol(u, "mass")}]` },
  { key: "nz", label: () => "nz" },
  { key: "alpha", label: () => "α [°]" },
  { key: "massCase", label: () => "Mass case", type: "text" },
  { key: "tailLoad", label: (u) => `Tail load [${unitSymbol(u, "force")}]` },
  { key: "flaps", label: () => "Flaps", type: "checkbox" },
  { key: "rollFraction", label: () => "Other side share" },
  { key: "rollAileron", label: () => "Aileron [°]" },
  { key: "excluded", label: () => "Excluded", type: "checkbox" },
  { key: "rule", label: () => "From rule", type: "text" },
];

/**
 * The load cases of a large case file: a window on the stored rows (only the rows in view are in
 * the page, fetched a page at a time as they scroll in), edited row by row. Changed, removed and
 * added rows are kept here until saved, in view or not, and the save sends only them, on the
 * revision they were made on.
 */
export function CasesWindowPanel({ caseId, first, revision, units, canEdit, status }: { caseId: string; first: { total: number; rows: CaseRow[] }; revision: number; units: UnitSystem; canEdit: boolean; status: StepStatus }) {
  const { total } = first;
  const [pages, setPages] = useState<Map<number, CaseRow[]>>(() => new Map([[0, first.rows]]));
  const [changed, setChanged] = useState<Map<number, CaseRow>>(() => new Map());
  const [removed, setRemoved] = useState<Set<number>>(() => new Set());
  const [added, setAdded] = useState<CaseRow[]>([]);
  const [stale, setStale] = useState(false);
  const [goTo, setGoTo] = useState("");
  const requested = useRef(new Set<number>([0]));
  const scroller = useRef<HTMLDivElement>(null);
  const save = useFetcher<{ ok: boolean; message?: string; fieldErrors?: FieldErrors }>();
  // A new revision (this page's save) replaces the rows held and the edits made on the old one.
  const [shownRevision, setShownRevision] = useState(revision);
  if (shownRevision !== revision) {
    setShownRevision(revision);
    setPages(new Map([[0, first.rows]]));
    setChanged(new Map());
    setRemoved(new Set());
    setAdded([]);
    setStale(false);
    requested.current = new Set([0]);
  }
  // The rows in view (some 27, 500 elements) are drawn once the page answers input, 8 per commit at
  // each idle moment of the browser: drawn as the page hydrated, they held back its first answer to a
  // click. The server, which has no window to measure, draws none either.
  const [inView, setInView] = useState<number | null>(null);
  const drawn = useDrawnInSteps(inView, WINDOW_ROWS_PER_STEP);
  const virtualizer = useVirtualizer({ count: total + added.length, getScrollElement: () => scroller.current, estimateSize: () => ROW_PX, overscan: 12, initialRect: { width: 0, height: WINDOW_PX }, enabled: drawn > 0 });
  const all = drawn > 0 ? virtualizer.getVirtualItems() : [];
  if (drawn > 0 && drawn !== Infinity && inView !== all.length) setInView(all.length);
  const items = all.slice(0, drawn);
  const firstIndex = items[0]?.index ?? 0;
  const lastIndex = items[items.length - 1]?.index ?? 0;

  useEffect(() => {
    for (let p = Math.floor(firstIndex / PAGE_ROWS); p <= Math.floor(Math.min(lastIndex, total - 1) / PAGE_ROWS); p++) {
      if (requested.current.has(p)) continue;
      requested.current.add(p);
      const url = `${href("/api/cases/:caseId/load-cases", { caseId })}?offset=${p * PAGE_ROWS}&limit=${PAGE_ROWS}`;
      fetch(url, { headers: { Accept: "application/json" } })
        .then((r) => (r.ok ? (r.json() as Promise<LoadCaseRows>) : Promise.reject(new Error(String(r.status)))))
        .then((page) => {
          if (page.revision !== revision) setStale(true);
          setPages((m) => new Map(m).set(p, page.rows));
        })
        .catch(() => requested.current.delete(p));
    }
  }, [firstIndex, lastIndex, total, caseId, revision]);

  const stored = (i: number) => pages.get(Math.floor(i / PAGE_ROWS))?.[i % PAGE_ROWS];
  const rowAt = (i: number): CaseRow | undefined => (i >= total ? added[i - total] : (changed.get(i) ?? stored(i)));
  const edit = (i: number, key: keyof CaseRow, value: string | boolean) => {
    if (i >= total) {
      setAdded((rows) => rows.map((r, n) => (n === i - total ? { ...r, [key]: value } : r)));
      return;
    }
    const base = rowAt(i);
    if (base) setChanged((m) => new Map(m).set(i, { ...base, [key]: value }));
  };
  const errors = save.state === "idle" && save.data && !save.data.ok ? (save.data.fieldErrors ?? {}) : {};
  const errorKey = (i: number) => (i >= total ? `added.${i - total}` : `cases.${i}`);
  const cellErrors = (i: number, key: string) => errors[`${errorKey(i)}.${key}`] ?? [];
  const edits = changed.size + removed.size + added.length;
  // A row asked for before the window is first drawn (the virtualiser is off until then) is shown
  // once it is: scrolling then would do nothing, and the jump would be lost.
  const [jumpTo, setJumpTo] = useState<number | null>(null);
  const show = (row: number) => {
    const index = Math.max(0, Math.min(row, total + added.length - 1));
    if (drawn > 0) virtualizer.scrollToIndex(index, { align: "start" });
    else setJumpTo(index);
  };
  useEffect(() => {
    if (drawn === 0 || jumpTo === null) return;
    virtualizer.scrollToIndex(jumpTo, { align: "start" });
    setJumpTo(null);
  }, [drawn, jumpTo, virtualizer]);
  const onSave = () =>
    save.submit(
      { intent: "rows", revision, changed: [...changed].filter(([i]) => !removed.has(i)).map(([index, row]) => ({ index, row })), removed: [...removed], added },
      { method: "post", encType: "application/json" },
    );
  const rowMessages = Object.entries(errors).map(([key, messages]) => {
    const [, part, n] = /^(cases|added)\.(\d+)/.exec(key) ?? [];
    const row = part === "cases" ? Number(n) : part === "added" ? total + Number(n) : null;
    return { key, row, text: messages?.join(" ") ?? "" };
  });
  const padTop = items[0]?.start ?? 0;
  const padBottom = virtualizer.getTotalSize() - (items[items.length - 1]?.end ?? 0);

  return (
    <Panel title={`Load cases (${formatCount(total)})`} className="mt-5">
      <UnsavedGuard dirty={edits > 0} />
      <div className="p-3">
        <p className="mb-2 text-xs text-ink-muted">
          A large case file: the grid shows the rows in view and fetches the others as you scroll. Edit any row; the changed, removed and added rows are kept until you save them, and only they are sent.
        </p>
        {stale ? (
          <div className="mb-2">
            <Alert tone="warn">The envelope was saved again since this page was opened (revision {revision} shown). Reload the page before editing.</Alert>
          </div>
        ) : null}
        {rowMessages.length ? (
          <div className="mb-2">
            <Alert>
              {rowMessages.slice(0, 20).map((m) => (
                <span key={m.key} className="block">
                  {m.row === null ? (
                    m.text
                  ) : (
                    <>
                      Case row {m.row + 1}: {m.text}{" "}
                      <button type="button" className="underline" onClick={() => show(m.row!)}>
                        show
                      </button>
                    </>
                  )}
                </span>
              ))}
            </Alert>
          </div>
        ) : null}
        <form
          className="mb-2 flex items-end gap-2 text-sm"
          onSubmit={(e) => {
            e.preventDefault();
            const n = Number(goTo);
            if (Number.isInteger(n) && n >= 1) show(n - 1);
          }}
        >
          <label className="flex flex-col">
            <span className="text-xs font-semibold">Go to row</span>
            <input value={goTo} onChange={(e) => setGoTo(e.target.value)} inputMode="numeric" className="w-28 rounded border border-line-strong px-2 py-1" />
          </label>
          <Button type="submit" variant="secondary">
            Show
          </Button>
        </form>
        <div ref={scroller} className="h-[32rem] overflow-auto rounded border border-line bg-surface" data-testid="load-case-window" aria-busy={drawn !== Infinity ? true : undefined}>
          <table className="w-full text-sm" aria-rowcount={total + added.length + 1}>
            <caption className="sr-only">Load cases</caption>
            <thead className="sticky top-0 z-10 border-b border-line bg-canvas text-xs text-ink-muted">
              <tr>
                <th scope="col" className="px-2 py-1.5 text-left font-semibold">
                  #
                </th>
                {WINDOW_COLUMNS.map((c) => (
                  <th key={c.key} scope="col" className="px-2 py-1.5 text-right font-semibold">
                    {c.label(units)}
                  </th>
                ))}
                <th scope="col">
                  <span className="sr-only">Row actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {padTop > 0 ? <tr aria-hidden="true" style={{ height: padTop }} /> : null}
              {items.map((item) => {
                const i = item.index;
                const row = rowAt(i);
                const gone = removed.has(i);
                return (
                  <tr key={item.key} aria-rowindex={i + 2} style={{ height: ROW_PX }} className={`border-b border-line ${gone ? "bg-danger-soft line-through" : changed.has(i) || i >= total ? "bg-accent-soft" : ""}`}>
                    <td className="px-2 text-ink-faint tabular">{i + 1}</td>
                    {WINDOW_COLUMNS.map((c) => {
                      const label = `${c.label(units)}, row ${i + 1}`;
                      if (!row)
                        return (
                          <td key={c.key} className="px-2 text-ink-faint">
                            …
                          </td>
                        );
                      const messages = cellErrors(i, c.key);
                      return (
                        <td key={c.key} className="px-1">
                          {c.type === "checkbox" ? (
                            <input type="checkbox" aria-label={label} className="mx-auto block" checked={Boolean(row[c.key])} disabled={!canEdit || gone} onChange={(e) => edit(i, c.key, e.target.checked)} />
                          ) : (
                            <input
                              aria-label={label}
                              aria-invalid={messages.length > 0}
                              title={messages.join(" ")}
                              value={String(row[c.key])}
                              disabled={!canEdit || gone}
                              inputMode={c.type === "text" ? "text" : "decimal"}
                              onChange={(e) => edit(i, c.key, e.target.value)}
                              className={`w-full min-w-16 rounded border border-line px-1.5 py-0.5 tabular ${c.type === "text" ? "text-left" : "text-right"} aria-[invalid=true]:border-danger aria-[invalid=true]:bg-danger-soft`}
                            />
                          )}
                        </td>
                      );
                    })}
                    <td className="px-1">
                      {canEdit && row ? (
                        i >= total ? (
                          <button type="button" className="rounded px-1 text-xs text-danger hover:bg-danger-soft" aria-label={`Delete row ${i + 1}`} onClick={() => setAdded((rows) => rows.filter((_, n) => n !== i - total))}>
                            delete
                          </button>
                        ) : (
                          <button
                            type="button"
                            className="rounded px-1 text-xs text-danger hover:bg-danger-soft"
                            aria-label={`${gone ? "Keep" : "Delete"} row ${i + 1}`}
                            onClick={() =>
                              setRemoved((s) => {
                                const next = new Set(s);
                                if (gone) next.delete(i);
                                else next.add(i);
                                return next;
                              })
                            }
                          >
                            {gone ? "keep" : "delete"}
                          </button>
                        )
                      ) : null}
                    </td>
                  </tr>
                );
              })}
              {padBottom > 0 ? <tr aria-hidden="true" style={{ height: padBottom }} /> : null}
            </tbody>
          </table>
        </div>
        {canEdit ? (
          <div className="mt-2 flex flex-wrap items-center gap-3">
            <button
              type="button"
              className="rounded border border-line-strong bg-surface px-2 py-1 text-xs font-semibold hover:bg-canvas"
              onClick={() => {
                setAdded((rows) => [...rows, { id: "", kind: "manual", rule: "added by hand", mach: "", altitude: "", weight: "", nz: "", alpha: "", massCase: "", tailLoad: "", flaps: false, rollFraction: "", rollAileron: "", excluded: false }]);
                setTimeout(() => show(total + added.length));
              }}
            >
              Add row
            </button>
            <Button type="button" disabled={edits === 0 || save.state !== "idle"} onClick={onSave}>
              {save.state !== "idle" ? "Saving…" : `Save ${edits} changed row${edits === 1 ? "" : "s"}`}
            </Button>
            <span className="text-xs text-ink-muted">
              Revision {revision} · saving makes revision {revision + 1}
            </span>
            {save.state === "idle" && save.data?.ok ? (
              <span role="status" className="text-sm text-accent-strong">
                {save.data.message}
              </span>
            ) : null}
          </div>
        ) : (
          <p className="mt-4 text-sm text-ink-muted">{status === "submitted" ? "Submitted for check: read-only until returned or approved." : "Read-only for your role."}</p>
        )}
      </div>
    </Panel>
  );
}

/** What the gust points of one V–n set rest on: lift slopes per speed, gust velocities and their rules. */
function VnNotes({ set, units }: { set: VnSet; units: UnitSystem }) {
  const v = (x: number) => `${fromSI(units, "speed", x).toFixed(1)} ${unitSymbol(units, "speed")}`;
  return (
    <p className="mt-2 text-xs text-ink-muted">
      Gust lift slope of the wing at each speed's Mach number: {set.liftSlopeAtVb !== undefined ? `VB ${set.liftSlopeAtVb.toFixed(3)}, ` : ""}VC {set.liftSlope.toFixed(3)}, VD {set.liftSlopeAtVd.toFixed(3)} /rad. Gusts
      {set.gustAtVb !== undefined ? ` ${v(set.gustAtVb)} at VB,` : ""} {v(set.gustAtVc)} at VC, {v(set.gustAtVd)} at VD, EAS ({set.gustRule}).
      {set.tuned ? (
        <>
          {" "}
          Transport aeroplane: the load cases come from the tuned discrete gust of 14 CFR 25.341(a) on a rigid aircraft in plunge (below),{" "}
          {set.fg ? (set.fg.rule.startsWith("F_g = 1") ? `with ${set.fg.rule}` : `with F_g = ${set.fg.value.toFixed(3)} (${set.fg.rule})`) : ""}; the Pratt gust points are drawn for comparison only. The rigid model leaves out
          the structure's flexibility and the aircraft's pitching; the dynamic analysis the authority accepts governs.
        </>
      ) : null}
      {set.flaps ? (
        <>
          {" "}
          Flaps extended (points flaps-…, solved on the flapped wing of the sections step): n = 2.0 up to VF = {v(set.flaps.vf)} and gusts of 25 ft/s EAS at VF ({set.tuned ? "14 CFR 25.345(a)" : "14 CFR 23.345(a)"}, paragraph from memory);
          flapped stall speed {v(set.flaps.vsf)} (CLmax {set.flaps.clMax}), lift slope of the flapped wing {set.flaps.liftSlope.toFixed(3)} /rad at the VF Mach number, mass ratio μ = {set.flaps.massRatio.toFixed(2)},{" "}
          {set.tuned
            ? `gust factor ${set.flaps.gustFactor.toFixed(4)} of the 12.5-chord one-minus-cosine gust on the rigid aircraft in plunge (Pratt's K_g ${set.flaps.prattKg.toFixed(4)})`
            : `Pratt's K_g ${set.flaps.prattKg.toFixed(4)} (14 CFR 23.341(c))`}
          .
        </>
      ) : null}
      {set.points.some((p) => p.roll) ? (
        <>
          {" "}
          Rolling conditions (diamonds, kind “rolling”):{" "}
          {set.points
            .filter((p) => p.roll)
            .map((p) => `${p.name} n = ${p.nz.toFixed(3)}, other side ${(p.roll!.fraction * 100).toFixed(0)} %${p.roll!.aileron > 0 ? `, aileron ${p.roll!.aileron.toFixed(2)}°` : ""}`)
            .join("; ")}{" "}
          ({set.tuned ? "14 CFR 25.349(a)" : "14 CFR 23.349, 23.455"}, paragraphs from memory). Each is analysed on both sides: the loaded side with the full airload and the down-going aileron, the other with its share and the
          up-going aileron.
        </>
      ) : null}
      {set.massCase ? ` Mass case ${set.massCase}${set.cg !== undefined ? `, CG ${(set.cg * 100).toFixed(1)} % MAC` : ""}.` : ""}
    </p>
  );
}

/** Every point of the set, with its speed, load factor and the rule it comes from. */
function VnPointsTable({ set, units }: { set: VnSet; units: UnitSystem }) {
  return (
    <div className="mt-3">
      <DataTable
        rows={set.points}
        caption={`V–n points, ${set.label}`}
        csvName="vn-points.csv"
        columns={[
          { id: "name", header: "Point", value: (p) => p.name },
          { id: "veas", header: `EAS [${unitSymbol(units, "speed")}]`, value: (p) => roundForDisplay(fromSI(units, "speed", p.veas)), numeric: true },
          { id: "nz", header: "nz", value: (p) => roundForDisplay(p.nz), numeric: true },
          { id: "rule", header: "From rule", value: (p) => p.rule },
        ]}
      />
    </div>
  );
}

/** The tuned discrete gust of each speed of a Part 25 set: Δn against the gradient, and the critical one's history. */
function TunedGustPanel({ set, units, drawings }: { set: VnSet; units: UnitSystem; drawings?: EnvelopeDrawings["tuned"] }) {
  const [speed, setSpeed] = useState(0);
  const tuned = set.tuned ?? [];
  const t = tuned[Math.min(speed, tuned.length - 1)];
  if (!t) return null;
  const length = { symbol: unitSymbol(units, "length"), fromSI: (m: number) => fromSI(units, "length", m) };
  const c = t.result.critical;
  const options = tunedGustOptions(t, units);
  // The server drew the first speed's charts (the one shown first).
  const shown = Math.min(speed, tuned.length - 1) === 0 ? drawings : null;
  return (
    <div className="mt-5 border-t border-line pt-4">
      <h3 className="mb-2 text-sm font-semibold">Tuned discrete gust (14 CFR 25.341(a)), rigid aircraft in plunge</h3>
      <label className="mb-2 block text-sm">
        <span className="mr-2 font-semibold">Speed</span>
        <select value={speed} onChange={(e) => setSpeed(Number(e.target.value))} className="rounded border border-line-strong px-2 py-1">
          {tuned.map((x, i) => (
            <option key={x.speed} value={i}>
              {x.speed} ({fromSI(units, "speed", x.veas).toFixed(1)} {unitSymbol(units, "speed")} EAS)
            </option>
          ))}
        </select>
      </label>
      <p className="mb-2 text-sm">
        Mass ratio μ = <span className="tabular">{t.result.massRatio.toFixed(2)}</span>, Pratt's K_g = <span className="tabular">{t.result.prattKg.toFixed(4)}</span>. Critical gradient H ={" "}
        <span className="tabular">
          {length.fromSI(c.gradient).toFixed(1)} {length.symbol}
        </span>{" "}
        ({c.gradientChords.toFixed(1)} mean chords), U_ds ={" "}
        <span className="tabular">
          {fromSI(units, "speed", c.uds).toFixed(2)} {unitSymbol(units, "speed")}
        </span>{" "}
        EAS: Δn = <strong className="tabular">{c.deltaN.toFixed(4)}</strong> (factor K = {c.k.toFixed(4)}); Pratt's formula with the same gust gives {c.prattDeltaN.toFixed(4)}.
      </p>
      <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
        <Chart option={options.peak} svg={shown?.peak} label="Tuned gust: load factor increment against gust gradient" fileName={`tuned-gust-${t.speed}`} />
        <Chart option={options.history} svg={shown?.history} label="Tuned gust: response at the critical gradient" fileName={`gust-history-${t.speed}`} />
      </div>
      <p className="mt-2 text-xs text-ink-muted">
        {t.result.method}. U_ds = U_ref·F_g·(H/350 ft)^(1/6); gradients from 30 to 350 ft. Left out: the flexibility of the structure, the aircraft's pitching and the tail's own lift, compressibility and finite span in the lift
        build-up. Results support, and do not replace, the dynamic gust analysis the certifying authority accepts.
      </p>
    </div>
  );
}

