import { useEffect, useMemo, useRef } from "react";
import { Form, useFetcher, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { panelsToStations } from "~/domain/planform-panels";
import { PlanformSchema, type PlanformData } from "~/domain/step-data";
import { fromSI, toSI, unitSymbol, formatNumber, type UnitSystem } from "~/domain/units";
import { tidy } from "~/domain/form-values";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { PlanformDrawing } from "~/components/case/planform-drawing";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { wingGeometry } from "~/engine";
import { caseUnits, getCaseSteps, stepData } from "~/services/case-steps.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import type { PlanformPreview } from "../api/planform-preview";
import type { Route } from "./+types/planform";
import { saveStepAnswer } from "./step-action.server";
import { PlanformFormSchema } from "./planform.schema";

function toDisplay(p: PlanformData | null, units: UnitSystem) {
  if (!p) return { stations: [{ y: "0", xLe: "0", chord: "", twist: "0" }, { y: "", xLe: "", chord: "", twist: "0" }], axisRoot: "0.25", axisTip: "0.25" };
  const L = (v: number) => String(tidy(fromSI(units, "length", v)));
  return {
    stations: p.stations.map((s) => ({ y: L(s.y), xLe: L(s.xLe), chord: L(s.chord), twist: String(s.twist) })),
    axisRoot: String(p.axisRoot),
    axisTip: String(p.axisTip),
  };
}

function toStored(v: { stations: { y: number; xLe: number; chord: number; twist: number }[]; axisRoot: number; axisTip: number }, units: UnitSystem) {
  const L = (x: number) => toSI(units, "length", x);
  return { stations: v.stations.map((s) => ({ y: L(s.y), xLe: L(s.xLe), chord: L(s.chord), twist: s.twist })), axisRoot: v.axisRoot, axisTip: v.axisTip };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const saved = stepData(steps, "planform");
  return {
    caseId: c.id,
    units,
    revision: steps.planform.revision,
    status: steps.planform.status,
    values: toDisplay(saved, units),
    geometry: saved ? wingGeometry(saved.stations.map((s) => ({ ...s, a0: 2 * Math.PI, alphaL0: 0, cmAc: 0 }))) : null,
    canEdit: hasPermission(current.roles, "case:edit") && steps.planform.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, PlanformFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const units = caseUnits(await getCaseSteps(c.id));
  const si = PlanformSchema.safeParse(toStored(parsed.value, units));
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "planform", baseRevision: parsed.value.revision, data: si.data, actor: current.user });
}

export default function PlanformRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { units } = loaderData;
  const { form, onSubmit } = useZodForm(PlanformFormSchema, { ...loaderData.values, revision: loaderData.revision } as never, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors;
  const L = unitSymbol(units, "length");
  const preview = useLivePreview(form.watch() as unknown as Record<string, unknown>, units);
  const geometry = preview?.ok ? preview.geometry : loaderData.geometry;
  const drawn = preview?.ok ? preview.stations : null;
  const disabled = !loaderData.canEdit;

  return (
    <>
      <PageHeader title="Planform" description="The wing from root to tip: stations where chord, leading edge or twist change; straight lines between them." />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      {actionData?.ok ? <div className="mb-3"><Alert tone="info">Saved as revision {actionData.revision}.</Alert></div> : null}
      {server?.revision || server?.form || server?.status || server?.stations ? (
        <div className="mb-3"><Alert>{[...(server.revision ?? []), ...(server.form ?? []), ...(server.status ?? []), ...(server.stations ?? [])].join(" ")}</Alert></div>
      ) : null}
      <div className="grid gap-5 2xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("revision")} />
          <fieldset disabled={disabled}>
            <Panel title="Stations">
              <EditableGrid
                name="stations"
                caption="Planform stations"
                columns={[
                  { key: "y", label: `y [${L}]` },
                  { key: "xLe", label: `Leading edge x [${L}]` },
                  { key: "chord", label: `Chord [${L}]` },
                  { key: "twist", label: "Twist [°]" },
                ]}
                control={form.control as never}
                register={form.register as never}
                setValue={form.setValue as never}
                errors={form.formState.errors}
                serverErrors={server}
                emptyRow={{ y: "", xLe: "", chord: "", twist: "0" }}
                disabled={disabled}
                csvName="planform-stations.csv"
                getValues={() => form.getValues("stations") as never}
              />
              <div className="mt-4 grid grid-cols-2 gap-x-4">
                <TextField label="Reference axis at root [chord fraction]" inputMode="decimal" {...form.register("axisRoot")} errors={errorsFor(form, server, "axisRoot")} />
                <TextField label="Reference axis at tip [chord fraction]" inputMode="decimal" {...form.register("axisTip")} errors={errorsFor(form, server, "axisTip")} />
              </div>
            </Panel>
            {disabled ? null : <PanelEntry units={units} onStations={(rows) => form.setValue("stations", rows as never, { shouldDirty: true })} />}
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save planform" />
        </Form>
        <div className="space-y-5">
          <Panel title="Drawing (to scale)">
            <PlanformDrawing
              stations={drawn ?? (loaderData.geometry ? loaderData.values.stations.map((s) => ({ y: toSI(units, "length", Number(s.y)), xLe: toSI(units, "length", Number(s.xLe)), chord: toSI(units, "length", Number(s.chord)) })) : [])}
              mac={geometry ?? undefined}
              axis={preview?.ok ? preview.axis : { root: Number(loaderData.values.axisRoot), tip: Number(loaderData.values.axisTip) }}
              unitLabel={L}
              scaleToDisplay={(m) => fromSI(units, "length", m)}
            />
            {preview && !preview.ok ? <p className="mt-2 text-xs text-warn">Drawing paused: {Object.values(preview.fieldErrors).flat()[0]}</p> : null}
          </Panel>
          <Panel title="Derived geometry (whole wing)">
            {geometry ? <GeometryTable geometry={geometry} units={units} /> : <p className="text-sm text-ink-muted">Shown once the stations describe a wing.</p>}
          </Panel>
        </div>
      </div>
    </>
  );
}

