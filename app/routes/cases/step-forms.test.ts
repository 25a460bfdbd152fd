import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { BASIS_FIELDS, BASIS_QUANTITIES } from "./basis.quantities";
import { BasisFormSchema } from "./basis.schema";
import { EnvelopeFormSchema } from "./envelope.schema";
import { MassesFormSchema } from "./masses.schema";
import { PlanformFormSchema } from "./planform.schema";
import { SectionsFormSchema } from "./sections.schema";

/** The messages a form's schema gives, by field path ("stations.1.chord"), as the page shows them beside each field. */
function messages(schema: z.ZodType, input: unknown): Record<string, string[]> {
  const r = schema.safeParse(input);
  if (r.success) return {};
  const out: Record<string, string[]> = {};
  for (const issue of r.error.issues) (out[issue.path.join(".")] ??= []).push(issue.message);
  return out;
}

const basis = {
  revision: "0",
  units: "SI",
  category: "part25",
  regulations: "14 CFR 25.337",
  mtow: "3200",
  mzfw: "2900",
  minWeight: "2400",
  vs1: "35",
  va: "60",
  vc: "75",
  vd: "95",
  altitudes: "0, 3000",
  wingArea: "16",
  clMax: "1.6",
  clMaxNegative: "-1",
};

describe("the step forms say the rule a number breaks, naming the field", () => {
  it("basis: a negative weight must be positive, text must be a number, an empty field is required", () => {
    expect(messages(BasisFormSchema, basis)).toEqual({});
    expect(messages(BasisFormSchema, { ...basis, mtow: "-3200" })).toEqual({ mtow: ["Maximum design take-off weight must be positive"] });
    expect(messages(BasisFormSchema, { ...basis, mtow: "heavy" })).toEqual({ mtow: ["Maximum design take-off weight must be a number"] });
    expect(messages(BasisFormSchema, { ...basis, mtow: "" })).toEqual({ mtow: ["Maximum design take-off weight is required"] });
    expect(messages(BasisFormSchema, { ...basis, vd: "0", wingArea: "-16", mlw: "-1" })).toEqual({
      vd: ["VD must be positive"],
      wingArea: ["Wing reference area must be positive"],
      mlw: ["Maximum landing weight must be positive"],
    });
    expect(messages(BasisFormSchema, { ...basis, clMaxNegative: "0.8" })).toEqual({ clMaxNegative: ["Negative CLmax must be below 0"] });
  });

  it("planform: chord positive, twist within ±20°, the reference axis a chord fraction", () => {
    const ok = { revision: "0", axisRoot: "0.25", axisTip: "0.25", stations: [{ y: "0", xLe: "0", chord: "1.6", twist: "0" }, { y: "5", xLe: "0.2", chord: "1", twist: "-2" }] };
    expect(messages(PlanformFormSchema, ok)).toEqual({});
    const bad = { ...ok, axisTip: "1.2", stations: [ok.stations[0], { y: "5", xLe: "0.2", chord: "-1", twist: "25" }] };
    expect(messages(PlanformFormSchema, bad)).toEqual({
      "stations.1.chord": ["Chord must be positive"],
      "stations.1.twist": ["Twist must lie within ±20°"],
      axisTip: ["The reference axis is a chord fraction between 0 and 1"],
    });
  });

  it("sections: a0 and clmax positive, Cp,min below 0, y not negative", () => {
    const row = { y: "0", a0: "6.1", alphaL0: "-2", cmAc: "-0.05", clMax: "1.5", cpMin: "-0.6", cpMinCl: "0.3" };
    expect(messages(SectionsFormSchema, { intent: "save", revision: "0", rows: [row] })).toEqual({});
    expect(messages(SectionsFormSchema, { intent: "save", revision: "0", rows: [{ ...row, y: "-1", a0: "-6.1", clMax: "0", cpMin: "0.2" }] })).toEqual({
      "rows.0.y": ["y must be 0 or more"],
      "rows.0.a0": ["Lift-curve slope a0 must be positive"],
      "rows.0.clMax": ["clmax must be positive"],
      "rows.0.cpMin": ["Minimum Cp must be below 0 (a suction peak)"],
    });
  });

  it("masses: masses not negative, weight positive, CG in % MAC, fill factor between 0 and 1", () => {
    const ok = { revision: "0", structureKg: "120", items: [{ id: "fuel", label: "", kg: "90", x: "1.2", yFrom: "0.5", yTo: "3" }], massCases: [{ id: "mtow", label: "", weight: "3200", cg: "25", fill: { fuel: "1" } }] };
    expect(messages(MassesFormSchema, ok)).toEqual({});
    const bad = { ...ok, structureKg: "-5", items: [{ ...ok.items[0], kg: "-90" }], massCases: [{ ...ok.massCases[0], weight: "-3200", cg: "160", fill: { fuel: "1.5" } }] };
    expect(messages(MassesFormSchema, bad)).toEqual({
      structureKg: ["Semispan structural mass must be 0 or more (kg)"],
      "items.0.kg": ["Mass must be 0 or more"],
      "massCases.0.weight": ["Weight must be positive"],
      "massCases.0.cg": ["The centre of gravity lies between −50 and 150 % MAC"],
      "massCases.0.fill.fuel": ["A fill factor lies between 0 and 1"],
    });
  });

  it("load cases: weight positive, Mach subsonic, load factor and angle within their ranges, stations a whole number", () => {
    const row = { id: "M1", kind: "manoeuvre", rule: "", mach: "0.3", altitude: "0", alpha: "", weight: "31380", nz: "3.8", massCase: "", tailLoad: "", excluded: "" };
    const form = { intent: "save", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "40", strips: "", cases: [row] };
    expect(messages(EnvelopeFormSchema, form)).toEqual({});
    expect(messages(EnvelopeFormSchema, { ...form, stations: "40.5", cases: [{ ...row, weight: "-3200", mach: "1.2", nz: "20" }, { ...row, id: "A1", weight: "", nz: "", alpha: "40" }] })).toEqual({
      stations: ["Stations must be a whole number"],
      "cases.0.weight": ["Weight must be positive"],
      "cases.0.mach": ["Mach must be at least 0 and below 1 (subsonic rules only)"],
      "cases.0.nz": ["Load factor must lie within ±15"],
      "cases.1.alpha": ["Angle of attack must lie within ±30°"],
    });
  });

  it("load cases: a post with fewer rows than the grid's count (sent before the page's scripts ran) is refused, naming the cases", () => {
    const row = { id: "M1", kind: "manoeuvre", rule: "", mach: "0.3", altitude: "0", alpha: "", weight: "31380", nz: "3.8", massCase: "", tailLoad: "", excluded: "" };
    const form = { intent: "save", revision: "0", compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: "40", strips: "", cases: [row, { ...row, id: "M2" }] };
    expect(messages(EnvelopeFormSchema, { ...form, casesCount: "2" })).toEqual({});
    expect(messages(EnvelopeFormSchema, { ...form, casesCount: "228" })).toEqual({ cases: ["The page sent 2 of its 228 load cases (it had not finished loading); nothing was saved: save again."] });
    // Generating and saving the method do not read the rows.
    expect(messages(EnvelopeFormSchema, { ...form, intent: "method", casesCount: "228" })).toEqual({});
  });
});

describe("the basis page's field lists, kept apart from its schema so the page answers a click without zod", () => {
  it("name exactly the schema's fields (revision aside), and only those carry units", () => {
    expect([...BASIS_FIELDS].sort()).toEqual(Object.keys(BasisFormSchema.shape).filter((k) => k !== "revision").sort());
    for (const key of Object.keys(BASIS_QUANTITIES)) expect(BASIS_FIELDS).toContain(key);
  });
});
