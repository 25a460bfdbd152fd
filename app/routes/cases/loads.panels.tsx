import { useEffect, useState } from "react";
import { Form, href, useFetcher } from "react-router";
import { loadsChartOptions, reliefChartOptions } from "~/charts/loads";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { Chart } from "~/components/charts/chart";
import { TextAreaField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { DataTable } from "~/components/tables/data-table";
import { useLoadAfterInteractive } from "~/components/ui/use-after-interactive";
import { Alert, Panel } from "~/components/ui/page-header";
import { sweepFraction, type SweepProgressView } from "~/domain/results";
import type { StepStatus } from "~/domain/vocabulary";
import { formatQuantity, fromSI, roundForDisplay, unitSymbol, type UnitSystem } from "~/domain/units";
import type { CaseResult, ResultCase } from "~/exchange";
import { attributionOf } from "~/exchange/rolling-labels";
import type { LoadsView } from "~/services/loads-view.server";
import type { CaseLoadsBreakdown, LoadsPageInfo } from "~/services/case-loads.server";
import type { LoadsDrawings, ReliefDrawings } from "~/charts/drawings.server";
import type { FieldErrors } from "~/utils/form-data";
import type { LoadsFormSchema } from "./loads.schema";

type ResultsResponse = (LoadsView & { drawings: LoadsDrawings }) | { error: string; message: string } | { status: "computing"; message: string; progress: SweepProgressView | null };

/**
 * What the page shows of the case's results (the envelope, the root loads of at most 500 cases and
 * the case on the plots, never the whole result document), loaded again whenever the loads step gets
 * a new revision or another case is chosen, so a change of inputs re-computes without a full
 * navigation. A large sweep is solved by a worker: the route answers "computing" and is asked again
 * each second until the result is stored.
 */
export function useCaseResults(caseId: string, ready: boolean, revision: number, selected: string | null) {
  const results = useFetcher<ResultsResponse>();
  const url = `${href("/api/cases/:caseId/loads", { caseId })}${selected ? `?case=${encodeURIComponent(selected)}` : ""}`;
  const { load } = results;
  // The revision asked for, recorded while rendering (React's pattern for state that follows a prop).
  const [loadedFor, setLoadedFor] = useState<number | null>(null);
  if (ready && loadedFor !== revision) setLoadedFor(revision);
  useLoadAfterInteractive(load, ready ? url : null, revision);
  const data = results.data;
  const computing = data && "status" in data ? data.message : null;
  const progress = data && "status" in data ? data.progress : null;
  useEffect(() => {
    if (!computing) return;
    const t = setTimeout(() => load(url), 1000);
    return () => clearTimeout(t);
  }, [computing, data, load, url]);
  return {
    result: data && "envelope" in data ? data : null,
    failure: data && "error" in data ? data.message : null,
    computing,
    progress,
    loading: results.state !== "idle",
    loadedFor,
  };
}

/** A case id with its mass case (and a rolling case's side, as the envelope names it), as the tables and read-outs name it: "W2-A (MTOW-full)", "W1-roll-VC (MTOW-full, other side)". */
function namer(info: LoadsPageInfo) {
  return (label: string) => {
    const { id, side } = attributionOf(label);
    const parts = [info.cases[id]?.massCase, side ? `${side} side` : undefined].filter(Boolean);
    return parts.length ? `${id} (${parts.join(", ")})` : id;
  };
}

/** The engineer's notes on the results, saved with the loads step for the checker. */
export function NotesPanel({ form, onSubmit, server, canEdit, status, revision, busy, voids }: { form: ZodForm<typeof LoadsFormSchema>; onSubmit: React.FormEventHandler<HTMLFormElement>; server: FieldErrors | undefined; canEdit: boolean; status: StepStatus; revision: number; busy: boolean; voids: readonly string[] }) {
  return (
    <Panel title="Notes for the checker">
      <Form method="post" onSubmit={onSubmit} noValidate>
        <input type="hidden" {...form.register("revision")} />
        <fieldset disabled={!canEdit || busy}>
          <TextAreaField
            label="Notes on these loads"
            hint="What the checker should know about the results: critical cases, anything dispositioned, what was compared. The masses and their relief are entered in the masses step."
            rows={5}
            {...form.register("notes")}
            errors={errorsFor(form, server, "notes")}
          />
        </fieldset>
        <StepSaveBar canEdit={canEdit} status={status} revision={revision} busy={busy} label="Save" voids={voids} />
      </Form>
    </Panel>
  );
}

/** One case's loads split into the aerodynamic load, the inertia relief of its mass case and the net load. */
export function BreakdownPanel({ caseId, current, result, units, info }: { caseId: string; current: ResultCase | Omit<ResultCase, "stations">; result: unknown; units: UnitSystem; info: LoadsPageInfo }) {
  const named = namer(info);
  const breakdown = useFetcher<(CaseLoadsBreakdown & { drawings: ReliefDrawings }) | { error: string; message: string }>();
  // Loaded again for another case and for new results of the same case.
  useLoadAfterInteractive(breakdown.load, `${href("/api/cases/:caseId/case-loads", { caseId })}?case=${encodeURIComponent(current.id)}`, result);
  const parts = breakdown.data && "y" in breakdown.data ? breakdown.data : null;
  const options = parts ? reliefChartOptions(parts, current.id, units) : null;
  return (
    <Panel title={`Aerodynamic load, inertia relief and net load: case ${named(current.id)}`} className="mt-5">
      {parts && options && parts.caseId === current.id ? (
        <>
          <p className="mb-2 text-sm">
            {parts.nz === null ? (
              "A case given by angle of attack has no load factor: no inertia relief is applied."
            ) : current.roll ? (
              <>
                nz = <span className="tabular">{parts.nz}</span>, mass case <strong>{parts.massCase ?? "all items at full mass"}</strong>: the symmetric condition of this rolling case, from which both sides are built (below). The net
                load is the aerodynamic load less the relief.
              </>
            ) : (
              <>
                nz = <span className="tabular">{parts.nz}</span>, mass case <strong>{parts.massCase ?? "all items at full mass"}</strong>, tail load <span className="tabular">{formatQuantity(units, "force", parts.tailLoad)}</span> (up positive), wing lift{" "}
                <span className="tabular">{formatQuantity(units, "force", parts.wingLift)}</span> (both sides). The net load is the aerodynamic load less the relief.
              </>
            )}
          </p>
          <div className="grid grid-cols-1 gap-4 xl:grid-cols-3">
            {(["shear", "bending", "torsion"] as const).map((q) => (
              <Chart
                key={q}
                option={options[q]}
                svg={parts.drawings[q]}
                label={`${q === "shear" ? "Shear" : q === "bending" ? "Bending moment" : "Torsion"}: aerodynamic, relief and net`}
                fileName={`${q}-relief-${current.id}`}
              />
            ))}
          </div>
        </>
      ) : breakdown.data && "error" in breakdown.data ? (
        <Alert>{breakdown.data.message}</Alert>
      ) : (
        <p className="text-sm text-ink-muted">Computing the breakdown of case {current.id}…</p>
      )}
    </Panel>
  );
}

/** Where the results stand: not ready, computing, refused, or how many cases with the root bending envelope. */
export function ResultsStatus({ ready, caseCount, results, current, onSelect, units, info }: { ready: boolean; caseCount: number; results: ReturnType<typeof useCaseResults>; current: ResultCase | null; onSelect: (id: string) => void; units: UnitSystem; info: LoadsPageInfo }) {
  const listed = results.result ? (results.result.cases.some((c) => c.id === current?.id) || !current ? results.result.cases : [current, ...results.result.cases]) : [];
  const { result, failure, computing, progress, loadedFor } = results;
  const named = namer(info);
  // A sweep on the job worker shows how far it has got; a request the page waits on only that it runs.
  const fraction = progress ? sweepFraction(progress) : null;
  const env = result?.envelope ?? [];
  return (
    <div role="status" aria-live="polite">
      {!ready ? (
        <p className="text-sm text-ink-muted">Save the planform, sections and envelope first.</p>
      ) : results.loading || computing ? (
        <div className="rounded border border-line bg-surface p-4 text-sm">
          <p className="font-semibold">Computing {caseCount} load case{caseCount === 1 ? "" : "s"}…</p>
          {computing ? <p className="text-xs text-ink-muted">{computing}</p> : null}
          {fraction !== null && fraction > 0 ? (
            <div className="mt-2 h-1.5 w-full overflow-hidden rounded bg-canvas" role="progressbar" aria-label="Cases evaluated" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(100 * fraction)}>
              <div className="h-full rounded bg-accent" style={{ width: `${(100 * fraction).toFixed(1)}%` }} />
            </div>
          ) : (
            <div className="mt-2 h-1.5 w-full overflow-hidden rounded bg-canvas">
              <div className="h-full w-1/3 animate-pulse rounded bg-accent" />
            </div>
          )}
        </div>
      ) : failure ? (
        <Alert>{failure}</Alert>
      ) : result && current ? (
        <div className="rounded border border-line bg-surface p-4 text-sm">
          <p>
            <strong>{result.caseCount}</strong> cases analysed (engine {result.engine}) from the inputs at loads revision {loadedFor}. Root bending envelope:{" "}
            <strong className="tabular">{formatQuantity(units, "moment", env[0]?.bendingMax)}</strong> ({named(env[0]?.bendingMaxCase ?? "")}) /{" "}
            <strong className="tabular">{formatQuantity(units, "moment", env[0]?.bendingMin)}</strong> ({named(env[0]?.bendingMinCase ?? "")}).
          </p>
          <label className="mt-2 block">
            <span className="mr-2 font-semibold">Case shown on the plots</span>
            <select value={current.id} onChange={(e) => onSelect(e.target.value)} className="rounded border border-line-strong px-2 py-1">
              {listed.map((c) => (
                <option key={c.id} value={c.id}>
                  {named(c.id)}
                </option>
              ))}
            </select>
          </label>
        </div>
      ) : null}
    </div>
  );
}

