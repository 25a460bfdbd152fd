import { LRUCache } from "lru-cache";
import { canonicalJson, sha256Hex } from "~/db/audit.server";
import type { BasisData, EnvelopeData, LoadCase, MassesData, PlanformData, SectionsData } from "~/domain/step-data";
import {
  designGustsPart23,
  flapsVnPoints,
  flightProfileAlleviation,
  isa,
  machFromEas,
  minimumVbPart23,
  minimumVbPart25,
  plungeGustResponse,
  referenceGustPart25,
  rollingVnPoints,
  solveMach,
  tunedDiscreteGust,
  vnDiagram,
  wingGeometry,
  type Part23Category,
  type RuleValue,
  type TunedGustResult,
  type VnPoint,
} from "~/engine";
import { CASE_SCHEMA_ID, caseWingModel, parseCase, wingModelOf } from "~/exchange";
import { exchangeStations, type CaseInputs } from "./analysis.server";
import { DomainError, problemsMessage } from "~/domain/errors";
import { formatQuantity, fromSI, unitSymbol, type Quantity, type UnitSystem } from "~/domain/units";
import { runEngine } from "./engine.server";

const G0 = 9.80665;
const FT = 0.3048;

/** The tuned discrete gust of 14 CFR 25.341(a) at one speed of a V–n set. */
export interface TunedGustAtSpeed {
  speed: "VB" | "VC" | "VD";
  veas: number;
  /** Reference gust velocity at this speed and altitude (halved at V_D), m/s EAS. */
  uRef: number;
  liftSlope: number;
  result: TunedGustResult;
  /** The response at the critical gradient: s in semichords, gust and Δn as fractions of their peaks. */
  history: { s: number; gust: number; k: number }[];
}

/** A whole number in the display unit with its symbol ("3200 kg", "6001 ft"), as the V–n sets are named. */
const whole = (units: UnitSystem, q: Quantity, si: number) => `${fromSI(units, q, si).toFixed(0)} ${unitSymbol(units, q)}`;

export interface VnSet {
  /** Weight name, weight and altitude in the display units (as the V–n page names the set). */
  label: string;
  /** The weight's name alone ("MTOW", a mass case): what a generated case's stored rule text names, free of units. */
  weightName: string;
  weightKg: number;
  altitude: number;
  /** The mass case the set stands for, with its centre of gravity (fraction of the MAC), where mass cases are given. */
  massCase?: string;
  cg?: number;
  points: VnPoint[];
  /** Airplane lift slope used in the gust formula (wing alone, at the V_C Mach number), per rad. */
  liftSlope: number;
  /** Lift slopes at the V_D and V_B Mach numbers, per rad. */
  liftSlopeAtVd: number;
  liftSlopeAtVb?: number;
  gustAtVb?: number;
  gustAtVc: number;
  gustAtVd: number;
  gustRule: string;
  /** Flight-profile alleviation factor used by the tuned gusts (Part 25; 1 where MLW or Z_mo are not given). */
  fg?: RuleValue;
  /** Part 25: the tuned discrete gust at V_B (where given), V_C and V_D. */
  tuned?: TunedGustAtSpeed[];
  /** The flaps-extended conditions at V_F, where the basis gives V_F (23.345 / 25.345). */
  flaps?: FlapsAtVf;
}

/** What the flaps-extended points of a V–n set rest on. */
export interface FlapsAtVf {
  vf: number;
  clMax: number;
  /** Flaps-extended 1-g stall speed at this weight, m/s EAS. */
  vsf: number;
  /** Lift slope of the flapped wing at the V_F Mach number, per rad. */
  liftSlope: number;
  massRatio: number;
  /** Part 25: the factor of the 12.5-chord gust on the rigid aircraft in plunge; Part 23: Pratt's K_g. */
  gustFactor: number;
  prattKg: number;
}

function category(basis: BasisData): { part: "23" | "25"; category?: Part23Category } {
  return basis.category === "part25" ? { part: "25" } : { part: "23", category: basis.category.replace("part23-", "") as Part23Category };
}

