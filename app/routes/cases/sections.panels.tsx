import { Form, useFetcher } from "react-router";
import { useSaving } from "~/components/forms/use-saving";
import { sectionFitOptions } from "~/charts/section-fit";
import { Chart } from "~/components/charts/chart";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { TextField } from "~/components/forms/field";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Panel } from "~/components/ui/page-header";
import { COEFFICIENT_COLUMNS, describeProblem, POLAR_COLUMNS, PRESSURE_COLUMNS, type CsvProblem, type SectionCsvResult } from "~/domain/section-csv";
import type { SectionsData } from "~/domain/step-data";
import { formatNumber, formatQuantity, fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { ActionAnswer, ActionRefusal, FieldErrors } from "~/utils/form-data";
import type { SectionsFormSchema } from "./sections.schema";

/** A checked upload: the file's data, shown for the engineer to confirm before they are saved. */
export type Preview = {
  uploadId: string;
  filename: string;
  sha256: string;
  kind: string;
  lines: number;
  rows: SectionsData["rows"];
  tables: SectionsData["tables"];
  /** A chordwise pressure file: its stations, angles and chord points. */
  pressures: { y: number; angles: number[]; points: number }[];
};

/** The preview of a checked file. */
export function previewOf(upload: { id: string; filename: string; sha256: string }, parsed: Extract<SectionCsvResult, { ok: true }>): Preview {
  const base = { uploadId: upload.id, filename: upload.filename, sha256: upload.sha256, kind: parsed.kind, lines: parsed.lines };
  return parsed.kind === "pressures"
    ? { ...base, rows: [], tables: [], pressures: parsed.pressures.map((p) => ({ y: p.y, angles: p.sets.map((x) => x.alpha), points: p.sets[0]?.x.length ?? 0 })) }
    : { ...base, rows: parsed.rows, tables: parsed.tables, pressures: [] };
}
/** The upload fetcher's answer: the refusal with every problem of the file, or the file's data to confirm. */
export type UploadAnswer = (ActionRefusal & { problems?: CsvProblem[] }) | (ActionAnswer & { ok: true; preview?: Preview });

/** Section data typed or pasted into the grid, one row per station. */
export function SectionGridPanel({ form, server, units, disabled }: { form: ZodForm<typeof SectionsFormSchema>; server: FieldErrors | undefined; units: UnitSystem; disabled: boolean }) {
  return (
    <Panel title="Section data by station">
      <EditableGrid
        form={form}
        name="rows"
        caption="Section data by station"
        columns={[
          { key: "y", label: `y [${unitSymbol(units, "length")}]` },
          { key: "a0", label: "a0 [/rad]" },
          { key: "alphaL0", label: "αL0 [°]" },
          { key: "cmAc", label: "cm,ac [–]" },
          { key: "clMax", label: "clmax [–]" },
          { key: "cpMin", label: "Cp,min [–]" },
          { key: "cpMinCl", label: "at cl [–]" },
        ]}
        serverErrors={server}
        emptyRow={{ y: "", a0: "", alphaL0: "", cmAc: "", clMax: "", cpMin: "", cpMinCl: "" }}
        disabled={disabled}
        csvName="section-data.csv"
      />
      <p className="mt-2 text-xs text-ink-muted">
        clmax and Cp,min may be left empty: the stall and critical-Mach checks then skip that station. “at cl” is the section lift coefficient the Cp,min was taken at; left empty, a cruise-like 0.4 is assumed, and cases
        whose lift is far from it are flagged. A polar file with Cp,min per angle gives Cp,min against lift instead, read at each case's own lift.
      </p>
    </Panel>
  );
}

/** The flaps extended: the flapped span and what the flap does to the section data there (the flaps-extended cases are solved with them). */
export function FlapsPanel({ form, server, units }: { form: ZodForm<typeof SectionsFormSchema>; server: FieldErrors | undefined; units: UnitSystem }) {
  const err = (name: "flaps.yFrom" | "flaps.yTo" | "flaps.dAlphaL0" | "flaps.dCmAc" | "flaps.clMax") => errorsFor(form, server, name);
  return (
    <Panel title="Flaps extended" className="mt-5">
      <div className="grid grid-cols-2 gap-x-4 sm:grid-cols-5">
        <TextField label={`From y [${unitSymbol(units, "length")}]`} inputMode="decimal" {...form.register("flaps.yFrom")} errors={err("flaps.yFrom")} />
        <TextField label={`To y [${unitSymbol(units, "length")}]`} inputMode="decimal" {...form.register("flaps.yTo")} errors={err("flaps.yTo")} />
        <TextField label="Δα0L [°]" inputMode="decimal" {...form.register("flaps.dAlphaL0")} errors={err("flaps.dAlphaL0")} />
        <TextField label="Δcm,ac [–]" inputMode="decimal" {...form.register("flaps.dCmAc")} errors={err("flaps.dCmAc")} />
        <TextField label="clmax flapped [–]" inputMode="decimal" {...form.register("flaps.clMax")} errors={err("flaps.clMax")} />
      </div>
      <p className="text-xs text-ink-muted">
        The flapped span and what the flap does to the incompressible section data there, as a flap chart or a 2-D analysis gives it at the flap setting of the design flap speed: the change of the zero-lift angle (Δcl0 = −a0·Δα0L) and of the
        moment coefficient about the quarter chord, and the flapped section clmax (optional). The flaps-extended cases (VF in the basis) are solved on the wing with these sections; empty for a wing without flaps.
      </p>
    </Panel>
  );
}

/** The aileron of the rolling conditions: its span, what one degree of deflection does to the sections there, and its full deflection at VA. */
export function AileronPanel({ form, server, units }: { form: ZodForm<typeof SectionsFormSchema>; server: FieldErrors | undefined; units: UnitSystem }) {
  const err = (name: "aileron.yFrom" | "aileron.yTo" | "aileron.dClPerDeg" | "aileron.dCmPerDeg" | "aileron.deltaAtVa") => errorsFor(form, server, name);
  return (
    <Panel title="Aileron" className="mt-5">
      <div className="grid grid-cols-2 gap-x-4 sm:grid-cols-5">
        <TextField label={`Aileron inner end y [${unitSymbol(units, "length")}]`} inputMode="decimal" {...form.register("aileron.yFrom")} errors={err("aileron.yFrom")} />
        <TextField label={`Aileron outer end y [${unitSymbol(units, "length")}]`} inputMode="decimal" {...form.register("aileron.yTo")} errors={err("aileron.yTo")} />
        <TextField label="Δcl per degree [/°]" inputMode="decimal" {...form.register("aileron.dClPerDeg")} errors={err("aileron.dClPerDeg")} />
        <TextField label="Δcm per degree [/°]" inputMode="decimal" {...form.register("aileron.dCmPerDeg")} errors={err("aileron.dCmPerDeg")} />
        <TextField label="Deflection at VA [°]" inputMode="decimal" {...form.register("aileron.deltaAtVa")} errors={err("aileron.deltaAtVa")} />
      </div>
      <p className="text-xs text-ink-muted">
        The aileron span and what one degree of down-going deflection does to the incompressible sections there: the section lift increment (strip theory; a0·τ/57.3 for an aileron of flap effectiveness τ, or a measured value) and the
        moment increment about the quarter chord (left empty, −0.01 per degree, the simplified value of 14 CFR 23.349, paragraph from memory). The rolling cases take the full deflection at VA and, at VC and VD, the deflections of the
        rule (14 CFR 25.349(a) or 23.455). Empty for no aileron conditions.
      </p>
    </Panel>
  );
}

/** A CSV file checked on the server (every bad row named), then previewed for the engineer to accept. */
export function UploadPanel({ revision, maxKiB, units }: { revision: number; maxKiB: number; units: UnitSystem }) {
  const upload = useFetcher<UploadAnswer>();
  const result = upload.data ?? null;
  return (
    <Panel title="Upload a CSV file">
      <upload.Form method="post" encType="multipart/form-data">
        <p className="mb-2 text-xs text-ink-muted">
          y in metres. Header line, then one row per station: <code>{COEFFICIENT_COLUMNS.join(", ")}</code> (clMax, cpMin optional) — or polar tables with several rows per station: <code>{POLAR_COLUMNS.join(", ")}</code>, fitted over their linear
          range (cpMin per angle gives Cp,min against lift) — or incompressible chordwise pressures at two or more angles for stations already saved: <code>{PRESSURE_COLUMNS.join(", ")}</code> (x a chord fraction), over which the
          compressibility rule is then applied point by point. Comma, semicolon or tab separated; at most {maxKiB} KiB.
        </p>
        <label className="block text-sm font-semibold" htmlFor="section-file">
          CSV file
        </label>
        <input id="section-file" name="file" type="file" accept=".csv,text/csv" className="mt-1 block text-sm" />
        <Button type="submit" variant="secondary" className="mt-2" disabled={upload.state !== "idle"}>
          {upload.state !== "idle" ? "Checking…" : "Check file"}
        </Button>
      </upload.Form>
      {result && !result.ok ? (
        <div className="mt-3" role="alert">
          <p className="text-sm font-semibold text-danger">{result.fieldErrors.file?.join(" ")}</p>
          <ul className="mt-1 max-h-48 list-disc overflow-auto pl-5 text-xs text-danger">
            {(result.problems ?? []).slice(0, 200).map((p, i) => (
              <li key={i}>{describeProblem(p)}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {result?.ok && result.preview ? <UploadPreview preview={result.preview} revision={revision} units={units} /> : null}
    </Panel>
  );
}

/** The fitted lift and moment curves of each polar table the saved data came from. */
export function SectionFitCharts({ saved, units, drawings }: { saved: SectionsData | null; units: UnitSystem; drawings: Record<string, string> }) {
  return sectionFitOptions(saved, units).map(({ y, option }) => (
    <Chart key={y} option={option} svg={drawings[String(y)]} label={`Section fit at y = ${formatQuantity(units, "length", y)}`} fileName={`section-fit-y${y}`} height={260} />
  ));
}

/** What richer data the saved sections carry: Cp,min against lift and chordwise pressures, by station. */
export function RicherDataPanel({ rows, canEdit, revision, units }: { rows: SectionsData["rows"]; canEdit: boolean; revision: number; units: UnitSystem }) {
  const at = (y: number) => formatQuantity(units, "length", y);
  const withTable = rows.filter((r) => r.cpMinTable);
  const withPressures = rows.filter((r) => r.pressures);
  if (!withTable.length && !withPressures.length) return null;
  return (
    <Panel title="Richer section data">
      <div className="space-y-2 text-sm" data-testid="richer-section-data">
        {withTable.length ? (
          <p>
            Cp,min against lift at y = {withTable.map((r) => `${at(r.y)} (cl ${formatNumber(r.cpMinTable![0]!.cl)} to ${formatNumber(r.cpMinTable![r.cpMinTable!.length - 1]!.cl)})`).join(", ")}: each case's critical Mach
            number is taken at its own lift there.
          </p>
        ) : null}
        {withPressures.length ? (
          <>
            <p>
              Chordwise pressures at y = {withPressures.map((r) => `${at(r.y)} (${r.pressures!.map((p) => `${formatNumber(p.alpha)}°`).join(", ")})`).join("; ")}: the compressibility rule is applied point by point there.
            </p>
            {canEdit ? (
              <Form method="post">
                <input type="hidden" name="intent" value="remove-pressures" />
                <input type="hidden" name="revision" value={revision} />
                <Button type="submit" variant="secondary">
                  Remove the pressures
                </Button>
              </Form>
            ) : null}
          </>
        ) : null}
      </div>
    </Panel>
  );
}

function UploadPreview({ preview, revision, units }: { preview: Preview; revision: number; units: UnitSystem }) {
  const busy = useSaving();
  if (preview.kind === "pressures") {
    return (
      <div className="mt-4 border-t border-line pt-3">
        <p className="text-sm">
          <strong>{preview.filename}</strong>: {preview.lines} data lines, chordwise pressures at {preview.pressures.length} station{preview.pressures.length === 1 ? "" : "s"}. SHA-256{" "}
          <code className="text-xs">{preview.sha256.slice(0, 16)}…</code>
        </p>
        <ul className="mt-1 list-disc pl-5 text-xs">
          {preview.pressures.map((p) => (
            <li key={p.y}>
              y = {formatNumber(p.y)} m: {p.angles.length} angles ({p.angles.map((a) => `${formatNumber(a)}°`).join(", ")}), {p.points} chord points
            </li>
          ))}
        </ul>
        <Form method="post" className="mt-3">
          <input type="hidden" name="intent" value="accept-upload" />
          <input type="hidden" name="revision" value={revision} />
          <input type="hidden" name="uploadId" value={preview.uploadId} />
          <Button type="submit" disabled={busy}>
            Add these pressures to the saved sections
          </Button>
        </Form>
      </div>
    );
  }
  return (
    <div className="mt-4 border-t border-line pt-3">
      <p className="text-sm">
        <strong>{preview.filename}</strong>: {preview.lines} data lines, {preview.kind === "polars" ? `polar tables fitted at ${preview.rows.length} stations` : `${preview.rows.length} stations`}. SHA-256{" "}
        <code className="text-xs">{preview.sha256.slice(0, 16)}…</code>
      </p>
      <table className="mt-2 w-full text-xs tabular">
        <thead className="text-ink-muted">
          <tr>
            {[`y [${unitSymbol(units, "length")}]`, "a0 [/rad]", "αL0 [°]", "cm,ac", "clmax", "Cp,min"].map((h) => (
              <th key={h} className="py-1 text-right">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((r) => (
            <tr key={r.y} className="border-t border-line">
              {[fromSI(units, "length", r.y), r.a0, r.alphaL0, r.cmAc, r.clMax, r.cpMin].map((v, i) => (
                <td key={i} className="py-1 text-right">
                  {formatNumber(v ?? null)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {preview.tables.map((t) => (
        <p key={t.y} className="mt-1 text-xs text-ink-muted">
          y = {formatQuantity(units, "length", t.y)}: linear range α = {t.linearFrom}° … {t.linearTo}°
        </p>
      ))}
      {preview.rows.some((r) => r.cpMinTable) ? (
        <p className="mt-1 text-xs text-ink-muted">
          Cp,min varies with the angle at {preview.rows.filter((r) => r.cpMinTable).length} station(s): it is kept against lift, and the Cp,min shown is the one at cl {formatNumber(preview.rows.find((r) => r.cpMinTable)?.cpMinCl ?? null)}.
        </p>
      ) : null}
      <Form method="post" className="mt-3">
        <input type="hidden" name="intent" value="accept-upload" />
        <input type="hidden" name="revision" value={revision} />
        <input type="hidden" name="uploadId" value={preview.uploadId} />
        <Button type="submit" disabled={busy}>
          Use this file's data
        </Button>
      </Form>
    </div>
  );
}
