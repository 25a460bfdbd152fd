import {
  rootCriticalCases,
  ROOT_LOADS,
  spreadOf,
  type RootLoads,
  type RuleSensitivity,
  type SpanwiseComparison,
  type SpanwiseWayResult,
} from "~/domain/comparisons";
import { DomainError } from "~/domain/errors";
import { RULE_LABELS } from "~/domain/vocabulary";
import type { UnitSystem } from "~/domain/units";
import {
  evaluateCase,
  isEngineError,
  LIFTING_LINE_MAX_SWEEP_DEG,
  schrenkCaseLoads,
  solveMach,
  wingGeometry,
  type CompressibilityRule,
  type LoadCase,
  type MachSolution,
  type SpanwiseMethod,
  type WingModel,
} from "~/engine";
import { attributionOf, caseSides, caseWingModel, type CaseFile, type CaseFileInput, type CaseResult, type SectionsFile } from "~/exchange";
import { currentInputWith, parseOrThrow } from "./analysis.server";
import { getCaseUnits } from "./case-steps.server";

/*
 * Comparisons beyond the case's own results, for the distribution page and the report: the root
 * loads of the critical cases under each of the three compressibility rules, and one case by each
 * spanwise method where it is valid. Both are computed from the exchange document alone.
 */

const RULES: CompressibilityRule[] = ["prandtl-glauert", "karman-tsien", "laitone"];

function loadCaseOf(file: CaseFile, id: string): LoadCase & { flaps: boolean } {
  const c = file.cases.find((k) => k.id === id);
  if (!c) throw new DomainError(`No load case "${id}" in this case.`, { field: "case", kind: "not-found" });
  const massCase = c.massCase !== undefined ? file.massCases?.find((m) => m.id === c.massCase) : undefined;
  const flaps = Boolean(c.flaps);
  return c.alpha !== undefined
    ? { id: c.id, mach: c.mach, altitude: c.altitude, alphaDeg: c.alpha, massCase, flaps }
    : { id: c.id, mach: c.mach, altitude: c.altitude, weightN: c.weight!, nz: c.nz!, tailLoadN: c.tailLoad, massCase, flaps };
}

/** Engine refusals become the product's one error, naming the field. */
function engine<T>(fn: () => T): T {
  try {
    return fn();
  } catch (error) {
    if (isEngineError(error)) throw new DomainError(error.message, { field: error.field, kind: "unprocessable" });
    throw error;
  }
}

/** How far a rule sensitivity has got: critical cases solved under each rule, of all (cases × rules). */
export interface SensitivityStep {
  done: number;
  total: number;
}

/**
 * The root shear, bending and torsion of the critical cases (those giving the envelope's six root
 * extremes) under each of the three compressibility rules, with the spread. Direct solves at each
 * case's Mach number with the case's own spanwise method, strips and masses; where the case's
 * results were solved directly too, its own rule's values are those results exactly.
 */