/** The design weights of the V–n sets: the mass cases where they are given, else MTOW, MZFW and the minimum weight. */
function designWeights(basis: BasisData, masses: MassesData | null | undefined): { label: string; kg: number; massCase?: string; cg?: number }[] {
  const cases = masses?.massCases ?? [];
  if (cases.length > 0) {
    const missing = cases.find((mc) => mc.weight === undefined);
    if (missing) throw new DomainError(`Mass case ${missing.id} has no weight: give it in the masses step.`, { field: "massCases", kind: "conflict" });
    return cases.map((mc) => ({ label: mc.id, kg: mc.weight!, massCase: mc.id, cg: mc.cg }));
  }
  const named: [string, number][] = [["MTOW", basis.mtow], ["MZFW", basis.mzfw], ["minimum", basis.minWeight]];
  return named.filter(([, kg], i) => named.findIndex(([, k]) => k === kg) === i).map(([label, kg]) => ({ label, kg }));
}

/**
 * The V–n diagram of each design weight (each mass case, where given) and altitude of the basis, by
 * the manoeuvre rules and the gust rules. The gust formula needs the aeroplane's lift slope: the
 * wing's, from the spanwise solver at the Mach number of each speed (the tail's contribution is left
 * to the engineer). Part 23 gusts by Pratt's formula (23.341(c)), with the V_B gust of commuters
 * (23.333(c)(1)(iii)). Part 25: the Pratt points stay on the diagram for comparison; the cases come from
 * the tuned discrete gust of 25.341(a) on the rigid aircraft in plunge, with the flight-profile
 * alleviation factor where MLW and Z_mo are given (F_g = 1 otherwise, conservative). Where the basis gives
 * V_F, the flaps-extended points of 23.345 / 25.345 at the same weights and altitudes, with the lift slope
 * of the flapped wing at the V_F Mach number.
 */