/** Posts the typed stations (converted to SI) to the preview route, 300 ms after typing stops. */
function useLivePreview(values: Record<string, unknown>, units: UnitSystem) {
  const fetcher = useFetcher<PlanformPreview>();
  const key = JSON.stringify([values.stations, values.axisRoot, values.axisTip]);
  const timer = useRef<ReturnType<typeof setTimeout>>(undefined);
  const body = useMemo(() => {
    const parsed = PlanformFormSchema.safeParse(values);
    return parsed.success ? toStored(parsed.data, units) : null;
  }, [key, units]);
  useEffect(() => {
    if (!body) return;
    clearTimeout(timer.current);
    timer.current = setTimeout(() => fetcher.submit(body as never, { method: "post", action: "/api/planform-preview", encType: "application/json" }), 300);
    return () => clearTimeout(timer.current);
  }, [body]);
  return fetcher.data;
}

function GeometryTable({ geometry, units }: { geometry: NonNullable<PlanformPreview & { ok: true }>["geometry"]; units: UnitSystem }) {
  const L = (m: number) => `${formatNumber(fromSI(units, "length", m))} ${unitSymbol(units, "length")}`;
  const rows: [string, string][] = [
    ["Area S", `${formatNumber(fromSI(units, "area", geometry.area))} ${unitSymbol(units, "area")}`],
    ["Span b", L(geometry.span)],
    ["Aspect ratio", formatNumber(geometry.aspectRatio)],
    ["Taper ratio", formatNumber(geometry.taperRatio)],
    ["Mean aerodynamic chord", L(geometry.mac)],
    ["  at y", L(geometry.yMac)],
    ["  leading edge at x", L(geometry.xLeMac)],
  ];
  return (
    <>
      <table className="w-full text-sm">
        <tbody>
          {rows.map(([k, v]) => (
            <tr key={k} className="border-b border-line last:border-0">
              <th scope="row" className="py-1 text-left font-normal text-ink-muted">{k}</th>
              <td className="py-1 text-right tabular">{v}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <table className="mt-3 w-full text-xs">
        <thead className="text-ink-muted">
          <tr>
            <th className="py-1 text-left">Panel</th>
            <th className="py-1 text-right">Λ LE [°]</th>
            <th className="py-1 text-right">Λ c/4 [°]</th>
            <th className="py-1 text-right">Λ c/2 [°]</th>
            <th className="py-1 text-right">Λ TE [°]</th>
          </tr>
        </thead>
        <tbody>
          {geometry.panels.map((p, i) => (
            <tr key={i} className="border-t border-line tabular">
              <td className="py-1">{i + 1}</td>
              <td className="py-1 text-right">{p.sweepLeDeg.toFixed(2)}</td>
              <td className="py-1 text-right">{p.sweepQuarterChordDeg.toFixed(2)}</td>
              <td className="py-1 text-right">{p.sweepHalfChordDeg.toFixed(2)}</td>
              <td className="py-1 text-right">{p.sweepTrailingEdgeDeg.toFixed(2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </>
  );
}

/** Panel-wise entry: replaces the stations with the ones the panels describe. */
function PanelEntry({ units, onStations }: { units: UnitSystem; onStations: (rows: Record<string, string>[]) => void }) {
  const L = unitSymbol(units, "length");
  const ref = useRef<HTMLDivElement>(null);
  return (
    <Panel title="Or enter panels" className="mt-5">
      <div ref={ref}>
        <p className="mb-2 text-xs text-ink-muted">
          One line per panel, root outwards: span along the panel [{L}], root chord [{L}], tip chord [{L}], leading-edge sweep [°], dihedral [°], tip twist [°]. Dihedral projects the span into the wing reference plane.
        </p>
        <textarea data-panel-lines aria-label="Panels, one per line" rows={3} className="w-full rounded border border-line-strong px-2 py-1 font-mono text-xs" placeholder="3.2, 1.9, 1.6, 0, 3, -1&#10;5.5, 1.6, 0.9, 4, 5, -3" />
        <Button
          type="button"
          variant="secondary"
          onClick={() => {
            const text = (ref.current?.querySelector("textarea[data-panel-lines]") as HTMLTextAreaElement | null)?.value ?? "";
            const panels = text
              .split("\n")
              .map((l) => l.split(/[,;\t]/).map((v) => Number(v.trim())))
              .filter((r) => r.length >= 6 && r.every(Number.isFinite))
              .map(([span, rootChord, tipChord, sweepLeDeg, dihedralDeg, tipTwistDeg]) => ({
                span: toSI(units, "length", span!),
                rootChord: toSI(units, "length", rootChord!),
                tipChord: toSI(units, "length", tipChord!),
                sweepLeDeg: sweepLeDeg!,
                dihedralDeg: dihedralDeg!,
                tipTwistDeg: tipTwistDeg!,
              }));
            if (panels.length === 0) return;
            onStations(panelsToStations(0, panels).map((s) => ({ y: String(tidy(fromSI(units, "length", s.y))), xLe: String(tidy(fromSI(units, "length", s.xLe))), chord: String(tidy(fromSI(units, "length", s.chord))), twist: String(s.twist) })));
          }}
        >
          Replace stations with these panels
        </Button>
      </div>
    </Panel>
  );
}

export function meta() {
  return [{ title: "Planform · Spanwright" }];
}