export function ruleSensitivity(input: CaseFileInput, result: CaseResult, sections?: SectionsFile): RuleSensitivity {
  const steps = ruleSensitivitySteps(input, result, sections);
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

/** ruleSensitivity one case under one rule at a time, saying how far it has got after each (the job worker records it). */
export function* ruleSensitivitySteps(input: CaseFileInput, result: CaseResult, sections?: SectionsFile): Generator<SensitivityStep, RuleSensitivity> {
  const file = parseOrThrow(input);
  const models = new Map<boolean, WingModel>();
  const modelOf = (flaps: boolean) => models.get(flaps) ?? models.set(flaps, engine(() => caseWingModel(file, flaps, sections))).get(flaps)!;
  const chosen = file.method.compressibility;
  const direct = !result.method?.machGrid;
  const solutions = new Map<string, MachSolution>();
  const solution = (rule: CompressibilityRule, mach: number, flaps: boolean) => {
    const key = `${rule}:${mach}:${flaps}`;
    let sol = solutions.get(key);
    if (!sol) {
      sol = engine(() => solveMach(modelOf(flaps), mach, { spanwise: file.method.spanwise, rule, stations: file.method.stations, resolution: file.method.strips }));
      solutions.set(key, sol);
    }
    return sol;
  };
  const critical = rootCriticalCases(result.envelope[0]);
  const total = critical.length * RULES.length;
  const cases: RuleSensitivity["cases"] = [];
  for (const c of critical) {
    // A rolling case's extreme belongs to one of its sides: that side is compared under each rule.
    const { id, side } = attributionOf(c.id);
    const lc = loadCaseOf(file, id);
    const roll = file.cases.find((k) => k.id === id)!.roll;
    const own = result.cases.find((k) => k.id === id)!;
    const rules: RuleSensitivity["cases"][number]["rules"] = [];
    for (const rule of RULES) {
      if (rule === chosen && direct) rules.push({ rule, root: { ...(side === "other" ? own.roll!.other.root : own.root) }, machCritical: own.machCritical, regime: own.regime });
      else {
        const sol = solution(rule, lc.mach, lc.flaps);
        const r = engine(() => evaluateCase(sol, lc));
        const loads = roll ? engine(() => caseSides(file, roll, sol, r, "roll"))[side ?? "loaded"] : r;
        rules.push({ rule, root: { shear: loads.shear[0]!, bending: loads.bending[0]!, torsion: loads.torsion[0]! }, machCritical: r.machCritical, regime: r.regime });
      }
      yield { done: cases.length * RULES.length + rules.length, total };
    }
    const stats = Object.fromEntries(ROOT_LOADS.map((q) => [q, spreadOf(rules.map((r) => r.root[q]))])) as Record<keyof RootLoads, { spread: number; relative: number }>;
    cases.push({
      ...c,
      mach: lc.mach,
      altitude: lc.altitude,
      rules,
      spread: { shear: stats.shear.spread, bending: stats.bending.spread, torsion: stats.torsion.spread },
      relative: { shear: stats.shear.relative, bending: stats.bending.relative, torsion: stats.torsion.relative },
    });
  }
  const method = file.method.spanwise === "vortex-lattice" ? `the vortex lattice${file.method.strips ? ` (${file.method.strips} strips)` : ""}` : "the lifting line";
  return {
    chosen,
    cases,
    basis: direct
      ? `Each case solved at its own Mach number by ${method} under each rule, with the case's masses; the ${RULE_LABELS[chosen]} row is the case's own result.`
      : `Each case solved directly at its own Mach number by ${method} under each rule, with the case's masses; the case's own results come from a Mach grid (within its stated error), so its ${RULE_LABELS[chosen]} row may differ from them in the last digits.`,
  };
}

/** The largest quarter-chord sweep of the planform's panels, deg. */
function maxSweep(model: WingModel): number {
  return Math.max(...wingGeometry(model.stations).panels.map((p) => Math.abs(p.sweepQuarterChordDeg)));
}

/**
 * One case by the vortex lattice, the lifting line and Schrenk's approximation, each where it is
 * valid: the lifting line is refused by the engine beyond its sweep limit (the reason is kept);
 * Schrenk's approximation, a planform rule for unswept wings, is shown up to the same sweep. The
 * solvers run at the case's Mach number under the case's rule (a case given by α carries each
 * solver's own lift); Schrenk carries the lift of the case's own method.
 */
export function spanwiseComparison(input: CaseFileInput, caseId: string, sections?: SectionsFile): SpanwiseComparison {
  const file = parseOrThrow(input);
  const lc = loadCaseOf(file, caseId);
  const model = engine(() => caseWingModel(file, lc.flaps, sections));
  const chosen = file.method.spanwise;
  const rule = file.method.compressibility;
  const solved = new Map<SpanwiseMethod, { sol: MachSolution; loads: ReturnType<typeof evaluateCase> }>();
  const solver = (way: SpanwiseMethod): SpanwiseWayResult => {
    try {
      const sol = solveMach(model, lc.mach, { spanwise: way, rule, stations: file.method.stations, resolution: way === "vortex-lattice" ? file.method.strips : undefined });
      const loads = evaluateCase(sol, lc);
      solved.set(way, { sol, loads });
      return { way, valid: true, CL: loads.CL, y: [...loads.y], lift: [...loads.lift], root: { ...loads.root } };
    } catch (error) {
      // The lifting line's sweep limit, in the engine's own words; any other refusal is the case's own fault.
      if (isEngineError(error) && way !== chosen) return { way, valid: false, reason: error.message };
      if (isEngineError(error)) throw new DomainError(error.message, { field: error.field, kind: "unprocessable" });
      throw error;
    }
  };
  const ways: SpanwiseWayResult[] = [solver("vortex-lattice"), solver("lifting-line")];
  const sweep = maxSweep(model);
  const base = solved.get(chosen)!;
  ways.push(
    sweep > LIFTING_LINE_MAX_SWEEP_DEG
      ? { way: "schrenk", valid: false, reason: `Schrenk's approximation is a planform rule for unswept wings; this planform's quarter-chord sweep reaches ${sweep.toFixed(1)}° (shown up to ${LIFTING_LINE_MAX_SWEEP_DEG}°, the lifting line's limit)` }
      : (() => {
          const r = schrenkCaseLoads(model, base.sol, base.loads);
          return { way: "schrenk" as const, valid: true as const, CL: base.loads.CL, y: r.y, lift: r.lift, root: r.root };
        })(),
  );
  return { caseId: lc.id, mach: lc.mach, altitude: lc.altitude, chosen, ways };
}

/**
 * One load case of the case by each spanwise method, for the distribution page.
 * @throws DomainError (not-found) for a load case the envelope step does not include
 */
export async function caseSpanwiseComparison(input: { caseId: string; title: string; loadCase: string }): Promise<{ units: UnitSystem; comparison: SpanwiseComparison }> {
  const [units, { file, sections }] = await Promise.all([getCaseUnits(input.caseId), currentInputWith(input.caseId, input.title, "envelope", [input.loadCase])]);
  // The one case taken out of the input (as stored with its result, else as built) and checked alone, not a large case file whole.
  const lc = file.cases.find((k) => k.id === input.loadCase);
  if (!lc) throw new DomainError(`No load case "${input.loadCase}" in this case.`, { field: "case", kind: "not-found" });
  // With the case's richer section data, as its own results are solved.
  return { units, comparison: spanwiseComparison({ ...file, cases: [lc] }, input.loadCase, sections) };
}
