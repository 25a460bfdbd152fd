import type { BasisData, EnvelopeData, LoadCase, PlanformData, SectionsData } from "~/domain/step-data";
import {
  designGustsPart23,
  isa,
  machFromEas,
  referenceGustPart25,
  solveMach,
  vnDiagram,
  wingGeometry,
  type Part23Category,
  type VnPoint,
} from "~/engine";
import { CASE_SCHEMA_ID, parseCase, wingModelOf } from "~/exchange";
import { exchangeStations, type CaseInputs } from "./analysis.server";
import { DomainError, problemsMessage } from "~/domain/errors";
import { runEngine } from "./engine.server";

const G0 = 9.80665;
const FT = 0.3048;

export interface VnSet {
  label: string;
  weightKg: number;
  altitude: number;
  points: VnPoint[];
  /** Airplane lift slope used in the gust formula (wing alone, at the V_C Mach number), per rad. */
  liftSlope: number;
  gustAtVc: number;
  gustAtVd: number;
  gustRule: string;
}

function category(basis: BasisData): { part: "23" | "25"; category?: Part23Category } {
  return basis.category === "part25" ? { part: "25" } : { part: "23", category: basis.category.replace("part23-", "") as Part23Category };
}

/**
 * The V–n diagram of each design weight and altitude of the basis, by the manoeuvre rules and the
 * Pratt gust formula. The gust formula needs the aeroplane's lift slope: the wing's, from the
 * spanwise solver at the V_C Mach number (the tail's contribution is left to the engineer).
 * Part 25 gusts use the reference gust velocity without the flight-profile alleviation (F_g = 1,
 * conservative); 25.341(a) asks for a dynamic analysis, so those points are preliminary.
 */
function vnSetsOf(basis: BasisData, planform: PlanformData, sections: SectionsData, method: Pick<EnvelopeData, "compressibility" | "spanwise">): VnSet[] {
  const parsed = parseCase({
    schema: CASE_SCHEMA_ID,
    wing: { stations: exchangeStations(planform, sections) },
    method: { compressibility: method.compressibility, spanwise: method.spanwise, stations: 20 },
    cases: [{ id: "probe", mach: 0, altitude: 0, alpha: 0 }],
  });
  if (!parsed.ok) throw new DomainError(problemsMessage(parsed.problems), { field: "planform", kind: "unprocessable" });
  const model = wingModelOf(parsed.value);
  const geometry = wingGeometry(model.stations);
  const { part, category: cat } = category(basis);
  const named: [string, number][] = [["MTOW", basis.mtow], ["MZFW", basis.mzfw], ["minimum", basis.minWeight]];
  const weights = named.filter(([, kg], i) => named.findIndex(([, k]) => k === kg) === i);
  const sets: VnSet[] = [];
  for (const altitude of basis.altitudes) {
    const atm = isa(altitude);
    const machVc = machFromEas(basis.vc, altitude);
    if (machVc >= 1) throw new DomainError(`VC at ${altitude} m is Mach ${machVc.toFixed(3)}: the subsonic rules do not apply.`, { field: "vc" });
    const liftSlope = solveMach(model, machVc, { spanwise: method.spanwise, rule: method.compressibility, stations: 20 }).clAlphaPerRad;
    const altFt = altitude / FT;
    const gusts = part === "25" ? referenceGustPart25(altFt) : designGustsPart23(altFt, cat!);
    for (const [label, kg] of weights) {
      const points = vnDiagram({
        part,
        category: cat,
        weightN: kg * G0,
        mtowN: basis.mtow * G0,
        areaM2: basis.wingArea,
        clMaxPositive: basis.clMax,
        clMaxNegative: basis.clMaxNegative,
        vcEas: basis.vc,
        vdEas: basis.vd,
        gustAtVc: gusts.vc.value * FT,
        gustAtVd: gusts.vd.value * FT,
        density: atm.density,
        meanChord: geometry.meanGeometricChord,
        liftSlope,
      });
      sets.push({ label: `${label} ${kg.toFixed(0)} kg, ${altitude} m`, weightKg: kg, altitude, points, liftSlope, gustAtVc: gusts.vc.value * FT, gustAtVd: gusts.vd.value * FT, gustRule: `${gusts.vc.rule}; ${gusts.vd.rule}` });
    }
  }
  return sets;
}

/**
 * The V–n diagrams the envelope page draws from the saved steps, or why there are none yet (a step
 * missing, or a rule of the basis the diagram cannot meet, such as VC at or above Mach 1).
 */
export function vnView(inputs: Pick<CaseInputs, "basis" | "planform" | "sections" | "envelope">, method: Pick<EnvelopeData, "compressibility" | "spanwise">): { sets: VnSet[]; problem: string | null } {
  if (!inputs.basis || !inputs.planform || !inputs.sections) {
    return { sets: [], problem: "Save the basis, planform and sections first: the V–n diagram and generated cases need the weights, speeds, the wing and its lift slope." };
  }
  try {
    return { sets: vnSets(inputs.basis, inputs.planform, inputs.sections, inputs.envelope ?? method), problem: null };
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    return { sets: [], problem: error.message };
  }
}

/**
 * The cases a "generate" asks for: the V–n corner points of the saved basis, with the cases the
 * engineer added by hand (kind "manual") kept after them.
 */
export function regeneratedCases(inputs: Pick<CaseInputs, "basis" | "planform" | "sections" | "envelope">, method: Pick<EnvelopeData, "compressibility" | "spanwise">): LoadCase[] {
  if (!inputs.basis || !inputs.planform || !inputs.sections) throw new DomainError("Save the basis, planform and sections first.", { kind: "conflict" });
  const kept = (inputs.envelope?.cases ?? []).filter((k) => k.kind === "manual");
  return [...generatedCases(vnSets(inputs.basis, inputs.planform, inputs.sections, method)), ...kept];
}

/** The V–n diagrams of the basis (as vnSetsOf above), the engine's refusals answered as refusals naming the field. */
export function vnSets(...args: Parameters<typeof vnSetsOf>): VnSet[] {
  return runEngine(() => vnSetsOf(...args));
}

/** Load cases from the V–n corner points (not the 1-g stall point), each naming its rule. */
export function generatedCases(sets: VnSet[]): LoadCase[] {
  const out: LoadCase[] = [];
  sets.forEach((set, i) => {
    for (const p of set.points) {
      if (p.name === "S") continue;
      const mach = machFromEas(p.veas, set.altitude);
      if (mach >= 1) continue;
      out.push({
        id: `W${i + 1}-${p.name}`,
        kind: p.name.startsWith("gust") ? "gust" : "manoeuvre",
        rule: `${p.rule} — ${set.label}, ${p.veas.toFixed(1)} m/s EAS`,
        // Four decimals keep tables readable; nz is rounded away from zero so no case is lightened.
        mach: Math.round(mach * 1e4) / 1e4,
        altitude: set.altitude,
        weight: set.weightKg * G0,
        nz: Math.sign(p.nz) * Math.ceil(Math.abs(p.nz) * 1e4 - 1e-9) / 1e4,
        excluded: false,
      });
    }
  });
  return out;
}
