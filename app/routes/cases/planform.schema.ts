import { z } from "zod";
import { numberInput } from "~/domain/form-inputs";
import { PlanformSchema, PlanformStationSchema, type PlanformData } from "~/domain/step-data";
import { fromSI, tidy, toSI, type UnitSystem } from "~/domain/units";

// The stored planform's checks that hold in any length unit (sign, degrees, chord fraction), said in the form too.
const station = PlanformStationSchema.shape;

export const PlanformFormSchema = z.strictObject({
  revision: numberInput("Revision"),
  stations: z
    .array(z.strictObject({ y: numberInput("y"), xLe: numberInput("Leading edge x"), chord: numberInput("Chord", station.chord), twist: numberInput("Twist", station.twist) }))
    .min(2, "Give at least two stations: root and tip"),
  axisRoot: numberInput("Reference axis at the root", PlanformSchema.shape.axisRoot),
  axisTip: numberInput("Reference axis at the tip", PlanformSchema.shape.axisTip),
});

/** The saved planform as the form shows it, lengths in the display units (a blank wing of two stations when none is saved). */
export function planformFormValues(p: PlanformData | null, units: UnitSystem) {
  if (!p) return { stations: [{ y: "0", xLe: "0", chord: "", twist: "0" }, { y: "", xLe: "", chord: "", twist: "0" }], axisRoot: "0.25", axisTip: "0.25" };
  const L = (v: number) => String(tidy(fromSI(units, "length", v)));
  return {
    stations: p.stations.map((s) => ({ y: L(s.y), xLe: L(s.xLe), chord: L(s.chord), twist: String(s.twist) })),
    axisRoot: String(p.axisRoot),
    axisTip: String(p.axisTip),
  };
}

/** The checked form in SI, as the planform step stores it (the step's own schema checks it next). */
export function planformToSI(v: z.output<typeof PlanformFormSchema>, units: UnitSystem) {
  const L = (x: number) => toSI(units, "length", x);
  return { stations: v.stations.map((s) => ({ y: L(s.y), xLe: L(s.xLe), chord: L(s.chord), twist: s.twist })), axisRoot: v.axisRoot, axisTip: v.axisTip };
}
