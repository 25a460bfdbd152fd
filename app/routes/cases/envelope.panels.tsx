import { useState } from "react";
import { VORTEX_LATTICE_DEFAULT_STRIPS } from "~/engine";
import { vnOption } from "~/charts/vn";
import { Chart } from "~/components/charts/chart";
import { SelectField, TextField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Button } from "~/components/ui/button";
import { Alert, Panel } from "~/components/ui/page-header";
import { COMPRESSIBILITY_RULES, RULE_LABELS, SPANWISE_LABELS, SPANWISE_METHODS } from "~/domain/step-data";
import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { VnSet } from "~/services/envelope.server";
import type { FieldErrors } from "~/utils/form-data";
import type { EnvelopeFormSchema } from "./envelope.schema";

const G0 = 9.80665;

type EnvelopeForm = ZodForm<typeof EnvelopeFormSchema>;

/** The V–n diagram of each design weight and altitude, one shown at a time, with its gust data. */
export function VnPanel({ sets, problem, stall, units }: { sets: VnSet[]; problem: string | null; stall: { area: number; clMax: number; clMaxNegative: number } | null; units: UnitSystem }) {
  const [setIndex, setSetIndex] = useState(0);
  const set = sets[setIndex];
  return (
    <Panel title="V–n diagram">
      {problem ? (
        <p className="text-sm text-ink-muted">{problem}</p>
      ) : set && stall ? (
        <>
          <label className="mb-2 block text-sm">
            <span className="mr-2 font-semibold">Weight and altitude</span>
            <select value={setIndex} onChange={(e) => setSetIndex(Number(e.target.value))} className="rounded border border-line-strong px-2 py-1">
              {sets.map((s, i) => (
                <option key={s.label} value={i}>
                  W{i + 1}: {s.label}
                </option>
              ))}
            </select>
          </label>
          <Chart
            option={vnOption(`V–n diagram, ${set.label}`, set.points, { ...stall, weightN: set.weightKg * G0 }, { symbol: unitSymbol(units, "speed"), fromSI: (v) => fromSI(units, "speed", v) }) as never}
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
  );
}

/** The compressibility rule, the spanwise solver, its strips and the output stations of every case of this file. */
export function MethodPanel({ form, server, disabled, busy, noDiagram }: { form: EnvelopeForm; server: FieldErrors | undefined; disabled: boolean; busy: boolean; noDiagram: boolean }) {
  return (
    <Panel title="Method for this case file">
      <div className="grid gap-x-4 sm:grid-cols-2 xl:grid-cols-4">
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
        <TextField label="Vortex-lattice strips per semispan" inputMode="numeric" placeholder={String(VORTEX_LATTICE_DEFAULT_STRIPS)} {...form.register("strips")} errors={errorsFor(form, server, "strips")} />
      </div>
      <p className="mb-2 text-xs text-ink-muted">
        Strips set the resolution of the vortex-lattice solve ({VORTEX_LATTICE_DEFAULT_STRIPS} when empty, 8–2000; not used by the lifting line). The distribution page shows how much the result moves when they are halved.
      </p>
      {disabled ? null : (
        <Button type="submit" variant="secondary" disabled={busy || noDiagram} onClick={() => form.setValue("intent", "generate")}>
          Generate cases from the basis rules
        </Button>
      )}
      <p className="mt-1 text-xs text-ink-muted">Generating replaces the generated cases and keeps the ones you added by hand (kind “manual”).</p>
    </Panel>
  );
}

/** The load cases in a grid, with messages of the server by row. */
export function CasesPanel({ form, server, units, disabled, count }: { form: EnvelopeForm; server: FieldErrors | undefined; units: UnitSystem; disabled: boolean; count: number }) {
  return (
    <Panel title={`Load cases (${count})`} className="mt-5">
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
        form={form}
        serverErrors={server}
        emptyRow={{ id: "", kind: "manual", rule: "added by hand", mach: "", altitude: "", weight: "", nz: "", alpha: "" }}
        disabled={disabled}
        csvName="load-cases.csv"
      />
      <p className="mt-2 text-xs text-ink-muted">Give each case either weight and load factor (trimmed to L = nz·W) or an angle of attack.</p>
    </Panel>
  );
}

/** Messages of the server about rows of the case grid, by row. */
export function CaseRowErrors({ server }: { server: FieldErrors | undefined }) {
  const rowErrors = Object.entries(server ?? {}).filter(([k]) => k.startsWith("cases."));
  if (rowErrors.length === 0) return null;
  return (
    <div className="mb-3">
      <Alert>
        {rowErrors.map(([k, m]) => (
          <span key={k} className="block">
            Case row {Number(k.split(".")[1]) + 1}: {m?.join(" ")}
          </span>
        ))}
      </Alert>
    </div>
  );
}
