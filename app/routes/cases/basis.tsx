import { data, Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/auth/permissions";
import { convertFields, tidy } from "~/cases/form-values";
import { BasisSchema, CATEGORIES, CATEGORY_LABELS, DEFAULT_REGULATIONS, type BasisData } from "~/cases/step-data";
import { unitSymbol, type UnitSystem } from "~/cases/units";
import { SelectField, TextAreaField, TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { getCaseSteps, saveStep, stepData } from "~/services/case-steps.server";
import { DomainError } from "~/services/organisation.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody } from "~/utils/http.server";
import type { Route } from "./+types/basis";
import { BASIS_QUANTITIES, BasisFormSchema } from "./basis.schema";

/** A blank basis starts from the transport category's references and no numbers. */
function formValues(saved: BasisData | null) {
  if (!saved) return { units: "SI" as UnitSystem, category: "part25" as const, regulations: DEFAULT_REGULATIONS.part25 };
  const shown = convertFields(saved, saved.units, BASIS_QUANTITIES, "fromSI");
  const out: Record<string, unknown> = { ...shown };
  for (const key of Object.keys(BASIS_QUANTITIES)) {
    const v = out[key];
    out[key] = Array.isArray(v) ? v.map((x: number) => tidy(x)).join(", ") : typeof v === "number" ? tidy(v) : v;
  }
  return out;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const saved = stepData(steps, "basis");
  return {
    caseId: c.id,
    revision: steps.basis.revision,
    status: steps.basis.status,
    values: formValues(saved),
    canEdit: hasPermission(current.roles, "case:edit") && steps.basis.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, BasisFormSchema);
  if (!parsed.ok) return data({ ok: false, revision: 0, fieldErrors: parsed.fieldErrors }, { status: 400 });
  const { revision, ...typed } = parsed.value;
  const si = BasisSchema.safeParse(convertFields(typed, typed.units, BASIS_QUANTITIES, "toSI"));
  if (!si.success) return data({ ok: false, revision: 0, fieldErrors: fieldErrorsOf(si.error) }, { status: 400 });
  let saved: { revision: number };
  try {
    saved = await saveStep({ caseId: c.id, step: "basis", baseRevision: revision, data: si.data, actor: current.user });
  } catch (error) {
    if (error instanceof DomainError) return data({ ok: false, revision: 0, fieldErrors: { [error.field ?? "form"]: [error.message] } }, { status: error.status });
    throw error;
  }
  return { ok: true, revision: saved.revision, fieldErrors: {} as Record<string, string[] | undefined> };
}

export default function BasisRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { form, onSubmit } = useZodForm(BasisFormSchema, { ...loaderData.values, revision: loaderData.revision } as never, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors;
  const units = (form.watch("units") ?? "SI") as UnitSystem;
  const u = (q: Parameters<typeof unitSymbol>[1]) => unitSymbol(units, q);
  const err = (name: string) => errorsFor(form, server, name);
  const disabled = !loaderData.canEdit;
  return (
    <>
      <PageHeader title="Basis" description="The certification basis of the case: the rules that apply, weights, design speeds (equivalent airspeed) and altitudes." />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      {actionData?.ok ? <div className="mb-3"><Alert tone="info">Saved as revision {actionData.revision}.</Alert></div> : null}
      {server?.revision || server?.form || server?.status ? <div className="mb-3"><Alert>{[...(server.revision ?? []), ...(server.form ?? []), ...(server.status ?? [])].join(" ")}</Alert></div> : null}
      <Form method="post" onSubmit={onSubmit} noValidate>
        <input type="hidden" {...form.register("revision")} />
        <fieldset disabled={disabled} className="grid gap-5 xl:grid-cols-2">
          <Panel title="Rules">
            <SelectField label="Category" {...form.register("category", { onChange: (e) => form.setValue("regulations", DEFAULT_REGULATIONS[e.target.value as keyof typeof DEFAULT_REGULATIONS], { shouldDirty: true }) })} errors={err("category")}>
              {CATEGORIES.map((k) => (
                <option key={k} value={k}>
                  {CATEGORY_LABELS[k]}
                </option>
              ))}
            </SelectField>
            <TextAreaField label="Applicable regulation references" hint="Edit to the agreed certification basis (amendment levels, special conditions)." {...form.register("regulations")} errors={err("regulations")} />
            <SelectField label="Units shown" hint="Stored in SI whatever you choose." {...form.register("units")} errors={err("units")}>
              <option value="SI">SI (m, kg, m/s)</option>
              <option value="US">US customary (ft, lb, kt)</option>
            </SelectField>
          </Panel>
          <Panel title="Weights">
            <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
              <TextField label={`Max take-off [${u("mass")}]`} inputMode="decimal" {...form.register("mtow")} errors={err("mtow")} />
              <TextField label={`Max zero-fuel [${u("mass")}]`} inputMode="decimal" {...form.register("mzfw")} errors={err("mzfw")} />
              <TextField label={`Minimum design [${u("mass")}]`} inputMode="decimal" {...form.register("minWeight")} errors={err("minWeight")} />
            </div>
          </Panel>
          <Panel title="Design speeds (EAS)">
            <div className="grid grid-cols-2 gap-x-4 sm:grid-cols-4">
              <TextField label={`VS1 [${u("speed")}]`} inputMode="decimal" {...form.register("vs1")} errors={err("vs1")} />
              <TextField label={`VA [${u("speed")}]`} inputMode="decimal" {...form.register("va")} errors={err("va")} />
              <TextField label={`VC [${u("speed")}]`} inputMode="decimal" {...form.register("vc")} errors={err("vc")} />
              <TextField label={`VD [${u("speed")}]`} inputMode="decimal" {...form.register("vd")} errors={err("vd")} />
            </div>
          </Panel>
          <Panel title="Wing and altitudes">
            <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
              <TextField label={`Wing reference area [${u("area")}]`} inputMode="decimal" {...form.register("wingArea")} errors={err("wingArea")} />
              <TextField label="Aircraft CLmax" inputMode="decimal" {...form.register("clMax")} errors={err("clMax")} />
              <TextField label="Negative CLmax" inputMode="decimal" {...form.register("clMaxNegative")} errors={err("clMaxNegative")} />
            </div>
            <TextField label={`Altitudes [${u("altitude")}]`} hint="Comma-separated, geopotential, standard atmosphere." {...form.register("altitudes")} errors={err("altitudes")} />
          </Panel>
        </fieldset>
        {loaderData.canEdit ? (
          <div className="mt-4 flex items-center gap-3">
            <Button type="submit" disabled={busy}>
              {busy ? "Saving…" : "Save basis"}
            </Button>
            <span className="text-xs text-ink-muted">Revision {loaderData.revision} · saving makes revision {loaderData.revision + 1}</span>
          </div>
        ) : (
          <p className="mt-4 text-sm text-ink-muted">{loaderData.status === "submitted" ? "Submitted for check: read-only until returned or approved." : "Read-only for your role."}</p>
        )}
      </Form>
    </>
  );
}

export function meta() {
  return [{ title: "Basis · Spanwright" }];
}
