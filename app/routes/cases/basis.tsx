import { Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { convertFields, tidy } from "~/domain/form-values";
import { BasisSchema, DEFAULT_REGULATIONS, type BasisData } from "~/domain/step-data";
import type { UnitSystem } from "~/domain/units";
import { BasisChecksPanel, BasisRulesPanel, BasisSpeedsPanel, BasisWeightsPanel, BasisWingPanel, type BasisCheck } from "./basis.panels";
import { StepAnswer } from "~/components/case/step-answer";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { useZodForm } from "~/components/forms/use-zod-form";
import { PageHeader } from "~/components/ui/page-header";
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
  const rows: BasisCheck[] = [
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
  const { form, onSubmit } = useZodForm(BasisFormSchema, { ...loaderData.values, revision: loaderData.revision }, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const fields = { form, server: actionData?.fieldErrors, units: form.watch("units") ?? "SI" };
  return (
    <>
      <PageHeader title="Basis" description="The certification basis of the case: the rules that apply, weights, design speeds (equivalent airspeed) and altitudes." />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      <StepAnswer answer={actionData} inline={Object.keys(BasisFormSchema.shape).filter((k) => k !== "revision")} />
      <Form method="post" onSubmit={onSubmit} noValidate>
        <input type="hidden" {...form.register("revision")} />
        <fieldset disabled={!loaderData.canEdit} className="grid gap-5 xl:grid-cols-2">
          <BasisRulesPanel {...fields} />
          <BasisWeightsPanel {...fields} />
          <BasisSpeedsPanel {...fields} />
          <BasisWingPanel {...fields} />
        </fieldset>
        {loaderData.derived ? <BasisChecksPanel checks={loaderData.derived} /> : null}
        <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save basis" />
      </Form>
    </>
  );
}

export function meta() {
  return [{ title: "Basis · Spanwright" }];
}