function vnSetsOf(
  basis: BasisData,
  planform: PlanformData,
  sections: SectionsData,
  method: Pick<EnvelopeData, "compressibility" | "spanwise">,
  masses?: MassesData | null,
): VnSet[] {
  const parsed = parseCase({
    schema: CASE_SCHEMA_ID,
    wing: { stations: exchangeStations(planform, sections) },
    method: { compressibility: method.compressibility, spanwise: method.spanwise, stations: 20 },
    cases: [{ id: "probe", mach: 0, altitude: 0, alpha: 0 }],
  });
  if (!parsed.ok) throw new DomainError(problemsMessage(parsed.problems), { field: "planform", kind: "unprocessable" });
  const model = wingModelOf(parsed.value);
  const geometry = wingGeometry(model.stations);
  // VF without a flapped span in the sections leaves the flaps conditions out, as the basis check says (flapsChecks).
  const flapped = flapsConditions(basis) && sections.flaps ? flappedWing(planform, sections.flaps, sections) : undefined;
  const flapSlopes = new Map<number, number>();
  const flapSlopeAt = (altitude: number) => {
    const mach = machFromEas(basis.vf!, altitude);
    if (mach >= 1) throw new DomainError(`VF at ${altitude} m is Mach ${mach.toFixed(3)}: the subsonic rules do not apply.`, { field: "vf" });
    let a = flapSlopes.get(mach);
    if (a === undefined) {
      a = solveMach(flapped!, mach, { spanwise: method.spanwise, rule: method.compressibility, stations: 20 }).clAlphaPerRad;
      flapSlopes.set(mach, a);
    }
    return a;
  };
  const { part, category: cat } = category(basis);
  const weights = designWeights(basis, masses);
  const slopes = new Map<number, number>();
  const slopeAt = (veas: number, altitude: number, name: string) => {
    const mach = machFromEas(veas, altitude);
    if (mach >= 1) throw new DomainError(`${name} at ${formatQuantity(basis.units, "altitude", altitude)} is Mach ${mach.toFixed(3)}: the subsonic rules do not apply.`, { field: name.toLowerCase() });
    let a = slopes.get(mach);
    if (a === undefined) {
      a = solveMach(model, mach, { spanwise: method.spanwise, rule: method.compressibility, stations: 20 }).clAlphaPerRad;
      slopes.set(mach, a);
    }
    return a;
  };
  const sets: VnSet[] = [];
  for (const altitude of basis.altitudes) {
    const atm = isa(altitude);
    const liftSlope = slopeAt(basis.vc, altitude, "VC");
    const liftSlopeAtVd = slopeAt(basis.vd, altitude, "VD");
    const altFt = altitude / FT;
    const gusts = part === "25" ? referenceGustPart25(altFt) : designGustsPart23(altFt, cat!);
    const vbGust = basis.vb !== undefined ? gusts.vb : undefined;
    const liftSlopeAtVb = vbGust ? slopeAt(basis.vb!, altitude, "VB") : undefined;
    const fg =
      part === "25"
        ? basis.mlw !== undefined && basis.zmo !== undefined
          ? flightProfileAlleviation({ mtow: basis.mtow, mlw: basis.mlw, mzfw: basis.mzfw, zmoFt: basis.zmo / FT, altitudeFt: altFt })
          : { value: 1, rule: "F_g = 1 (MLW and Z_mo not given in the basis: no flight-profile alleviation, conservative)" }
        : undefined;
    for (const w of weights) {
      const common = { weightN: w.kg * G0, areaM2: basis.wingArea, density: atm.density, meanChord: geometry.meanGeometricChord };
      const points = vnDiagram({
        part,
        category: cat,
        ...common,
        mtowN: basis.mtow * G0,
        clMaxPositive: basis.clMax,
        clMaxNegative: basis.clMaxNegative,
        vcEas: basis.vc,
        vdEas: basis.vd,
        gustAtVc: gusts.vc.value * FT,
        gustAtVd: gusts.vd.value * FT,
        liftSlope,
        liftSlopeAtVd,
        ...(vbGust ? { vbEas: basis.vb, gustAtVb: vbGust.value * FT, liftSlopeAtVb } : {}),
      });
      let tuned: TunedGustAtSpeed[] | undefined;
      if (part === "25") {
        const speeds: [TunedGustAtSpeed["speed"], number, number, number][] = [
          ...(vbGust ? [["VB", basis.vb!, vbGust.value * FT, liftSlopeAtVb!] as [TunedGustAtSpeed["speed"], number, number, number]] : []),
          ["VC", basis.vc, gusts.vc.value * FT, liftSlope],
          ["VD", basis.vd, gusts.vd.value * FT, liftSlopeAtVd],
        ];
        tuned = speeds.map(([speed, veas, uRef, a]) => {
          const result = tunedDiscreteGust({ veas, density: atm.density, wingLoading: common.weightN / common.areaM2, meanChord: common.meanChord, liftSlope: a, uRef, fg: fg!.value });
          const history = plungeGustResponse({ massRatio: result.massRatio, gradientSemichords: (2 * result.critical.gradient) / common.meanChord, history: true }).history;
          return { speed, veas, uRef, liftSlope: a, result, history };
        });
        for (const t of tuned) {
          const c = t.result.critical;
          // No unit-bearing numbers: this text is stored with the generated case, and the gradient and
          // U_ds of each tuned gust are shown in the chosen units on the V–n page and in the report.
          const rule = `14 CFR 25.341(a): tuned 1-cos gust at its critical gradient (F_g ${fg!.value.toFixed(3)}), rigid aircraft in plunge`;
          points.push({ name: `tuned+${t.speed}`, veas: t.veas, nz: 1 + c.deltaN, rule }, { name: `tuned-${t.speed}`, veas: t.veas, nz: 1 - c.deltaN, rule });
        }
      }
      // Rolling and unsymmetrical conditions from the manoeuvre points (23.349, 25.349), the aileron from the sections step.
      const a = points.find((p) => p.name === "A")!;
      points.push(...rollingVnPoints({ part, category: cat, a, f: points.find((p) => p.name === "F"), vcEas: basis.vc, vdEas: basis.vd, deltaAtVa: sections.aileron?.deltaAtVa }));
      let flaps: FlapsAtVf | undefined;
      if (flapped) {
        const a = flapSlopeAt(altitude);
        const f = flapsVnPoints({ part, ...common, clMaxFlaps: basis.clMaxFlaps!, vfEas: basis.vf!, liftSlope: a });
        points.push(...f.points);
        flaps = { vf: basis.vf!, clMax: basis.clMaxFlaps!, vsf: f.vsf, liftSlope: a, massRatio: f.massRatio, gustFactor: f.gustFactor, prattKg: f.prattKg };
      }
      sets.push({
        // In the units the basis chose, as the pages and the report show the set.
        label: `${w.label} ${whole(basis.units, "mass", w.kg)}, ${whole(basis.units, "altitude", altitude)}`,
        weightName: w.label,
        weightKg: w.kg,
        altitude,
        ...(w.massCase ? { massCase: w.massCase, cg: w.cg } : {}),
        points,
        liftSlope,
        liftSlopeAtVd,
        ...(vbGust ? { liftSlopeAtVb, gustAtVb: vbGust.value * FT } : {}),
        gustAtVc: gusts.vc.value * FT,
        gustAtVd: gusts.vd.value * FT,
        gustRule: [vbGust?.rule, gusts.vc.rule, gusts.vd.rule].filter(Boolean).join("; "),
        ...(fg ? { fg } : {}),
        ...(tuned ? { tuned } : {}),
        ...(flaps ? { flaps } : {}),
      });
    }
  }
  return sets;
}

