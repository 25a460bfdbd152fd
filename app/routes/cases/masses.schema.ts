import { z } from "zod";
import { numberInput, optionalNumberInput } from "~/domain/form-inputs";
import { BalanceSchema, MassCaseSchema, MassesSchema, MassItemSchema, type MassesData } from "~/domain/step-data";
import { fromSI, tidy, toSI, type UnitSystem } from "~/domain/units";
import { fillKey, itemIdOfFillKey } from "./masses.fill-key";


const text = (max: number) => z.string().max(max, `At most ${max} characters`).default("");

// The stored masses' checks that hold in any unit (signs, fill factors, the Cm increment), said in the form too.
const item = MassItemSchema.shape;
const massCase = MassCaseSchema.shape;
// The form takes the centre of gravity in % MAC; the stored fraction's range, in those terms.
const cgPercent = z.number().refine((v) => v >= -50 && v <= 150, { message: "The centre of gravity lies between −50 and 150 % MAC" });

/** The masses form as typed, in the person's display units (CG in % MAC); the action converts it to SI. */
export const MassesFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  structureKg: numberInput("Semispan structural mass", MassesSchema.shape.structureKg),
  items: z
    .array(
      z.strictObject({
        id: text(40),
        label: text(80),
        kg: numberInput("Mass", item.kg),
        x: numberInput("x of the centre of gravity"),
        y: optionalNumberInput("y"),
        yFrom: optionalNumberInput("y from"),
        yTo: optionalNumberInput("y to"),
      }),
    )
    .max(100, "At most 100 mass items")
    .default([]),
  massCases: z
    .array(
      z.strictObject({
        id: text(40),
        label: text(80),
        weight: optionalNumberInput("Weight", massCase.weight.unwrap()),
        cg: optionalNumberInput("Centre of gravity", cgPercent),
        fill: z.record(z.string().max(80), optionalNumberInput("Fill factor", massCase.fill.unwrap().valueType)).default({}),
      }),
    )
    .max(24, "At most 24 mass cases")
    .default([]),
  cmBody: optionalNumberInput("Wing–body Cm increment", BalanceSchema.shape.cmBody),
  tailArm: optionalNumberInput("Tail arm", BalanceSchema.shape.tailArm),
  sourceKind: z.enum(["typed", "csv", "import"]).default("typed"),
  sourceFile: text(200),
}).superRefine((f, ctx) => {
  // A balance needs both of its inputs; with neither, the wing carries nz·W.
  if ((f.cmBody === undefined) !== (f.tailArm === undefined)) {
    ctx.addIssue({ code: "custom", path: [f.cmBody === undefined ? "cmBody" : "tailArm"], message: "Give both the wing–body Cm increment and the tail arm for a balance, or neither" });
  }
});

type MassesForm = z.output<typeof MassesFormSchema>;

/** The saved masses as the form shows them, in the case's display units (CG in % MAC). */
export function massesFormValues(m: MassesData | null, units: UnitSystem) {
  const M = (v: number) => String(tidy(fromSI(units, "mass", v)));
  const L = (v: number | undefined) => (v === undefined ? "" : String(tidy(fromSI(units, "length", v))));
  if (!m) return { structureKg: "0", items: [], massCases: [], cmBody: "", tailArm: "", sourceKind: "typed" as const, sourceFile: "" };
  return {
    structureKg: M(m.structureKg),
    items: m.items.map((it) => ({ id: it.id, label: it.label, kg: M(it.kg), x: L(it.x), y: L(it.y), yFrom: L(it.yFrom), yTo: L(it.yTo) })),
    massCases: m.massCases.map((mc) => ({
      id: mc.id,
      label: mc.label,
      weight: mc.weight === undefined ? "" : M(mc.weight),
      cg: mc.cg === undefined ? "" : String(tidy(mc.cg * 100)),
      fill: Object.fromEntries(Object.entries(mc.fill).map(([id, v]) => [fillKey(id), String(v)])),
    })),
    cmBody: m.balance ? String(m.balance.cmBody) : "",
    tailArm: m.balance ? L(m.balance.tailArm) : "",
    sourceKind: m.source.kind,
    sourceFile: m.source.filename ?? "",
  };
}

/** The typed masses in SI (kg, m, CG as a fraction of the MAC), as the masses step stores them (its own schema checks them next). */
export function massesToSI(f: MassesForm, units: UnitSystem) {
  const M = (v: number) => toSI(units, "mass", v);
  const L = (v: number | undefined) => (v === undefined ? undefined : toSI(units, "length", v));
  const ids = new Set(f.items.map((it) => it.id));
  return {
    structureKg: M(f.structureKg),
    items: f.items.map((it) => ({ id: it.id, label: it.label, kg: M(it.kg), x: L(it.x)!, y: L(it.y), yFrom: L(it.yFrom), yTo: L(it.yTo) })),
    massCases: f.massCases.map((mc) => ({
      id: mc.id,
      label: mc.label,
      weight: mc.weight === undefined ? undefined : M(mc.weight),
      cg: mc.cg === undefined ? undefined : mc.cg / 100,
      // An empty fill means "full" (not named); a fill for an item no longer in the table is dropped.
      fill: Object.fromEntries(
        Object.entries(mc.fill)
          .map(([k, v]) => [itemIdOfFillKey(k), v] as const)
          .filter(([id, v]) => v !== undefined && ids.has(id)),
      ),
    })),
    ...(f.cmBody !== undefined && f.tailArm !== undefined ? { balance: { cmBody: f.cmBody, tailArm: L(f.tailArm)! } } : {}),
    source: { kind: f.sourceKind, ...(f.sourceFile ? { filename: f.sourceFile } : {}) },
  };
}
