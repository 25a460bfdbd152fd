import type { DistributionData } from "~/domain/step-data";
import { evaluateCase, schrenkDistribution, solveMach, type CompressibilityRule } from "~/engine";
import { caseWingModel, type CaseFile, type CaseFileInput, type CaseResult, type SectionsFile } from "~/exchange";
import { DomainError } from "~/domain/errors";
import { fromSI, messageInUnits, unitSymbol, type UnitSystem } from "~/domain/units";
import type { StepKey } from "~/domain/vocabulary";
import { buildCaseFile, buildSectionsFile, caseInputs, parseOrThrow, resultsFor, type CaseInputs } from "./analysis.server";
import { getCaseSteps } from "./case-steps.server";
import { getCase } from "./programmes.server";
import { runEngine } from "./engine.server";

export interface CaseFlag {
  id: string;
  reasons: string[];
}

/**
 * Cases the engineer must disposition: above the critical Mach number, with stations over clMax, or whose
 * critical-Mach check rests on a single Cp,min taken far from the case's lift.
 */
export function flaggedCases(result: CaseResult, units: UnitSystem = "SI"): CaseFlag[] {
  return result.cases
    .map((c) => ({
      id: c.id,
      reasons: [
        ...(c.regime === "supercritical" ? [`Mach ${c.mach.toFixed(3)} is at or above the critical Mach number ${c.machCritical?.toFixed(3)}: the subsonic compressibility rules are outside their validity`] : []),
        ...summariseStall(c.warnings, units),
        ...c.warnings.filter((w) => CRITICAL_MACH_DOUBT.test(w)).map(() => "the critical Mach number is not reliable at this case's lift: it rests on one Cp,min per section taken at another lift"),
      ],
    }))
    .filter((f) => f.reasons.length > 0);
}

const CRITICAL_MACH_DOUBT = /^the critical Mach number rests on one cpMin per section/;
const STALL = /station y = ([\d.]+) m: cl ([\d.-]+) exceeds the section clMax ([\d.-]+)/;

/** One line for all of a case's stations over clmax: how many, where (in the length unit shown), and the worst ratio. */
export function summariseStall(warnings: string[], units: UnitSystem): string[] {
  const hits = warnings.map((w) => STALL.exec(w)).filter((m): m is RegExpExecArray => m !== null).map((m) => ({ y: Number(m[1]), cl: Number(m[2]), clMax: Number(m[3]) }));
  if (hits.length === 0) return [];
  const worst = hits.reduce((a, b) => (b.cl / b.clMax > a.cl / a.clMax ? b : a));
  const ys = hits.map((h) => h.y);
  const y = (m: number) => fromSI(units, "length", m).toFixed(2);
  return [
    `cl exceeds the section clmax at ${hits.length} station${hits.length > 1 ? "s" : ""} (y = ${y(Math.min(...ys))}–${y(Math.max(...ys))} ${unitSymbol(units, "length")}); worst cl/clmax = ${(worst.cl / worst.clMax).toFixed(3)} at y = ${y(worst.y)} ${unitSymbol(units, "length")}`,
  ];
}

/** Flagged cases still without a disposition (exclude, or justify with a comment). */
export function undispositioned(flags: CaseFlag[], distribution: DistributionData | null): string[] {
  return flags.filter((f) => !distribution?.dispositions[f.id]).map((f) => f.id);
}

const RULES: CompressibilityRule[] = ["prandtl-glauert", "karman-tsien", "laitone"];

/**
 * Everything the distribution page plots for one case: the solver's spanwise loading beside
 * Schrenk's approximation, section cl and cm, the same case under each of the three
 * compressibility rules, and each station's critical Mach number against the case Mach number.
 */