/** Whether the basis asks for the flaps-extended conditions (V_F and the CLmax with flaps given). */
function flapsConditions(basis: BasisData): boolean {
  return basis.vf !== undefined && basis.clMaxFlaps !== undefined;
}

/**
 * The wing with its flaps extended, as the exchange run solves a case with flaps.
 * @throws DomainError when the flapped sections are refused, naming the field
 */
function flappedWing(planform: PlanformData, flaps: NonNullable<SectionsData["flaps"]>, sections: SectionsData) {
  const parsed = parseCase({
    schema: CASE_SCHEMA_ID,
    wing: { stations: exchangeStations(planform, sections), flaps },
    cases: [{ id: "probe", mach: 0, altitude: 0, alpha: 0, flaps: true }],
  });
  if (!parsed.ok) throw new DomainError(`Sections, flaps extended: ${problemsMessage(parsed.problems)}`, { field: "flaps", kind: "unprocessable" });
  return caseWingModel(parsed.value, true);
}

/**
 * The V–n diagrams the envelope page draws from the saved steps, or why there are none yet (a step
 * missing, or a rule of the basis the diagram cannot meet, such as VC at or above Mach 1).
 */
export function vnView(inputs: Pick<CaseInputs, "basis" | "planform" | "sections" | "masses" | "envelope">, method: Pick<EnvelopeData, "compressibility" | "spanwise">): { sets: VnSet[]; problem: string | null } {
  if (!inputs.basis || !inputs.planform || !inputs.sections) {
    return { sets: [], problem: "Save the basis, planform and sections first: the V–n diagram and generated cases need the weights, speeds, the wing and its lift slope." };
  }
  try {
    return { sets: vnSets(inputs.basis, inputs.planform, inputs.sections, inputs.envelope ?? method, inputs.masses), problem: null };
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    return { sets: [], problem: error.message };
  }
}

/**
 * The cases a "generate" asks for: the V–n corner points of the saved basis, with the cases the
 * engineer added by hand (kind "manual") kept after them.
 */
export function regeneratedCases(inputs: Pick<CaseInputs, "basis" | "planform" | "sections" | "masses" | "envelope">, method: Pick<EnvelopeData, "compressibility" | "spanwise">): LoadCase[] {
  if (!inputs.basis || !inputs.planform || !inputs.sections) throw new DomainError("Save the basis, planform and sections first.", { kind: "conflict" });
  const kept = (inputs.envelope?.cases ?? []).filter((k) => k.kind === "manual");
  return [...generatedCases(vnSets(inputs.basis, inputs.planform, inputs.sections, method, inputs.masses)), ...kept];
}