/** Shear, bending and torsion along the span: the envelope with the case shown. */
export function LoadsCharts({ envelope, current, units, drawings }: { envelope: CaseResult["envelope"]; current: ResultCase; units: UnitSystem; drawings: LoadsDrawings | null }) {
  const options = loadsChartOptions(envelope, current, units);
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-3">
      <Chart option={options.shear} svg={drawings?.shear} label="Shear force along the span" fileName="shear" />
      <Chart option={options.bending} svg={drawings?.bending} label="Bending moment along the span" fileName="bending" />
      <Chart option={options.torsion} svg={drawings?.torsion} label="Torsion along the span" fileName="torsion" />
    </div>
  );
}

/** Both sides of a rolling case at the root: the loaded side (full airload, down-going aileron) and the other. */
export function RollingSidesPanel({ current, units }: { current: ResultCase; units: UnitSystem }) {
  const roll = current.roll;
  if (!roll) return null;
  const F = unitSymbol(units, "force");
  const M = unitSymbol(units, "moment");
  const rows = [
    { side: "Loaded side", airload: "100 %", aileron: roll.aileron > 0 ? `${roll.aileron.toFixed(2)}° down` : "—", root: current.root },
    { side: "Other side", airload: `${(roll.fraction * 100).toFixed(0)} %`, aileron: roll.aileron > 0 ? `${roll.aileron.toFixed(2)}° up` : "—", root: roll.other.root },
  ];
  return (
    <Panel title={`Both sides of rolling case ${current.id}`} className="mt-5">
      <DataTable
        rows={rows}
        caption="Root loads of both sides of the rolling case"
        csvName={`sides-${current.id}.csv`}
        columns={[
          { id: "side", header: "Side", value: (r) => r.side },
          { id: "airload", header: "Airload of the symmetric condition", value: (r) => r.airload },
          { id: "aileron", header: "Aileron", value: (r) => r.aileron },
          { id: "shear", header: `Root shear [${F}]`, value: (r) => round(fromSI(units, "force", r.root.shear)), numeric: true },
          { id: "bending", header: `Root bending [${M}]`, value: (r) => round(fromSI(units, "moment", r.root.bending)), numeric: true },
          { id: "torsion", header: `Root torsion [${M}]`, value: (r) => round(fromSI(units, "moment", r.root.torsion)), numeric: true },
        ]}
      />
      <p className="mt-2 text-xs text-ink-muted">
        The loaded side carries the full airload of the symmetric condition and the down-going aileron&apos;s lift and moment increments (strip theory over the aileron span); the other side its share of the airload and the up-going
        aileron&apos;s. Both keep the same inertia relief: the roll acceleration&apos;s inertia and the wing&apos;s flexibility are left out, and the envelope takes both sides. A rational rolling analysis the authority accepts governs.
      </p>
    </Panel>
  );
}