export function distributionView(input: CaseFileInput, caseId: string, sections?: SectionsFile) {
  const file: CaseFile = parseOrThrow(input);
  const lc = file.cases.find((c) => c.id === caseId) ?? file.cases[0]!;
  const model = caseWingModel(file, lc.flaps, sections);
  const loadCase = lc.alpha !== undefined ? { id: lc.id, mach: lc.mach, altitude: lc.altitude, alphaDeg: lc.alpha } : { id: lc.id, mach: lc.mach, altitude: lc.altitude, weightN: lc.weight!, nz: lc.nz! };
  const byRule = RULES.map((rule) => {
    const sol = solveMach(model, lc.mach, { spanwise: file.method.spanwise, rule, stations: file.method.stations, resolution: file.method.strips });
    const loads = evaluateCase(sol, loadCase);
    return { rule, sol, loads };
  });
  const chosen = byRule.find((r) => r.rule === file.method.compressibility)!;
  const { sol, loads } = chosen;
  const meanChord = sol.geometry.meanGeometricChord;
  const schrenk = schrenkDistribution(model.stations, sol.y);
  const CL = loads.CL;
  const ratio = (basic: number[], additional: number[]) => basic.map((b, i) => (CL !== 0 ? (b + CL * additional[i]!) / (meanChord * CL) : additional[i]! / meanChord));
  return {
    caseId: lc.id,
    mach: lc.mach,
    altitude: lc.altitude,
    rule: file.method.compressibility,
    spanwise: file.method.spanwise,
    CL,
    alphaDeg: loads.alphaDeg,
    regime: loads.regime,
    machCritical: loads.machCritical,
    warnings: loads.warnings,
    y: sol.y,
    chord: sol.chord,
    loading: { solver: ratio(sol.cclBasic, sol.cclAdditional), schrenk: ratio(schrenk.cclBasic, schrenk.cclAdditional) },
    cl: loads.cl,
    clMax: sol.clMax,
    cm: loads.cm,
    // At this case's lift where the sections give Cp,min against lift; simple sweep theory scales each by 1/cos Λ.
    stationMachCritical: loads.stationMachCritical,
    stationMachCriticalSwept: loads.stationMachCritical.map((m, i) => {
      const u = sol.stationMachCritical[i];
      const w = sol.stationMachCriticalSwept[i];
      return m === null || u === null || u === undefined || w === null || w === undefined ? m : (m * w) / u;
    }),
    machCriticalSwept: sol.machCriticalSwept !== null && sol.machCritical !== null && loads.machCritical !== null ? (loads.machCritical * sol.machCriticalSwept) / sol.machCritical : null,
    rules: byRule.map((r) => ({ rule: r.rule, cl: r.loads.cl, cm: r.loads.cm, CL: r.loads.CL, clAlpha: r.sol.clAlphaPerRad, machCritical: r.loads.machCritical })),
    cases: file.cases.map((c) => c.id),
  };
}

export type DistributionView = ReturnType<typeof distributionView>;

/** The view with one summary line for all stations over clmax, as the page shows it. */
export function distributionViewForPage(input: CaseFileInput, caseId: string, units: UnitSystem, sections?: SectionsFile) {
  const full = runEngine(() => distributionView(input, caseId, sections));
  const warnings = full.warnings.filter((w) => !w.includes("exceeds the section clMax")).map((w) => messageInUnits(w, units));
  return { ...full, warnings: [...warnings, ...summariseStall(full.warnings, units)] };
}

/**
 * What the distribution step shows: the flagged cases with their dispositions and the
 * distributions of one case (the one asked for, else the first flagged, else the first), or why
 * nothing can be shown yet (a step not saved, every case excluded, a case the engine refuses).
 */
export async function distributionStep(input: { caseId: string; title: string; inputs: CaseInputs; requested: string | null; actorId: string | null }) {
  const dispositions = input.inputs.distribution?.dispositions ?? {};
  try {
    const file = buildCaseFile(input.title, input.inputs, "envelope");
    const sections = buildSectionsFile(input.inputs);
    const { result } = await resultsFor(input.caseId, file, input.actorId, sections);
    const flags = flaggedCases(result, input.inputs.basis?.units);
    const shown = input.requested && file.cases.some((k) => k.id === input.requested) ? input.requested : (flags[0]?.id ?? file.cases[0]!.id);
    return { problem: null, view: distributionViewForPage(file, shown, input.inputs.basis?.units ?? "SI", sections), method: result.method, flags, open: undispositioned(flags, input.inputs.distribution), dispositions };
  } catch (error) {
    if (error instanceof DomainError) return { problem: error.message, view: null, method: null, flags: [], open: [], dispositions };
    throw error;
  }
}

/**
 * What keeps a step from being submitted now, in words (none for most steps): the distribution step
 * waits until every flagged case has a disposition.
 */
export async function submissionBlockers(organisationId: string, caseId: string, step: StepKey): Promise<string[]> {
  if (step !== "distribution") return [];
  const row = await getCase(organisationId, caseId);
  if (!row) throw new DomainError("Case not found.", { field: "caseId", kind: "not-found" });
  return dispositionBlockers(caseId, row.case.title, caseInputs(await getCaseSteps(caseId)));
}

/** Flagged cases without a disposition keep the distribution step from being submitted: the reasons, or none. */
export async function dispositionBlockers(caseId: string, title: string, inputs: CaseInputs): Promise<string[]> {
  try {
    const { result } = await resultsFor(caseId, buildCaseFile(title, inputs, "envelope"), null, buildSectionsFile(inputs));
    const open = undispositioned(flaggedCases(result), inputs.distribution);
    return open.length ? [`Disposition every flagged case first (exclude, or justify with a comment): ${open.join(", ")}.`] : [];
  } catch (error) {
    if (error instanceof DomainError) return [error.message];
    throw error;
  }
}