// The V–n diagrams are a function of exactly the inputs in the key, so an entry is never stale. Working
// them out solves the wing at each gust and flaps Mach number: 100–280 ms that the V–n page's loader paid on
// every request before. Callers get a copy, so none can change what another is handed.
const vnCache = new LRUCache<string, VnSet[]>({ max: 64 });

/** The V–n diagrams of the basis (as vnSetsOf above), the engine's refusals answered as refusals naming the field. */
export function vnSets(basis: BasisData, planform: PlanformData, sections: SectionsData, method: Pick<EnvelopeData, "compressibility" | "spanwise">, masses?: MassesData | null): VnSet[] {
  // Only the method's rule and spanwise solver are read: a whole envelope step may be passed as the method.
  const key = sha256Hex(canonicalJson({ basis, planform, sections, method: { compressibility: method.compressibility, spanwise: method.spanwise }, masses: masses ?? null }));
  let sets = vnCache.get(key);
  if (!sets) {
    sets = runEngine(() => vnSetsOf(basis, planform, sections, method, masses));
    vnCache.set(key, sets);
  }
  return structuredClone(sets);
}

/** Whether a V–n point gives a load case: not the 1-g stall point, nor for Part 25 the Pratt gust points (shown for comparison; the tuned gusts are the cases). */
function makesCase(name: string, set: VnSet): boolean {
  if (name === "S") return false;
  if (set.tuned && name.startsWith("gust")) return false;
  return true;
}

/** Load cases from the V–n corner points, each naming its rule and, where given, its mass case. */
export function generatedCases(sets: VnSet[]): LoadCase[] {
  const out: LoadCase[] = [];
  sets.forEach((set, i) => {
    for (const p of set.points) {
      if (!makesCase(p.name, set)) continue;
      const mach = machFromEas(p.veas, set.altitude);
      if (mach >= 1) continue;
      out.push({
        id: `W${i + 1}-${p.name}`,
        kind: p.roll ? "rolling" : /(^|-)gust|^tuned/.test(p.name) ? "gust" : "manoeuvre",
        // Stored text, so free of unit-bearing numbers (shown alike in SI and US customary): the weight,
        // altitude and speed are the case's own columns (EAS in the report's case table).
        rule: `${p.rule} — ${set.weightName}`,
        // Four decimals keep tables readable; nz is rounded away from zero so no case is lightened.
        mach: Math.round(mach * 1e4) / 1e4,
        altitude: set.altitude,
        weight: set.weightKg * G0,
        nz: Math.sign(p.nz) * Math.ceil(Math.abs(p.nz) * 1e4 - 1e-9) / 1e4,
        ...(set.massCase ? { massCase: set.massCase } : {}),
        // The flaps-extended points are solved on the flapped wing.
        ...(p.name.startsWith("flaps-") ? { flaps: true } : {}),
        ...(p.roll ? { roll: { ...p.roll } } : {}),
        excluded: false,
      });
    }
  });
  return out;
}

/** Whether the flaps-extended conditions of the basis reach the envelope: VF and CLmax with flaps given, and the flapped span in the sections. */
export function flapsChecks(basis: BasisData, sections: SectionsData | null): RuleCheck[] {
  const rule = basis.category === "part25" ? "14 CFR 25.345 [text from memory]" : "14 CFR 23.345 [text from memory]";
  if (!flapsConditions(basis)) return [{ label: "Flaps extended", value: "VF not given: the flaps-extended conditions are left out of the envelope", rule }];
  if (!sections?.flaps) return [{ label: "Flaps extended", value: "VF is given, but the sections step gives no flapped span: the flaps-extended conditions are left out of the envelope", rule, ok: false }];
  return [{ label: "Flaps extended", value: `from y = ${sections.flaps.yFrom} to ${sections.flaps.yTo} m: n = 2.0 up to VF and gusts of 25 ft/s EAS at VF`, rule }];
}