/** The envelope by station with the case that gives each extreme. */
export function EnvelopeTable({ envelope, units, info }: { envelope: CaseResult["envelope"]; units: UnitSystem; info: LoadsPageInfo }) {
  const env = envelope;
  const named = namer(info);
  return (
    <Panel title="Envelope and critical case at each station" className="mt-5">
      <DataTable
        rows={env}
        caption="Envelope by station"
        csvName="envelope.csv"
        columns={[
          { id: "y", header: `y [${unitSymbol(units, "length")}]`, value: (e) => round(fromSI(units, "length", e.y)), numeric: true },
          ...(["shear", "bending", "torsion"] as const).flatMap((q) => {
            const quantity = q === "shear" ? "force" : "moment";
            const sym = unitSymbol(units, quantity);
            return [
              { id: `${q}Max`, header: `${q} max [${sym}]`, value: (e: (typeof env)[number]) => round(fromSI(units, quantity, e[`${q}Max`])), numeric: true },
              { id: `${q}MaxCase`, header: `${q} max case (mass case, side)`, value: (e: (typeof env)[number]) => named(e[`${q}MaxCase`]) },
              { id: `${q}Min`, header: `${q} min [${sym}]`, value: (e: (typeof env)[number]) => round(fromSI(units, quantity, e[`${q}Min`])), numeric: true },
              { id: `${q}MinCase`, header: `${q} min case (mass case, side)`, value: (e: (typeof env)[number]) => named(e[`${q}MinCase`]) },
            ];
          }),
        ]}
      />
    </Panel>
  );
}

