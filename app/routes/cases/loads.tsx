import { useEffect, useState } from "react";
import { Form, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { numberInput, tidy } from "~/domain/form-values";
import { LoadsSchema } from "~/domain/step-data";
import { formatQuantity, fromSI, toSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { loadsOption, type LoadQuantity } from "~/charts/loads";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { Chart } from "~/components/charts/chart";
import { ResultsCaution } from "~/components/case/caution";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { DataTable } from "~/components/tables/data-table";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import type { CaseResult, ResultCase } from "~/exchange";
import { caseInputs, analysedCases } from "~/services/analysis.server";
import { caseUnits, getCaseSteps } from "~/services/case-steps.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/loads";
import { saveStepAnswer } from "./step-action.server";

const LoadsFormSchema = z.strictObject({ revision: numberInput("Revision"), semispanMass: numberInput("Semispan structural mass") });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  return {
    caseId: c.id,
    units,
    revision: steps.loads.revision,
    status: steps.loads.status,
    values: { semispanMass: String(tidy(fromSI(units, "mass", inputs.loads?.semispanMass ?? 0))) },
    caseCount: inputs.envelope ? analysedCases(inputs.envelope, inputs.distribution).length : 0,
    ready: Boolean(inputs.planform && inputs.sections && inputs.envelope),
    canEdit: hasPermission(current.roles, "case:edit") && steps.loads.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, LoadsFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const units = caseUnits(await getCaseSteps(c.id));
  const si = LoadsSchema.safeParse({ semispanMass: toSI(units, "mass", parsed.value.semispanMass) });
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "loads", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
}

type ResultsResponse = CaseResult | { error: string; message: string } | { status: "computing"; message: string };

export default function LoadsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { units, caseId } = loaderData;
  const { form, onSubmit } = useZodForm(LoadsFormSchema, { revision: loaderData.revision, ...loaderData.values } as never, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const results = useFetcher<ResultsResponse>();
  // Results come from the API route, so a change of inputs re-computes without a full navigation.
  const [loadedFor, setLoadedFor] = useState<number | null>(null);
  useEffect(() => {
    if (!loaderData.ready) return;
    results.load(`/api/v1/cases/${caseId}/results`);
    setLoadedFor(loaderData.revision);
  }, [caseId, loaderData.ready, loaderData.revision]);
  const result = results.data && "schema" in results.data ? results.data : null;
  const failure = results.data && "error" in results.data ? results.data.message : null;
  const computing = results.data && "status" in results.data ? results.data.message : null;
  // A large sweep is solved by a worker: ask again until its result is stored.
  useEffect(() => {
    if (!computing) return;
    const t = setTimeout(() => results.load(`/api/v1/cases/${caseId}/results`), 1000);
    return () => clearTimeout(t);
  }, [computing, results.data]);
  const [selected, setSelected] = useState<string | null>(null);
  const current = result?.cases.find((c) => c.id === selected) ?? (result ? criticalRootCase(result) : null);
  const server = actionData?.fieldErrors as Record<string, string[] | undefined> | undefined;

  const force = { symbol: unitSymbol(units, "force"), scale: (v: number) => fromSI(units, "force", v) };
  const moment = { symbol: unitSymbol(units, "moment"), scale: (v: number) => fromSI(units, "moment", v) };
  const env = result?.envelope ?? [];
  const series = (q: LoadQuantity) => ({
    y: env.map((e) => e.y),
    max: env.map((e) => e[`${q}Max`]),
    min: env.map((e) => e[`${q}Min`]),
    caseId: current?.id,
    caseValues: current?.stations?.map((s) => s[q]),
  });

  return (
    <>
      <PageHeader title="Loads" description="Shear, bending moment and torsion about the reference axis along the span for every case, net of inertia relief, and their envelope." />
      <ResultsCaution />
      {actionData?.ok ? <div className="mb-3"><Alert tone="info">Saved as revision {actionData.revision}.</Alert></div> : null}
      {server?.form || server?.revision ? <div className="mb-3"><Alert>{[...(server.form ?? []), ...(server.revision ?? [])].join(" ")}</Alert></div> : null}
      <div className="mb-5 grid gap-5 xl:grid-cols-[22rem_1fr]">
        <Panel title="Inertia relief">
          <Form method="post" onSubmit={onSubmit} noValidate>
            <input type="hidden" {...form.register("revision")} />
            <fieldset disabled={!loaderData.canEdit}>
              <TextField
                label={`Semispan structural mass [${unitSymbol(units, "mass")}]`}
                hint="Spread in proportion to chord on the reference axis and multiplied by nz·g. 0 for aerodynamic loads only."
                inputMode="decimal"
                {...form.register("semispanMass")}
                errors={errorsFor(form, server, "semispanMass")}
              />
            </fieldset>
            <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save" />
          </Form>
        </Panel>
        <div role="status" aria-live="polite">
          {!loaderData.ready ? (
            <p className="text-sm text-ink-muted">Save the planform, sections and envelope first.</p>
          ) : results.state !== "idle" || computing ? (
            <div className="rounded border border-line bg-surface p-4 text-sm">
              <p className="font-semibold">Computing {loaderData.caseCount} load case{loaderData.caseCount === 1 ? "" : "s"}…</p>
              {computing ? <p className="text-xs text-ink-muted">{computing}</p> : null}
              <div className="mt-2 h-1.5 w-full overflow-hidden rounded bg-canvas">
                <div className="h-full w-1/3 animate-pulse rounded bg-accent" />
              </div>
            </div>
          ) : failure ? (
            <Alert>{failure}</Alert>
          ) : result && current ? (
            <div className="rounded border border-line bg-surface p-4 text-sm">
              <p>
                <strong>{result.cases.length}</strong> cases analysed (engine {result.engine}) from the inputs at loads revision {loadedFor}. Root bending envelope:{" "}
                <strong className="tabular">{formatQuantity(units, "moment", env[0]?.bendingMax)}</strong> ({env[0]?.bendingMaxCase}) /{" "}
                <strong className="tabular">{formatQuantity(units, "moment", env[0]?.bendingMin)}</strong> ({env[0]?.bendingMinCase}).
              </p>
              <label className="mt-2 block">
                <span className="mr-2 font-semibold">Case shown on the plots</span>
                <select value={current.id} onChange={(e) => setSelected(e.target.value)} className="rounded border border-line-strong px-2 py-1">
                  {result.cases.map((c) => (
                    <option key={c.id} value={c.id}>
                      {c.id}
                    </option>
                  ))}
                </select>
              </label>
            </div>
          ) : null}
        </div>
      </div>
      {result && current ? (
        <div className={results.state !== "idle" ? "opacity-50" : undefined} aria-busy={results.state !== "idle"}>
          <div className="grid gap-4 xl:grid-cols-3">
            <Chart option={loadsOption("shear", series("shear"), force) as never} label="Shear force along the span" fileName="shear" />
            <Chart option={loadsOption("bending", series("bending"), moment) as never} label="Bending moment along the span" fileName="bending" />
            <Chart option={loadsOption("torsion", series("torsion"), moment) as never} label="Torsion along the span" fileName="torsion" />
          </div>
          <Panel title="Root loads, every case" className="mt-5">
            <RootLoadsTable cases={result.cases} units={units} />
          </Panel>
          <Panel title="Envelope and critical case at each station" className="mt-5">
            <DataTable
              rows={env}
              caption="Envelope by station"
              csvName="envelope.csv"
              columns={[
                { id: "y", header: "y [m]", value: (e) => e.y, numeric: true, format: (e) => e.y.toFixed(3) },
                ...(["shear", "bending", "torsion"] as const).flatMap((q) => {
                  const quantity = q === "shear" ? "force" : "moment";
                  const sym = unitSymbol(units, quantity);
                  return [
                    { id: `${q}Max`, header: `${q} max [${sym}]`, value: (e: (typeof env)[number]) => round(fromSI(units, quantity, e[`${q}Max`])), numeric: true },
                    { id: `${q}MaxCase`, header: `${q} max case`, value: (e: (typeof env)[number]) => e[`${q}MaxCase`] },
                    { id: `${q}Min`, header: `${q} min [${sym}]`, value: (e: (typeof env)[number]) => round(fromSI(units, quantity, e[`${q}Min`])), numeric: true },
                    { id: `${q}MinCase`, header: `${q} min case`, value: (e: (typeof env)[number]) => e[`${q}MinCase`] },
                  ];
                }),
              ]}
            />
          </Panel>
        </div>
      ) : null}
    </>
  );
}

const round = (v: number) => Number(v.toPrecision(5));

function criticalRootCase(result: CaseResult): ResultCase {
  return result.cases.reduce((a, b) => (Math.abs(b.root.bending) > Math.abs(a.root.bending) ? b : a));
}

function RootLoadsTable({ cases, units }: { cases: ResultCase[]; units: UnitSystem }) {
  const F = unitSymbol(units, "force");
  const M = unitSymbol(units, "moment");
  return (
    <DataTable
      rows={cases}
      caption="Root loads of every case"
      csvName="root-loads.csv"
      initialSort={[{ id: "bending", desc: true }]}
      columns={[
        { id: "id", header: "Case", value: (c) => c.id },
        { id: "mach", header: "Mach", value: (c) => round(c.mach), numeric: true },
        { id: "altitude", header: "Altitude [m]", value: (c) => round(c.altitude), numeric: true },
        { id: "cl", header: "CL", value: (c) => round(c.cl), numeric: true },
        { id: "alpha", header: "α [°]", value: (c) => round(c.alpha), numeric: true },
        { id: "regime", header: "Regime", value: (c) => c.regime, format: (c) => (c.regime === "supercritical" ? <span className="font-semibold text-danger">⚠ supercritical</span> : c.regime) },
        { id: "shear", header: `Root shear [${F}]`, value: (c) => round(fromSI(units, "force", c.root.shear)), numeric: true },
        { id: "bending", header: `Root bending [${M}]`, value: (c) => round(fromSI(units, "moment", c.root.bending)), numeric: true },
        { id: "torsion", header: `Root torsion [${M}]`, value: (c) => round(fromSI(units, "moment", c.root.torsion)), numeric: true },
      ]}
    />
  );
}

export function meta() {
  return [{ title: "Loads · Spanwright" }];
}