/** Which rolling conditions reach the envelope: the unsymmetrical ones of Part 23 always, the aileron ones where the sections step gives the aileron. */
export function rollingChecks(basis: BasisData, sections: SectionsData | null): RuleCheck[] {
  const part25 = basis.category === "part25";
  const rule = part25 ? "14 CFR 25.349(a) [text from memory]" : "14 CFR 23.349, 23.455 [text from memory]";
  const unsym = part25 ? "" : `unsymmetrical condition A${basis.category === "part23-acrobatic" ? " and F (60 %" : " (75 %"} of the airload on the other side); `;
  const a = sections?.aileron;
  if (!a) return [{ label: "Rolling conditions", value: `${unsym}no aileron in the sections step: the aileron conditions at VA, VC and VD are left out of the envelope`, rule, ok: false }];
  return [{ label: "Rolling conditions", value: `${unsym}aileron from y = ${formatQuantity(basis.units, "length", a.yFrom)} to ${formatQuantity(basis.units, "length", a.yTo)}, ${a.deltaAtVa}° at VA, at 2/3·n1 at VA, VC and VD`, rule }];
}

/** One line of the basis page's check of the typed values against the rules. */
export interface RuleCheck {
  label: string;
  value: string;
  rule: string;
  ok?: boolean;
}

/**
 * The design speed for maximum gust intensity against its rule, at MTOW and sea level: 25.335(d) for
 * transport aeroplanes, 23.335(d) for commuters [M]. Both need the aeroplane's lift slope, taken from the
 * wing at the V_C Mach number, so the check waits for the planform and sections.
 */
export function vbChecks(basis: BasisData, planform: PlanformData | null, sections: SectionsData | null, method: Pick<EnvelopeData, "compressibility" | "spanwise">): RuleCheck[] {
  const { part, category: cat } = category(basis);
  if (part === "23" && cat !== "commuter") return [];
  const rule = part === "25" ? "14 CFR 25.335(d)" : "14 CFR 23.335(d) [text from memory]";
  if (basis.vb === undefined) return [{ label: "VB", value: "not given: the VB gust points are left out of the envelope", rule, ok: false }];
  if (!planform || !sections) return [{ label: "Minimum VB", value: "needs the planform and sections (the lift slope of the gust formula)", rule }];
  const stations = exchangeStations(planform, sections);
  const parsed = parseCase({ schema: CASE_SCHEMA_ID, wing: { stations }, method: { ...method, stations: 20 }, cases: [{ id: "probe", mach: 0, altitude: 0, alpha: 0 }] });
  if (!parsed.ok) return [{ label: "Minimum VB", value: parsed.problems[0]!.message, rule, ok: false }];
  const model = wingModelOf(parsed.value);
  const mach = machFromEas(basis.vc, 0);
  const a = solveMach(model, mach, { spanwise: method.spanwise, rule: method.compressibility, stations: 20 }).clAlphaPerRad;
  const common = { vs1: basis.vs1, vcEas: basis.vc, density: isa(0).density, meanChord: wingGeometry(model.stations).meanGeometricChord, liftSlope: a };
  const weightN = basis.mtow * G0;
  const min =
    part === "25"
      ? minimumVbPart25({ ...common, uRef: referenceGustPart25(0).vc.value * FT, wingLoading: weightN / basis.wingArea })
      : minimumVbPart23({ ...common, weightN, areaM2: basis.wingArea, clMax: basis.clMax, gustAtVc: designGustsPart23(0, "commuter").vc.value * FT, gustAtVb: designGustsPart23(0, "commuter").vb!.value * FT });
  return [{ label: "Minimum VB at MTOW, sea level", value: `${min.value.toFixed(1)} m/s (typed ${basis.vb.toFixed(1)}; lift slope ${a.toFixed(3)} /rad at VC)`, rule, ok: basis.vb >= min.value - 1e-9 }];
}