const round = (v: number) => roundForDisplay(v);

export function RootLoadsTable({ cases, units, info }: { cases: Omit<ResultCase, "stations">[]; units: UnitSystem; info: LoadsPageInfo }) {
  const F = unitSymbol(units, "force");
  const M = unitSymbol(units, "moment");
  const balance = new Map(info.balance.map((b) => [b.caseId, b]));
  return (
    <DataTable
      rows={cases}
      caption="Root loads of every case"
      csvName="root-loads.csv"
      initialSort={[{ id: "bending", desc: true }]}
      columns={[
        { id: "id", header: "Case", value: (c) => c.id },
        { id: "massCase", header: "Mass case", value: (c) => info.cases[c.id]?.massCase ?? "" },
        { id: "mach", header: "Mach", value: (c) => round(c.mach), numeric: true },
        { id: "altitude", header: `Altitude [${unitSymbol(units, "altitude")}]`, value: (c) => round(fromSI(units, "altitude", c.altitude)), numeric: true },
        { id: "cl", header: "CL", value: (c) => round(c.cl), numeric: true },
        { id: "alpha", header: "α [°]", value: (c) => round(c.alpha), numeric: true },
        { id: "tail", header: `Tail load [${F}]`, value: (c) => (balance.has(c.id) ? round(fromSI(units, "force", balance.get(c.id)!.tailLoad)) : null), numeric: true },
        { id: "tailSource", header: "Tail load from", value: (c) => balance.get(c.id)?.source ?? "" },
        { id: "regime", header: "Regime", value: (c) => c.regime, format: (c) => (c.regime === "supercritical" ? <span className="font-semibold text-danger">⚠ supercritical</span> : c.regime) },
        { id: "shear", header: `Root shear [${F}]`, value: (c) => round(fromSI(units, "force", c.root.shear)), numeric: true },
        { id: "bending", header: `Root bending [${M}]`, value: (c) => round(fromSI(units, "moment", c.root.bending)), numeric: true },
        { id: "torsion", header: `Root torsion [${M}]`, value: (c) => round(fromSI(units, "moment", c.root.torsion)), numeric: true },
      ]}
    />
  );
}
