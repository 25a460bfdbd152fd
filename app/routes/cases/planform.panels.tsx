import { useEffect, useMemo, useRef, useState } from "react";
import { useWatch } from "react-hook-form";
import { href, useFetcher } from "react-router";
import { PlanformDrawing } from "~/components/case/planform-drawing";
import { TextField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Panel } from "~/components/ui/page-header";
import { panelsToStations } from "~/domain/planform-panels";
import { formatNumber, fromSI, tidy, toSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { FieldErrors } from "~/utils/form-data";
import type { PlanformPreview } from "../api/planform-preview";
import type { PlanformFormSchema } from "./planform.schema";

/**
 * The form's schema and conversions (zod and the step schemas), imported on demand by the page, its
 * live preview and the route alike: the page answers its first click without them. One way of
 * importing the module everywhere keeps the dynamic import a real chunk boundary.
 */
export const planformForm = () => import("./planform.schema");

type PlanformGeometry = Extract<PlanformPreview, { ok: true }>["geometry"];

/** The stations grid and the reference axis: the planform as it is saved. */
export function StationsPanel({ form, server, units, disabled }: { form: ZodForm<typeof PlanformFormSchema>; server: FieldErrors | undefined; units: UnitSystem; disabled: boolean }) {
  const L = unitSymbol(units, "length");
  return (
    <Panel title="Stations">
      <EditableGrid
        form={form}
        name="stations"
        caption="Planform stations"
        columns={[
          { key: "y", label: `y [${L}]` },
          { key: "xLe", label: `Leading edge x [${L}]` },
          { key: "chord", label: `Chord [${L}]` },
          { key: "twist", label: "Twist [°]" },
        ]}
        serverErrors={server}
        emptyRow={{ y: "", xLe: "", chord: "", twist: "0" }}
        disabled={disabled}
        csvName="planform-stations.csv"
      />
      <div className="mt-4 grid grid-cols-2 gap-x-4">
        <TextField label="Reference axis at root [chord fraction]" inputMode="decimal" {...form.register("axisRoot")} errors={errorsFor(form, server, "axisRoot")} />
        <TextField label="Reference axis at tip [chord fraction]" inputMode="decimal" {...form.register("axisTip")} errors={errorsFor(form, server, "axisTip")} />
      </div>
    </Panel>
  );
}

/** The semispan to scale, as typed (once the live preview has checked it) or as saved. */
export function DrawingPanel({ preview, saved, units }: { preview: PlanformPreview | undefined; saved: { stations: { y: number; xLe: number; chord: number }[]; axis: { root: number; tip: number }; geometry: PlanformGeometry | null }; units: UnitSystem }) {
  const shown = preview?.ok ? { stations: preview.stations, axis: preview.axis, geometry: preview.geometry } : saved;
  return (
    <Panel title="Drawing (to scale)">
      <PlanformDrawing stations={shown.stations} mac={shown.geometry ?? undefined} axis={shown.axis} unitLabel={unitSymbol(units, "length")} scaleToDisplay={(m) => fromSI(units, "length", m)} />
      {preview && !preview.ok ? <p className="mt-2 text-xs text-warn">Drawing paused: {Object.values(preview.fieldErrors).flat()[0]}</p> : null}
    </Panel>
  );
}

/** Area, span, aspect and taper ratios, MAC and the sweep of every panel. */
export function GeometryPanel({ geometry, units }: { geometry: PlanformGeometry | null; units: UnitSystem }) {
  return (
    <Panel title="Derived geometry (whole wing)">
      {geometry ? <GeometryTable geometry={geometry} units={units} /> : <p className="text-sm text-ink-muted">Shown once the stations describe a wing.</p>}
    </Panel>
  );
}

type Saved = Parameters<typeof DrawingPanel>[0]["saved"];

/**
 * The drawing and the derived geometry of the planform as typed (checked by the preview route) or as
 * saved. The typed values are watched here, not by the page: typing renders these panels again, not
 * the whole form.
 */
export function PreviewPanels({ form, saved, units }: { form: ZodForm<typeof PlanformFormSchema>; saved: Saved; units: UnitSystem }) {
  const preview = useLivePreview(useWatch({ control: form.control }), units);
  return (
    <>
      <DrawingPanel preview={preview} saved={saved} units={units} />
      <GeometryPanel geometry={preview?.ok ? preview.geometry : saved.geometry} units={units} />
    </>
  );
}

/**
 * Posts the typed form (its stations converted to SI) to the preview route, 300 ms after typing
 * stops. Nothing is posted while the form holds what the page was drawn with (the saved planform,
 * drawn from the page's data): the schema that reads the typed values, and the post, wait for a change.
 */
function useLivePreview(values: unknown, units: UnitSystem) {
  const fetcher = useFetcher<PlanformPreview>();
  const key = JSON.stringify(values);
  const [shownKey] = useState(key);
  const changed = key !== shownKey;
  const timer = useRef<ReturnType<typeof setTimeout>>(undefined);
  const [schema, setSchema] = useState<Awaited<ReturnType<typeof planformForm>> | null>(null);
  useEffect(() => {
    if (!changed || schema) return;
    let live = true;
    void planformForm().then((m) => live && setSchema(m));
    return () => {
      live = false;
    };
  }, [changed, schema]);
  // Keyed on the form's contents, not on the values object react-hook-form renews at every change.
  const body = useMemo(() => {
    if (!schema || !changed) return null;
    const parsed = schema.PlanformFormSchema.safeParse(JSON.parse(key));
    return parsed.success ? schema.planformToSI(parsed.data, units) : null;
  }, [schema, changed, key, units]);
  const { submit } = fetcher;
  useEffect(() => {
    if (!body) return;
    clearTimeout(timer.current);
    timer.current = setTimeout(() => submit(body, { method: "post", action: href("/api/planform-preview"), encType: "application/json" }), 300);
    return () => clearTimeout(timer.current);
  }, [body, submit]);
  // Typed back to what the page was drawn with: the saved drawing again, not the last preview.
  return changed ? fetcher.data : undefined;
}

function GeometryTable({ geometry, units }: { geometry: PlanformGeometry; units: UnitSystem }) {
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
export function PanelEntryPanel({ units, onStations }: { units: UnitSystem; onStations: (rows: { y: string; xLe: string; chord: string; twist: string }[]) => void }) {
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
