import { data, Form, useFetcher, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { tidy } from "~/domain/form-values";
import { COEFFICIENT_COLUMNS, describeProblem, MAX_SECTION_CSV_BYTES, POLAR_COLUMNS, type CsvProblem } from "~/domain/section-csv";
import { SectionsSchema, type SectionsData } from "~/domain/step-data";
import { formatNumber, fromSI, toSI, unitSymbol } from "~/domain/units";
import { sectionFitOption } from "~/charts/section-fit";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { Chart } from "~/components/charts/chart";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { caseUnits, getCaseSteps, stepData } from "~/services/case-steps.server";
import { readSectionUpload, receiveSectionCsv } from "~/services/uploads.server";
import { fieldErrorsOf, formDataToObject, type ActionAnswer, type ActionRefusal } from "~/utils/form-data";
import { accepted, refused } from "~/utils/http.server";
import type { Route } from "./+types/sections";
import { SectionsFormSchema } from "./sections.schema";
import { saveStepAnswer } from "./step-action.server";

type Preview = { uploadId: string; filename: string; sha256: string; kind: string; lines: number; rows: SectionsData["rows"]; tables: SectionsData["tables"] };
/** The upload fetcher's answer: the refusal with every problem of the file, or the file's data to confirm. */
type UploadAnswer = (ActionRefusal & { problems?: CsvProblem[] }) | (ActionAnswer & { ok: true; preview?: Preview });

const text = (v: number | undefined) => (v === undefined ? "" : String(tidy(v)));

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const saved = stepData(steps, "sections");
  const planform = stepData(steps, "planform");
  const units = caseUnits(steps);
  const yShown = (v: number) => text(fromSI(units, "length", v));
  return {
    units,
    revision: steps.sections.revision,
    status: steps.sections.status,
    saved,
    values: {
      rows: (saved?.rows ?? (planform?.stations ?? [{ y: 0 }]).map((s) => ({ y: s.y, a0: undefined, alphaL0: undefined, cmAc: undefined }))).map((r) => ({
        y: yShown(r.y),
        a0: text(r.a0),
        alphaL0: text(r.alphaL0),
        cmAc: text(r.cmAc),
        clMax: text((r as { clMax?: number }).clMax),
        cpMin: text((r as { cpMin?: number }).cpMin),
      })),
    },
    canEdit: hasPermission(current.roles, "case:edit") && steps.sections.status !== "submitted",
    maxKiB: MAX_SECTION_CSV_BYTES / 1024,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const length = Number(request.headers.get("Content-Length") ?? 0);
  if (length > MAX_SECTION_CSV_BYTES + 64 * 1024) return refused({ file: [`The file is larger than ${MAX_SECTION_CSV_BYTES / 1024} KiB.`] }, { status: 413 });
  const body = await request.formData().catch(() => null);
  if (!body) return refused({ form: ["The request body could not be read."] });
  if (body.has("file")) {
    const file = body.get("file");
    if (!(file instanceof File) || file.size === 0) return refused({ file: ["Choose a CSV file to upload."] });
    const received = await receiveSectionCsv({ organisationId: c.organisationId, caseId: c.id, filename: file.name, bytes: new Uint8Array(await file.arrayBuffer()), actor: current.user });
    if (!received.parsed.ok) {
      const problems = received.parsed.problems;
      const refusal: ActionRefusal & { problems: CsvProblem[] } = { ok: false, message: null, fieldErrors: { file: [`${file.name} was not accepted: ${problems.length} problem(s).`] }, problems };
      return data(refusal, { status: 400 });
    }
    const { upload, parsed } = received;
    return accepted(null, { revision: null, preview: { uploadId: upload!.id, filename: upload!.filename, sha256: upload!.sha256, kind: parsed.kind, lines: parsed.lines, rows: parsed.rows, tables: parsed.tables } });
  }

  const checked = SectionsFormSchema.safeParse(formDataToObject(body));
  if (!checked.success) return refused(fieldErrorsOf(checked.error));
  const input = checked.data;
  let candidate: unknown;
  if (input.intent === "save") {
    const units = caseUnits(await getCaseSteps(c.id));
    candidate = { rows: input.rows.map((r) => ({ ...r, y: toSI(units, "length", r.y) })), source: { kind: "typed" }, tables: [] };
  } else {
    const found = await readSectionUpload(c.id, input.uploadId);
    if (!found || !found.parsed.ok) return refused({ uploadId: ["That upload was not found for this case; upload the file again."] });
    candidate = { rows: found.parsed.rows, tables: found.parsed.tables, source: { kind: "upload", uploadId: found.upload.id, filename: found.upload.filename, sha256: found.upload.sha256 } };
  }
  const si = SectionsSchema.safeParse(candidate);
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "sections", baseRevision: input.revision, data: si.data, actor: current.user });
}

