import { useState } from "react";
import { Form, useNavigation } from "react-router";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { tidy } from "~/domain/form-values";
import { EnvelopeSchema, RULE_LABELS, SPANWISE_LABELS, COMPRESSIBILITY_RULES, SPANWISE_METHODS, type EnvelopeData } from "~/domain/step-data";
import { fromSI, toSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { vnOption } from "~/charts/vn";
import { StepSaveBar } from "~/components/case/step-save-bar";
import { Chart } from "~/components/charts/chart";
import { UnsavedGuard } from "~/components/case/unsaved-guard";
import { ResultsCaution } from "~/components/case/caution";
import { SelectField, TextField } from "~/components/forms/field";
import { errorsFor, useZodForm } from "~/components/forms/use-zod-form";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { caseInputs } from "~/services/analysis.server";
import { caseUnits, getCaseSteps } from "~/services/case-steps.server";
import { regeneratedCases, vnSets, type VnSet } from "~/services/envelope.server";
import { fieldErrorsOf } from "~/utils/form-data";
import { answer, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/envelope";
import { saveStepAnswer } from "./step-action.server";
import { EnvelopeFormSchema } from "./envelope.schema";
import { DomainError } from "~/domain/errors";

const G0 = 9.80665;
// Fields whose messages show beside them; the rest go to the banner.
const INLINE_FIELDS = ["compressibility", "spanwise", "stations"];
const DEFAULT_METHOD = { compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: 40 } as const;

function toDisplay(env: EnvelopeData | null, units: UnitSystem) {
  const m = env ?? { ...DEFAULT_METHOD, cases: [] };
  return {
    compressibility: m.compressibility,
    spanwise: m.spanwise,
    stations: String(m.stations),
    cases: m.cases.map((c) => ({
      id: c.id,
      kind: c.kind,
      rule: c.rule,
      mach: String(tidy(c.mach)),
      altitude: String(tidy(fromSI(units, "altitude", c.altitude))),
      alpha: c.alpha === undefined ? "" : String(c.alpha),
      weight: c.weight === undefined ? "" : String(tidy(fromSI(units, "mass", c.weight / G0))),
      nz: c.nz === undefined ? "" : String(tidy(c.nz)),
      excluded: c.excluded,
    })),
  };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  let sets: VnSet[] = [];
  let vnProblem: string | null = null;
  if (inputs.basis && inputs.planform && inputs.sections) {
    try {
      sets = vnSets(inputs.basis, inputs.planform, inputs.sections, inputs.envelope ?? DEFAULT_METHOD);
    } catch (error) {
      if (!(error instanceof DomainError)) throw error;
      vnProblem = error.message;
    }
  } else {
    vnProblem = "Save the basis, planform and sections first: the V–n diagram and generated cases need the weights, speeds, the wing and its lift slope.";
  }
  return {
    units,
    revision: steps.envelope.revision,
    status: steps.envelope.status,
    values: toDisplay(inputs.envelope, units),
    sets,
    vnProblem,
    stall: inputs.basis ? { area: inputs.basis.wingArea, clMax: inputs.basis.clMax, clMaxNegative: inputs.basis.clMaxNegative } : null,
    canEdit: hasPermission(current.roles, "case:edit") && steps.envelope.status !== "submitted",
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:edit");
  const parsed = await parseBody(request, EnvelopeFormSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const steps = await getCaseSteps(c.id);
  const units = caseUnits(steps);
  const inputs = caseInputs(steps);
  const form = parsed.value;
  const method = { compressibility: form.compressibility, spanwise: form.spanwise, stations: form.stations };
  return answer(async () => {
    const cases =
      form.intent === "generate"
        ? regeneratedCases(inputs, method)
        : form.cases.map((k) => ({
            ...k,
            altitude: toSI(units, "altitude", k.altitude),
            weight: k.weight === undefined ? undefined : toSI(units, "mass", k.weight) * G0,
          }));
    const si = EnvelopeSchema.safeParse({ ...method, cases });
    if (!si.success) return refused(fieldErrorsOf(si.error));
    return saveStepAnswer({ caseId: c.id, step: "envelope", baseRevision: form.revision, data: si.data, actor: current.user });
  });
}

export default function EnvelopeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { units } = loaderData;
  const { form, onSubmit } = useZodForm(EnvelopeFormSchema, { intent: "save", revision: loaderData.revision, ...loaderData.values } as never, loaderData.revision);
  const busy = useNavigation().state === "submitting";
  const server = actionData?.fieldErrors as Record<string, string[] | undefined> | undefined;
  const [setIndex, setSetIndex] = useState(0);
  const set = loaderData.sets[setIndex];
  const disabled = !loaderData.canEdit;
  // Everything the server said that no field of the form shows: stale revision, read-only step, a rule of the basis.
  const general = Object.entries(server ?? {})
    .filter(([k]) => !INLINE_FIELDS.includes(k) && !k.startsWith("cases."))
    .flatMap(([, m]) => m ?? []);
  const rowErrors = Object.entries(server ?? {}).filter(([k]) => k.startsWith("cases."));
  return (
    <>
      <PageHeader title="Envelope" description="Load cases from the manoeuvre and gust rules of the basis, drawn on the V–n diagram, and the method used for every case of this file." />
      <ResultsCaution />
      <UnsavedGuard dirty={form.formState.isDirty && !actionData?.ok} />
      {actionData?.ok ? <div className="mb-3"><Alert tone="info">Saved as revision {actionData.revision}.</Alert></div> : null}
      {general.length ? <div className="mb-3"><Alert>{general.join(" ")}</Alert></div> : null}
      {rowErrors.length ? (
        <div className="mb-3">
          <Alert>
            {rowErrors.map(([k, m]) => (
              <span key={k} className="block">
                Case row {Number(k.split(".")[1]) + 1}: {m?.join(" ")}
              </span>
            ))}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-5 2xl:grid-cols-2">
        <Panel title="V–n diagram">
          {loaderData.vnProblem ? (
            <p className="text-sm text-ink-muted">{loaderData.vnProblem}</p>
          ) : set && loaderData.stall ? (
            <>
              <label className="mb-2 block text-sm">
                <span className="mr-2 font-semibold">Weight and altitude</span>
                <select value={setIndex} onChange={(e) => setSetIndex(Number(e.target.value))} className="rounded border border-line-strong px-2 py-1">
                  {loaderData.sets.map((s, i) => (
                    <option key={s.label} value={i}>
                      W{i + 1}: {s.label}
                    </option>
                  ))}
                </select>
              </label>
              <Chart
                option={vnOption(`V–n diagram, ${set.label}`, set.points, { ...loaderData.stall, weightN: set.weightKg * G0 }, { symbol: unitSymbol(units, "speed"), fromSI: (v) => fromSI(units, "speed", v) }) as never}
                label="V–n diagram"
                fileName={`vn-W${setIndex + 1}`}
              />
              <p className="mt-2 text-xs text-ink-muted">
                Gust lift slope (wing, at VC): {set.liftSlope.toFixed(3)} /rad. Gusts {fromSI(units, "speed", set.gustAtVc).toFixed(1)} / {fromSI(units, "speed", set.gustAtVd).toFixed(1)} {unitSymbol(units, "speed")} EAS at VC / VD ({set.gustRule}). For transport aeroplanes the Pratt
                gust points are a preliminary estimate: 14 CFR 25.341(a) asks for a dynamic discrete-gust analysis, and flight-profile alleviation is not applied here.
              </p>
            </>
          ) : null}
        </Panel>
        <Form method="post" onSubmit={onSubmit} noValidate>
          <input type="hidden" {...form.register("revision")} />
          <input type="hidden" {...form.register("intent")} />
          <fieldset disabled={disabled}>
            <Panel title="Method for this case file">
              <div className="grid gap-x-4 sm:grid-cols-3">
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
              </div>
              {disabled ? null : (
                <Button type="submit" variant="secondary" disabled={busy || Boolean(loaderData.vnProblem)} onClick={() => form.setValue("intent", "generate" as never)}>
                  Generate cases from the basis rules
                </Button>
              )}
              <p className="mt-1 text-xs text-ink-muted">Generating replaces the generated cases and keeps the ones you added by hand (kind “manual”).</p>
            </Panel>
            <Panel title={`Load cases (${loaderData.values.cases.length})`} className="mt-5">
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
                  { key: "excluded", label: "Excluded", type: "checkbox" },
                  { key: "rule", label: "From rule", type: "text" },
                ]}
                control={form.control as never}
                register={form.register as never}
                setValue={form.setValue as never}
                errors={form.formState.errors}
                serverErrors={server}
                emptyRow={{ id: "", kind: "manual", rule: "added by hand", mach: "", altitude: "", weight: "", nz: "", alpha: "" }}
                disabled={disabled}
                csvName="load-cases.csv"
                getValues={() => form.getValues("cases" as never) as never}
              />
              <p className="mt-2 text-xs text-ink-muted">Give each case either weight and load factor (trimmed to L = nz·W) or an angle of attack.</p>
            </Panel>
          </fieldset>
          <StepSaveBar canEdit={loaderData.canEdit} status={loaderData.status} revision={loaderData.revision} busy={busy} label="Save envelope" onSave={() => form.setValue("intent", "save" as never)} />
        </Form>
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Envelope · Spanwright" }];
}
