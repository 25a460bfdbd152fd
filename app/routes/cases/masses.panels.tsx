import { useState, type ChangeEvent } from "react";
import { useWatch } from "react-hook-form";
import { PlanformDrawing } from "~/components/case/planform-drawing";
import { TextField } from "~/components/forms/field";
import { errorsFor, type ZodForm } from "~/components/forms/use-zod-form";
import { DataTable } from "~/components/tables/data-table";
import { EditableGrid } from "~/components/tables/editable-grid";
import { Alert, Panel } from "~/components/ui/page-header";
import { parseItemCsv } from "~/domain/mass-items-csv";
import { describeProblem } from "~/domain/section-csv";
import type { PlanformData } from "~/domain/step-data";
import { formatNumber, fromSI, roundForDisplay, toSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { massesOverview } from "~/services/masses.server";
import type { FieldErrors } from "~/utils/form-data";
import { fillKey } from "./masses.fill-key";
import type { MassesFormSchema } from "./masses.schema";

type MassesForm = ZodForm<typeof MassesFormSchema>;
type Overview = ReturnType<typeof massesOverview>;
interface FormProps {
  form: MassesForm;
  server: FieldErrors | undefined;
  units: UnitSystem;
  disabled: boolean;
}

/** Text of a typed cell as a number in display units, or undefined where empty or not a number. */
const num = (v: unknown) => {
  if (v === "" || v === undefined || v === null) return undefined;
  const n = Number(String(v).replace(",", "."));
  return Number.isFinite(n) ? n : undefined;
};

/** Refusals of single grid rows ("items.2.kg"), named by row, above the form. */
export function MassRowErrors({ server }: { server: FieldErrors | undefined }) {
  const rows = Object.entries(server ?? {}).filter(([k]) => /^(items|massCases)\.\d+/.test(k));
  if (!rows.length) return null;
  return (
    <div className="mb-3">
      <Alert>
        {rows.map(([k, m]) => (
          <span key={k} className="block">
            {k.startsWith("items") ? "Item" : "Mass case"} row {Number(k.split(".")[1]) + 1}: {m?.join(" ")}
          </span>
        ))}
      </Alert>
    </div>
  );
}

/** The semispan's structural mass, spread in proportion to chord. */
export function StructurePanel({ form, server, units }: FormProps) {
  return (
    <Panel title="Structure">
      <TextField
        label={`Semispan structural mass [${unitSymbol(units, "mass")}]`}
        hint="Spread in proportion to chord on the reference axis. 0 where the items below are all the wing carries."
        inputMode="decimal"
        {...form.register("structureKg")}
        errors={errorsFor(form, server, "structureKg")}
      />
    </Panel>
  );
}

/** Point and spread masses of one semispan, typed, pasted or read from a CSV file. */
export function ItemsPanel({ form, server, units, disabled }: FormProps) {
  const L = unitSymbol(units, "length");
  const kg = unitSymbol(units, "mass");
  const [csvProblems, setCsvProblems] = useState<string[]>([]);
  const onCsv = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    if (!file) return;
    const r = parseItemCsv(await file.text());
    if (!r.ok) {
      setCsvProblems(r.problems.map(describeProblem));
      return;
    }
    setCsvProblems([]);
    form.setValue("items", r.rows, { shouldDirty: true });
    form.setValue("sourceKind", "csv", { shouldDirty: true });
    form.setValue("sourceFile", file.name, { shouldDirty: true });
  };
  return (
    <Panel title="Mass items of one semispan">
      <p className="mb-2 text-xs text-ink-muted">
        A point mass (engine, gear, store) has y; a spread mass (fuel in a tank bay) has y from and y to and is spread evenly between them. x is the streamwise position of the item's centre of gravity, from the origin of the
        planform's leading edges, aft positive: an item aft of the reference axis twists the wing nose up under positive load factor.
      </p>
      <EditableGrid
        form={form}
        name="items"
        caption="Mass items"
        columns={[
          { key: "id", label: "Item", type: "text" },
          { key: "label", label: "Description", type: "text" },
          { key: "kg", label: `Mass [${kg}]` },
          { key: "x", label: `x of CG [${L}]` },
          { key: "y", label: `y (point) [${L}]` },
          { key: "yFrom", label: `y from [${L}]` },
          { key: "yTo", label: `y to [${L}]` },
        ]}
        serverErrors={server}
        emptyRow={{ id: "", label: "", kg: "", x: "", y: "", yFrom: "", yTo: "" }}
        disabled={disabled}
        csvName="mass-items.csv"
      />
      {disabled ? null : (
        <label className="mt-3 block text-sm">
          <span className="mr-2 font-semibold">Read the item table from a CSV file</span>
          <input type="file" accept=".csv,text/csv,text/plain" aria-label="Item table CSV file" onChange={onCsv} className="text-sm" />
          <span className="mt-1 block text-xs text-ink-muted">
            Columns: id, description, mass, x, y, y from, y to (headers as the grid's own CSV export writes them; numbers in the units shown). The file replaces the rows above; nothing is saved until you save the step.
          </span>
        </label>
      )}
      {csvProblems.length ? (
        <div className="mt-2">
          <Alert>
            The file was not read:
            {csvProblems.map((p) => (
              <span key={p} className="block">
                {p}
              </span>
            ))}
          </Alert>
        </div>
      ) : null}
    </Panel>
  );
}

/** The aircraft's mass states with their weight and CG, and each item's fill factor in each. */
export function MassCasesPanel({ form, server, units, disabled }: FormProps) {
  const kg = unitSymbol(units, "mass");
  // Watched here, not by the page: a change to the rows renders this panel again, not the whole form.
  const items = (useWatch({ control: form.control, name: "items" }) ?? []).map((it) => String(it.id ?? "")).filter(Boolean);
  const cases = (useWatch({ control: form.control, name: "massCases" }) ?? []).map((mc) => String(mc.id ?? ""));
  return (
    <Panel title="Mass cases">
      <p className="mb-2 text-xs text-ink-muted">Each mass state of the aircraft — full fuel, zero fuel, reserve… — with its whole-aircraft weight and centre of gravity in % of the MAC. The envelope is generated for each mass case.</p>
      <EditableGrid
        form={form}
        name="massCases"
        caption="Mass cases"
        columns={[
          { key: "id", label: "Mass case", type: "text" },
          { key: "label", label: "Description", type: "text" },
          { key: "weight", label: `Weight, whole aircraft [${kg}]` },
          { key: "cg", label: "CG [% MAC]" },
        ]}
        serverErrors={server}
        emptyRow={{ id: "", label: "", weight: "", cg: "" }}
        disabled={disabled}
        csvName="mass-cases.csv"
      />
      <FillMatrix form={form} items={items} cases={cases} />
    </Panel>
  );
}

/** Fill factor of each item in each mass case: empty means full (the item counts fully). */
function FillMatrix({ form, items, cases }: { form: MassesForm; items: string[]; cases: string[] }) {
  if (items.length === 0 || cases.length === 0) return <p className="mt-3 text-xs text-ink-muted">Fill factors appear here once there are items and mass cases.</p>;
  return (
    <div className="mt-4">
      <p className="mb-1 text-sm font-semibold">Fill factor of each item (0–1; empty = full)</p>
      <div className="overflow-x-auto rounded border border-line bg-surface">
        <table className="w-full text-sm">
          <caption className="sr-only">Fill factors of the items in each mass case</caption>
          <thead className="border-b border-line bg-canvas text-xs text-ink-muted">
            <tr>
              <th scope="col" className="px-2 py-1.5 text-left font-semibold">
                Mass case
              </th>
              {items.map((id) => (
                <th key={id} scope="col" className="px-2 py-1.5 text-right font-semibold">
                  {id}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {cases.map((mc, i) => (
              <tr key={`${i}-${mc}`} className="border-b border-line last:border-0">
                <th scope="row" className="px-2 py-1 text-left font-normal">
                  {mc || `row ${i + 1}`}
                </th>
                {items.map((id) => (
                  <td key={id} className="px-2 py-1">
                    <input
                      aria-label={`Fill of ${id} in ${mc || `mass case ${i + 1}`}`}
                      inputMode="decimal"
                      placeholder="1"
                      className="w-full min-w-14 rounded border border-line px-1.5 py-0.5 text-right tabular"
                      {...form.register(`massCases.${i}.fill.${fillKey(id)}`)}
                    />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

/** The inputs of the aircraft's balance: the wing–body moment and the tail arm. */
export function BalancePanel({ form, server, units }: FormProps) {
  return (
    <Panel title="Balance">
      <p className="mb-2 text-xs text-ink-muted">
        With both given, each trimmed case's tail load comes from pitching-moment equilibrium about its mass case's centre of gravity (the wing's own lift and moment from the solver, at the case's Mach number); a tail load
        typed in the envelope wins. Without them the wing carries nz·W.
      </p>
      <div className="grid gap-x-4 sm:grid-cols-2">
        <TextField label="Wing–body Cm increment at zero lift" hint="Fuselage and nacelles, on S and the MAC; nose up positive." inputMode="decimal" {...form.register("cmBody")} errors={errorsFor(form, server, "cmBody")} />
        <TextField
          label={`Tail arm [${unitSymbol(units, "length")}]`}
          hint="From the MAC quarter chord aft to the horizontal tail's aerodynamic centre."
          inputMode="decimal"
          {...form.register("tailArm")}
          errors={errorsFor(form, server, "tailArm")}
        />
      </div>
    </Panel>
  );
}

/** The planform to scale with the items as typed (not yet saved) and each mass case's CG on the MAC. */
export function MassesDrawingPanel({ form, planform, overview, units }: { form: MassesForm; planform: PlanformData | null; overview: Overview; units: UnitSystem }) {
  const length = (v: unknown) => {
    const n = num(v);
    return n === undefined ? undefined : toSI(units, "length", n);
  };
  const drawn = (useWatch({ control: form.control, name: "items" }) ?? [])
    .filter((it) => it.id)
    .map((it) => ({ id: String(it.id), kg: num(it.kg) ?? 0, x: length(it.x) ?? Number.NaN, y: length(it.y), yFrom: length(it.yFrom), yTo: length(it.yTo) }));
  const cgs = (useWatch({ control: form.control, name: "massCases" }) ?? []).flatMap((mc) => {
    const cg = num(mc.cg);
    return mc.id && cg !== undefined ? [{ label: String(mc.id), fraction: cg / 100 }] : [];
  });
  return (
    <Panel title="Where the masses sit (to scale)">
      {planform ? (
        <PlanformDrawing
          stations={planform.stations}
          mac={overview.mac ?? undefined}
          axis={{ root: planform.axisRoot, tip: planform.axisTip }}
          unitLabel={unitSymbol(units, "length")}
          scaleToDisplay={(m) => fromSI(units, "length", m)}
          items={drawn}
          cgs={cgs}
        />
      ) : (
        <p className="text-sm text-ink-muted">{overview.problem}</p>
      )}
    </Panel>
  );
}

/** The saved mass cases: weight, CG, what the wing carries, the root relief per g, and the checks against the basis. */
export function SavedMassCasesPanel({ overview, hasPlanform, units }: { overview: Overview; hasPlanform: boolean; units: UnitSystem }) {
  return (
    <Panel title="Mass cases, as saved">
      {overview.summaries.length === 0 ? (
        <p className="text-sm text-ink-muted">No mass cases saved: the envelope is generated for MTOW, MZFW and the minimum weight of the basis, with every item at full mass.</p>
      ) : (
        <MassCaseTable summaries={overview.summaries} relief={overview.relief} units={units} />
      )}
      {overview.problem && hasPlanform ? <p className="mt-2 text-sm text-danger">{overview.problem}</p> : null}
    </Panel>
  );
}

function MassCaseTable({ summaries, relief, units }: { summaries: Overview["summaries"]; relief: Overview["relief"]; units: UnitSystem }) {
  const F = unitSymbol(units, "force");
  const Mo = unitSymbol(units, "moment");
  const kg = unitSymbol(units, "mass");
  const rows = summaries.map((s) => ({ ...s, relief: relief.find((r) => r.massCase === s.id) }));
  const mass = (v: number) => fromSI(units, "mass", v);
  return (
    <>
      <DataTable
        rows={rows}
        caption="Mass cases"
        csvName="mass-cases.csv"
        columns={[
          { id: "id", header: "Mass case", value: (r) => r.id },
          { id: "weight", header: `Weight [${kg}]`, value: (r) => (r.weight === null ? null : roundForDisplay(mass(r.weight))), numeric: true, format: (r) => (r.weight === null ? "—" : formatNumber(mass(r.weight), 5)) },
          { id: "cg", header: "CG [% MAC]", value: (r) => (r.cg === null ? null : r.cg * 100), numeric: true, format: (r) => (r.cg === null ? "—" : formatNumber(r.cg * 100, 4)) },
          { id: "itemsKg", header: `Items, one side [${kg}]`, value: (r) => mass(r.itemsKg), numeric: true, format: (r) => formatNumber(mass(r.itemsKg), 4) },
          { id: "wingKg", header: `Both wings [${kg}]`, value: (r) => mass(r.wingKg), numeric: true, format: (r) => formatNumber(mass(r.wingKg), 4) },
          {
            id: "shear",
            header: `Root relief per g, shear [${F}]`,
            value: (r) => (r.relief ? fromSI(units, "force", r.relief.shear) : null),
            numeric: true,
            format: (r) => (r.relief ? formatNumber(fromSI(units, "force", r.relief.shear), 4) : "—"),
          },
          {
            id: "bending",
            header: `bending [${Mo}]`,
            value: (r) => (r.relief ? fromSI(units, "moment", r.relief.bending) : null),
            numeric: true,
            format: (r) => (r.relief ? formatNumber(fromSI(units, "moment", r.relief.bending), 4) : "—"),
          },
          {
            id: "torsion",
            header: `torsion [${Mo}]`,
            value: (r) => (r.relief ? fromSI(units, "moment", r.relief.torsion) : null),
            numeric: true,
            format: (r) => (r.relief ? formatNumber(fromSI(units, "moment", r.relief.torsion), 4) : "—"),
          },
        ]}
      />
      <ul className="mt-3 space-y-1 text-xs">
        {summaries.flatMap((s) =>
          s.checks.map((c) => (
            <li key={`${s.id}-${c.text}`} className={c.ok ? "text-ink-muted" : "font-semibold text-warn"}>
              {c.ok ? "✓" : "⚠"} {s.id}: {c.text}
            </li>
          )),
        )}
      </ul>
      <p className="mt-2 text-xs text-ink-muted">
        Relief per g: what the structure and the items of one semispan take off the root shear, bending and torsion (about the reference axis) at nz = 1; a case at nz takes nz times as much.
      </p>
    </>
  );
}