export default function SectionsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { form, onSubmit } = useZodForm(SectionsFormSchema, { intent: "save", revision: loaderData.revision, ...loaderData.values } as never, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const upload = useFetcher<UploadAnswer>();
  const result = upload.data ?? null;
  const server = actionData?.fieldErrors;
  const saved = loaderData.saved;
  const disabled = !loaderData.canEdit;
  const banner = [...(server?.revision ?? []), ...(server?.form ?? []), ...(server?.status ?? []), ...(server?.rows ?? []), ...(server?.uploadId ?? [])];
  return (
    <>
      <PageHeader title="Sections" description="Incompressible 2-D section data along the span, from a wind tunnel or a 2-D analysis. Linear between stations; the compressibility rule is applied later." />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      {actionData?.ok && actionData.revision ? <div className="mb-3"><Alert tone="info">Saved as revision {actionData.revision}.</Alert></div> : null}
      {banner.length ? <div className="mb-3"><Alert>{banner.join(" ")}</Alert></div> : null}
      {saved?.source.kind === "upload" ? (
        <p className="mb-3 text-sm text-ink-muted">
          Current data from the uploaded file <strong>{saved.source.filename}</strong> (SHA-256 <code className="text-xs">{saved.source.sha256?.slice(0, 16)}…</code>).
        </p>
      ) : null}
      <div className="grid gap-5 2xl:grid-cols-2">
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("intent")} />
          <input type="hidden" {...form.register("revision")} />
          <fieldset disabled={disabled}>
            <Panel title="Section data by station">
              <EditableGrid
                name="rows"
                caption="Section data by station"
                columns={[
                  { key: "y", label: `y [${unitSymbol(loaderData.units, "length")}]` },
                  { key: "a0", label: "a0 [/rad]" },
                  { key: "alphaL0", label: "αL0 [°]" },
                  { key: "cmAc", label: "cm,ac [–]" },
                  { key: "clMax", label: "clmax [–]" },
                  { key: "cpMin", label: "Cp,min [–]" },
                ]}
                control={form.control as never}
                register={form.register as never}
                setValue={form.setValue as never}
                errors={form.formState.errors}
                serverErrors={server}
                emptyRow={{ y: "", a0: "", alphaL0: "", cmAc: "", clMax: "", cpMin: "" }}
                disabled={disabled}
                csvName="section-data.csv"
                getValues={() => form.getValues("rows" as never) as never}
              />
              <p className="mt-2 text-xs text-ink-muted">clmax and Cp,min may be left empty: the stall and critical-Mach checks then skip that station.</p>
            </Panel>
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save typed section data" />
        </Form>
        <div className="space-y-5">
          {loaderData.canEdit ? (
            <Panel title="Upload a CSV file">
              <upload.Form method="post" encType="multipart/form-data">
                <p className="mb-2 text-xs text-ink-muted">
                  y in metres. Header line, then one row per station: <code>{COEFFICIENT_COLUMNS.join(", ")}</code> (clMax, cpMin optional) — or polar tables with several rows per station: <code>{POLAR_COLUMNS.join(", ")}</code>, fitted over their linear
                  range. Comma, semicolon or tab separated; at most {loaderData.maxKiB} KiB.
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
              {result?.ok && result.preview ? <UploadPreview preview={result.preview} revision={loaderData.revision} /> : null}
            </Panel>
          ) : null}
          {(saved?.tables ?? []).map((t) => {
            const row = saved!.rows.find((r) => r.y === t.y);
            return row ? <Chart key={t.y} option={sectionFitOption(t, { a0: row.a0, alphaL0: row.alphaL0 }) as never} label={`Section fit at y = ${t.y} m`} fileName={`section-fit-y${t.y}`} height={260} /> : null;
          })}
        </div>
      </div>
    </>
  );
}

function UploadPreview({ preview, revision }: { preview: Preview; revision: number }) {
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mt-4 border-t border-line pt-3">
      <p className="text-sm">
        <strong>{preview.filename}</strong>: {preview.lines} data lines, {preview.kind === "polars" ? `polar tables fitted at ${preview.rows.length} stations` : `${preview.rows.length} stations`}. SHA-256{" "}
        <code className="text-xs">{preview.sha256.slice(0, 16)}…</code>
      </p>
      <table className="mt-2 w-full text-xs tabular">
        <thead className="text-ink-muted">
          <tr>
            {["y [m]", "a0 [/rad]", "αL0 [°]", "cm,ac", "clmax", "Cp,min"].map((h) => (
              <th key={h} className="py-1 text-right">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((r) => (
            <tr key={r.y} className="border-t border-line">
              {[r.y, r.a0, r.alphaL0, r.cmAc, r.clMax, r.cpMin].map((v, i) => (
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
          y = {t.y}: linear range α = {t.linearFrom}° … {t.linearTo}°
        </p>
      ))}
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

export function meta() {
  return [{ title: "Sections · Spanwright" }];
}
