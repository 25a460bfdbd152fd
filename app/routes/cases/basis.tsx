import { Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { convertFields, tidy } from "~/domain/form-values";
import { BasisSchema, CATEGORIES, CATEGORY_LABELS, DEFAULT_REGULATIONS, type BasisData } from "~/domain/step-data";
import { unitSymbol, type UnitSystem } from "~/domain/units";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { SelectField, TextAreaField, TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { getCaseSteps, stepData } from "~/services/case-steps.server";
import { manoeuvreLoadFactorsPart23, manoeuvreLoadFactorsPart25, minimumDesignSpeedsPart23, stallSpeed, UNITS, type Part23Category } from "~/engine";
import { fieldErrorsOf } from "~/utils/form-data";
import { parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/basis";
import { saveStepAnswer } from "./step-action.server";
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

const G0 = 9.80665;
const PSF = 47.880259;
const KT = 1852 / 3600;

/** What the rules of the saved basis give, beside what was typed: a check, not a substitute. */
function derivedFromRules(b: BasisData) {
  const weightN = b.mtow * G0;
  const mtowLb = weightN / UNITS.lbfToN;
  const part23 = b.category !== "part25";
  const f = part23 ? manoeuvreLoadFactorsPart23(mtowLb, b.category.replace("part23-", "") as Part23Category) : manoeuvreLoadFactorsPart25(mtowLb);
  const vs = stallSpeed(weightN, b.wingArea, b.clMax);
  const rows: { label: string; value: string; rule: string; ok?: boolean }[] = [
    { label: "Wing loading at MTOW", value: `${(weightN / b.wingArea).toFixed(0)} N/m² (${(weightN / b.wingArea / PSF).toFixed(1)} psf)`, rule: "W/S" },
    { label: "Positive limit load factor", value: f.positive.value.toFixed(3), rule: f.positive.rule },
    { label: "Negative limit load factor at VC", value: f.negativeAtVc.value.toFixed(3), rule: f.negativeAtVc.rule },
    { label: "Negative limit load factor at VD", value: f.negativeAtVd.value.toFixed(3), rule: f.negativeAtVd.rule },
    { label: "1-g stall speed from CLmax", value: `${vs.toFixed(1)} m/s EAS (typed VS1 ${b.vs1.toFixed(1)})`, rule: "VS = √(2W/(ρ0·S·CLmax))", ok: Math.abs(vs - b.vs1) / vs < 0.05 },
    { label: "VA at least VS1·√n", value: `${(b.vs1 * Math.sqrt(f.positive.value)).toFixed(1)} m/s (typed ${b.va.toFixed(1)})`, rule: part23 ? "14 CFR 23.335(c)" : "14 CFR 25.335(c)", ok: b.va >= b.vs1 * Math.sqrt(f.positive.value) - 1e-9 },
  ];
  if (part23) {
    const m = minimumDesignSpeedsPart23(weightN / b.wingArea / PSF, b.category.replace("part23-", "") as Part23Category);
    rows.push(
      { label: "Minimum VC", value: `${(m.vc.value * KT).toFixed(1)} m/s (typed ${b.vc.toFixed(1)})`, rule: m.vc.rule, ok: b.vc >= m.vc.value * KT - 1e-9 },
      { label: "Minimum VD", value: `${(m.vd.value * KT).toFixed(1)} m/s (typed ${b.vd.toFixed(1)})`, rule: m.vd.rule, ok: b.vd >= m.vd.value * KT - 1e-9 },
    );
  }
  return rows;
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
    derived: saved ? derivedFromRules(saved) : null,
    canEdit: hasPermission(current.roles, "case:edit") && steps.basis.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, BasisFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const { revision, ...typed } = parsed.value;
  const si = BasisSchema.safeParse(convertFields(typed, typed.units, BASIS_QUANTITIES, "toSI"));
  if (!si.success) return refused(fieldErrorsOf(si.error));
  return saveStepAnswer({ caseId: c.id, step: "basis", baseRevision: revision, data: si.data, actor: current.user });
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
        {loaderData.derived ? (
          <Panel title="What the rules give for the saved basis" className="mt-5">
            <table className="w-full text-sm">
              <tbody>
                {loaderData.derived.map((r) => (
                  <tr key={r.label} className="border-b border-line last:border-0">
                    <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-muted">{r.label}</th>
                    <td className="py-1 pr-3 tabular">
                      {r.ok === false ? <span className="font-semibold text-warn">⚠ {r.value}</span> : r.value}
                    </td>
                    <td className="py-1 text-xs text-ink-muted">{r.rule}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-2 text-xs text-ink-muted">A check of the typed values against the rules as coded here; the certification basis agreed with the authority governs.</p>
          </Panel>
        ) : null}
        <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save basis" />
      </Form>
    </>
  );
}

export function meta() {
  return [{ title: "Basis · Spanwright" }];
}
