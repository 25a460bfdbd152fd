import type { z } from "zod";
import { SelectField, TextAreaField, TextField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { Panel } from "~/components/ui/page-header";
import type { BasisData } from "~/domain/step-data";
import { CATEGORIES, CATEGORY_LABELS, DEFAULT_REGULATIONS } from "~/domain/vocabulary";
import { convertTyped } from "~/domain/form-values";
import { unitSymbol, type Quantity, type UnitSystem } from "~/domain/units";
import { BASIS_QUANTITIES } from "./basis.quantities";
import type { BasisFormSchema } from "./basis.schema";
import type { BasisCheck } from "~/services/basis.server";
import type { FieldErrors } from "~/utils/form-data";

/** The panels of the basis step's form; each takes the form, the server's messages and the units shown. */
interface FieldsProps {
  form: ZodForm<typeof BasisFormSchema>;
  server: FieldErrors | undefined;
  units: UnitSystem;
  /** The saved basis in SI, or null before the first save. */
  saved: BasisData | null;
}

const fieldErrors = ({ form, server }: FieldsProps) => (name: keyof z.input<typeof BasisFormSchema>) => errorsFor(form, server, name);
const symbols = (units: UnitSystem) => (q: Quantity) => unitSymbol(units, q);

/** The quantities of the form, typed in the other system, shown in the one just chosen (from the saved SI values where unchanged). */
function convertShown(form: FieldsProps["form"], to: UnitSystem, saved: BasisData | null) {
  const from: UnitSystem = to === "US" ? "SI" : "US";
  for (const [key, q] of Object.entries(BASIS_QUANTITIES) as [keyof typeof BASIS_QUANTITIES, Quantity][]) {
    form.setValue(key, convertTyped(form.getValues(key), q, from, to, saved?.[key]), { shouldDirty: true });
  }
}

/** Category (which sets the regulation references it starts from), the references, the units shown. */
export function BasisRulesPanel(props: FieldsProps) {
  const { form } = props;
  const err = fieldErrors(props);
  return (
    <Panel title="Rules">
      <SelectField
        label="Category"
        {...form.register("category", { onChange: (e) => form.setValue("regulations", DEFAULT_REGULATIONS[e.target.value as keyof typeof DEFAULT_REGULATIONS], { shouldDirty: true }) })}
        errors={err("category")}
      >
        {CATEGORIES.map((k) => (
          <option key={k} value={k}>
            {CATEGORY_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <TextAreaField label="Applicable regulation references" hint="Edit to the agreed certification basis (amendment levels, special conditions)." {...form.register("regulations")} errors={err("regulations")} />
      <SelectField label="Units shown" hint="Switching converts the values shown; stored in SI whatever you choose." {...form.register("units", { onChange: (e) => convertShown(form, e.target.value as UnitSystem, props.saved) })} errors={err("units")}>
        <option value="SI">SI (m, kg, m/s)</option>
        <option value="US">US customary (ft, lb, kt)</option>
      </SelectField>
    </Panel>
  );
}

export function BasisWeightsPanel(props: FieldsProps) {
  const { form } = props;
  const err = fieldErrors(props);
  const u = symbols(props.units);
  return (
    <Panel title="Weights">
      <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
        <TextField label={`Max take-off [${u("mass")}]`} inputMode="decimal" {...form.register("mtow")} errors={err("mtow")} />
        <TextField label={`Max zero-fuel [${u("mass")}]`} inputMode="decimal" {...form.register("mzfw")} errors={err("mzfw")} />
        <TextField label={`Minimum design [${u("mass")}]`} inputMode="decimal" {...form.register("minWeight")} errors={err("minWeight")} />
      </div>
      <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
        <TextField label={`Max landing [${u("mass")}]`} hint="Transport: with Zmo, the gust alleviation F_g." inputMode="decimal" {...form.register("mlw")} errors={err("mlw")} />
        <TextField label={`Max operating altitude Zmo [${u("altitude")}]`} inputMode="decimal" {...form.register("zmo")} errors={err("zmo")} />
      </div>
    </Panel>
  );
}

export function BasisSpeedsPanel(props: FieldsProps) {
  const { form } = props;
  const err = fieldErrors(props);
  const u = symbols(props.units);
  return (
    <Panel title="Design speeds (EAS)">
      <div className="grid grid-cols-2 gap-x-4 sm:grid-cols-4">
        <TextField label={`VS1 [${u("speed")}]`} inputMode="decimal" {...form.register("vs1")} errors={err("vs1")} />
        <TextField label={`VA [${u("speed")}]`} inputMode="decimal" {...form.register("va")} errors={err("va")} />
        <TextField label={`VC [${u("speed")}]`} inputMode="decimal" {...form.register("vc")} errors={err("vc")} />
        <TextField label={`VD [${u("speed")}]`} inputMode="decimal" {...form.register("vd")} errors={err("vd")} />
      </div>
      <div className="grid grid-cols-2 gap-x-4 sm:grid-cols-4">
        <TextField label={`VB [${u("speed")}]`} hint="Transport and commuter: gives the VB gust points." inputMode="decimal" {...form.register("vb")} errors={err("vb")} />
      </div>
    </Panel>
  );
}

export function BasisWingPanel(props: FieldsProps) {
  const { form } = props;
  const err = fieldErrors(props);
  const u = symbols(props.units);
  return (
    <Panel title="Wing and altitudes">
      <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
        <TextField label={`Wing reference area [${u("area")}]`} inputMode="decimal" {...form.register("wingArea")} errors={err("wingArea")} />
        <TextField label="Aircraft CLmax" inputMode="decimal" {...form.register("clMax")} errors={err("clMax")} />
        <TextField label="Negative CLmax" inputMode="decimal" {...form.register("clMaxNegative")} errors={err("clMaxNegative")} />
      </div>
      <TextField label={`Altitudes [${u("altitude")}]`} hint="Comma-separated, geopotential, standard atmosphere." {...form.register("altitudes")} errors={err("altitudes")} />
    </Panel>
  );
}

/** The flaps-extended conditions: the design flap speed and the aircraft CLmax with the flaps extended (the flapped span and its section data are in the sections step). */
export function BasisFlapsPanel(props: FieldsProps) {
  const { form } = props;
  const err = fieldErrors(props);
  const u = symbols(props.units);
  return (
    <Panel title="Flaps extended">
      <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-3">
        <TextField label={`VF [${u("speed")}]`} hint="Design flap speed, EAS." inputMode="decimal" {...form.register("vf")} errors={err("vf")} />
        <TextField label="CLmax with flaps" hint="Aircraft, flaps extended." inputMode="decimal" {...form.register("clMaxFlaps")} errors={err("clMaxFlaps")} />
      </div>
      <p className="text-xs text-ink-muted">
        With both, the envelope gets the flaps-extended conditions of 14 CFR 23.345 / 25.345 (n = 2.0 up to VF, gusts of 25 ft/s EAS at VF), solved on the flapped wing of the sections step. Leave both empty for a flaps-up basis.
      </p>
    </Panel>
  );
}

/** What the rules give for the saved basis, beside what was typed: a check, not a substitute. */
export function BasisChecksPanel({ checks }: { checks: readonly BasisCheck[] }) {
  return (
    <Panel title="What the rules give for the saved basis" className="mt-5">
      <table className="w-full text-sm">
        <tbody>
          {checks.map((r) => (
            <tr key={r.label} className="border-b border-line last:border-0">
              <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-muted">
                {r.label}
              </th>
              <td className="py-1 pr-3 tabular">{r.ok === false ? <span className="font-semibold text-warn">⚠ {r.value}</span> : r.value}</td>
              <td className="py-1 text-xs text-ink-muted">{r.rule}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-ink-muted">A check of the typed values against the rules as coded here; the certification basis agreed with the authority governs.</p>
    </Panel>
  );
}
