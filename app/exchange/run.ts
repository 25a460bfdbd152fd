import { ENGINE_VERSION } from "../engine/index";
import { EngineError } from "../engine/errors";
import { flappedStations } from "../engine/flaps";
import { rollingSides } from "../engine/rolling";
import { rollingSideLabel } from "./rolling-labels";
import type { RollingSides } from "../engine/rolling";
import { wingPlausibility } from "../engine/plausibility";
import { addToEnvelope, createEnvelope, envelopeRows } from "../engine/envelope";
import { evaluateCase } from "../engine/load-case";
import type { CaseLoads, LoadCase } from "../engine/load-case";
import { LIFTING_LINE_DEFAULT_TERMS } from "../engine/lifting-line";
import type { MassCase, MassItem } from "../engine/mass";
import type { MachSolution, ResolutionCheck, SolveOptions, WingModel } from "../engine/superposition";
import { resolutionCheck, solveMach } from "../engine/superposition";
import { VORTEX_LATTICE_DEFAULT_STRIPS } from "../engine/vortex-lattice";
import type { MachGrid } from "../engine/mach-grid";
import { MACH_GRID_DEFAULTS, machGridSteps } from "../engine/mach-grid";
import { RESULT_SCHEMA_ID } from "./schema";
import type { CaseFile, CaseResult, ResultCase, ResultMethod } from "./schema";
import type { SectionsFile } from "./sections";
import { withSections } from "./sections";
import type { SectionScaling } from "../engine/spanwise";

/** The engine's wing model for a parsed case file. */
export function wingModelOf(file: CaseFile): WingModel {
  return {
    stations: file.wing.stations.map((s) => ({ ...s })),
    axis: { ...file.wing.axis },
    massKg: file.wing.mass?.kg,
    massItems: file.wing.mass?.items?.map(massItemOf),
  };
}

/** The engine's mass item for a contract item (point where `y` is given, spread otherwise). */
export function massItemOf(it: NonNullable<NonNullable<CaseFile["wing"]["mass"]>["items"]>[number]): MassItem {
  return it.y !== undefined ? { id: it.id, kg: it.kg, x: it.x, y: it.y } : { id: it.id, kg: it.kg, x: it.x, yFrom: it.yFrom!, yTo: it.yTo! };
}

/** Progress of a run: spanwise solves made so far, then cases evaluated out of all. */
export type RunProgress = { phase: "solves"; done: number } | { phase: "cases"; done: number; total: number };

/** Options for runCase beyond the contract. */
export interface RunOptions {
  /** Force station tables even when the file asks for `summary` (the CSV output needs them). */
  forceStations?: boolean;
  /** Called as the run goes on (after every solve, and every 1 000 cases), for progress displays. */
  onProgress?: (p: RunProgress) => void;
  /** Richer section data beside the case (`spanwright.sections/1`, checked with parseSections). */
  sections?: SectionsFile;
}

/** Up to this many distinct Mach numbers each gets its own solve; beyond it they share a Mach grid. */
export const DIRECT_MACH_LIMIT = 24;

/** Cases evaluated between two progress reports. */
const CASES_PER_REPORT = 1000;

/**
 * Run a parsed `spanwright.case/1` document: one spanwise solve per distinct Mach number (up to
 * DIRECT_MACH_LIMIT of them; beyond, a Mach grid with a checked interpolation error), every case by
 * superposition, and the envelope. Returns exactly the `spanwright.result/1` object.
 * @throws EngineError for a domain failure the schema cannot see (naming the field).
 */
export function runCase(file: CaseFile, options: RunOptions = {}): CaseResult {
  const cases: ResultCase[] = [];
  const steps = runSteps(file, options, (c) => cases.push(c));
  for (;;) {
    const step = steps.next();
    if (step.done) return resultWithCases(step.value, cases);
    options.onProgress?.(step.value);
  }
}

/**
 * runCase that hands every case to `onCase` as soon as it is evaluated, in the file's order, and keeps
 * none: for a writer that serialises a sweep of 100 000 cases without holding them all as objects.
 * Returns the rest of the result (every member but `cases`, in the result's order).
 */
export function runCaseEach(file: CaseFile, options: RunOptions, onCase: (c: ResultCase) => void): ResultRest {
  const steps = runSteps(file, options, onCase);
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
    options.onProgress?.(step.value);
  }
}

/**
 * runCase for a process that must stay responsive while a long sweep runs (the application's job
 * worker): between solves and every 1 000 cases it waits for `onProgress` and lets other work run.
 * The result is the same as runCase's.
 */
export async function runCaseAsync(file: CaseFile, options: Omit<RunOptions, "onProgress"> & { onProgress?: (p: RunProgress) => void | Promise<void> } = {}): Promise<CaseResult> {
  const cases: ResultCase[] = [];
  const steps = runSteps(file, options, (c) => cases.push(c));
  for (;;) {
    const step = steps.next();
    if (step.done) return resultWithCases(step.value, cases);
    await options.onProgress?.(step.value);
    await new Promise<void>((resolve) => setTimeout(resolve, 0));
  }
}

/** Every member of the result but `cases`. */
export type ResultRest = Omit<CaseResult, "cases">;

/** The result with its cases in the contract's member order (cases between wing and envelope). */
export function resultWithCases({ schema, engine, method, wing, envelope }: ResultRest, cases: ResultCase[]): CaseResult {
  return { schema, engine, method, wing, cases, envelope };
}

/**
 * The wing one case is solved on: the file's wing (with its richer section data), or for a case with
 * `flaps: true` the flapped wing (`wing.flaps` applied by the engine's flappedStations). The flapped
 * stations carry the clean sections' single cpMin but not their richer data (a Cp table or pressures
 * measured without the flap do not describe the flapped section).
 * @throws EngineError naming `wing.flaps.…` where the flapped sections fall outside the refusal ranges
 */
export function caseWingModel(file: CaseFile, flaps: boolean | undefined, sections?: SectionsFile): WingModel {
  const model = withSections(wingModelOf(file), sections);
  if (!flaps || !file.wing.flaps) return model;
  const stations = flappedStations(file.wing.stations, file.wing.flaps, "wing.flaps");
  const refusal = wingPlausibility(stations).refusals[0];
  if (refusal) {
    const k = /alphaL0$/.test(refusal.field) ? "dAlphaL0" : /cmAc$/.test(refusal.field) ? "dCmAc" : /clMax$/.test(refusal.field) ? "clMax" : "yTo";
    throw new EngineError("invalid-section", `with the flaps extended ${refusal.field.replace(/^wing\./, "")} ${refusal.message}`, `wing.flaps.${k}`);
  }
  return { ...model, stations };
}

/**
 * Both sides of a rolling case (`cases[].roll`) from its symmetric loads `r` on solution `sol`: the aileron's
 * increments over the file's stations, torsion about the solution's reference axis at each output station.
 * @throws EngineError naming `field` for a deflection without `wing.aileron`
 */
export function caseSides(file: CaseFile, roll: NonNullable<CaseFile["cases"][number]["roll"]>, sol: MachSolution, r: CaseLoads, field: string): RollingSides {
  const axis = sol.axis;
  const s = file.wing.stations[file.wing.stations.length - 1].y;
  const xRef = r.y.map((y) => axis.rootX + ((axis.tipX - axis.rootX) * y) / s);
  return rollingSides(r, { stations: file.wing.stations, xRef, axis }, { fraction: roll.fraction, aileronDeg: roll.aileron }, file.wing.aileron, field);
}

/** The solves of one wing (clean or flapped) for the Mach numbers of its cases. */
interface Configuration {
  machs: number[];
  grid?: MachGrid;
  solutionFor: (mach: number) => MachSolution;
  solves: () => number;
  check: (mach: number) => ResolutionCheck;
}

/** Prepares the solves of one wing: a Mach grid beyond DIRECT_MACH_LIMIT distinct Mach numbers (yielding its solves), else one solve per Mach number on demand. */
function* configuration(model: WingModel, opts: SolveOptions, machs: number[], before: number): Generator<RunProgress, Configuration> {
  let grid: MachGrid | undefined;
  if (machs.length > DIRECT_MACH_LIMIT) {
    const building = machGridSteps(model, opts, machs[0], machs[machs.length - 1]);
    for (let step = building.next(); ; step = building.next()) {
      if (step.done) {
        grid = step.value;
        break;
      }
      yield { phase: "solves", done: before + step.value };
    }
  }
  // Direct solves are kept per Mach number. Interpolated ones are cheap and, in a sweep of 100 000
  // distinct Mach numbers, would fill the heap: only the last one is kept (cases often repeat a Mach).
  const solutions = new Map<number, MachSolution>();
  let last: MachSolution | undefined;
  const solutionFor = (m: number): MachSolution => {
    if (grid) {
      if (last?.mach !== m) last = grid.solutionAt(m);
      return last;
    }
    let sol = solutions.get(m);
    if (!sol) {
      sol = solveMach(model, m, opts);
      solutions.set(m, sol);
    }
    return sol;
  };
  return { machs, grid, solutionFor, solves: () => (grid ? grid.solves() : solutions.size), check: (m) => resolutionCheck(model, m, opts, solutionFor(m)) };
}

/** The run one step at a time: hands each case to `emit`, yields after every spanwise solve and every 1 000 cases, returns the rest of the result. */
function* runSteps(file: CaseFile, options: Omit<RunOptions, "onProgress">, emit: (c: ResultCase) => void): Generator<RunProgress, ResultRest> {
  const opts: SolveOptions = { spanwise: file.method.spanwise, rule: file.method.compressibility, stations: file.method.stations, resolution: file.method.strips };
  const machsOf = (flapped: boolean) => [...new Set(file.cases.filter((c) => Boolean(c.flaps) === flapped).map((c) => c.mach))].sort((a, b) => a - b);
  // The clean wing and, where cases ask for it, the flapped wing: each solved at its own cases' Mach numbers.
  const configs = new Map<boolean, Configuration>();
  const solvesNow = () => [...configs.values()].reduce((n, c) => n + c.solves(), 0);
  let solves = 0;
  for (const flapped of [false, true]) {
    const machs = machsOf(flapped);
    if (machs.length === 0) continue;
    configs.set(flapped, yield* configuration(caseWingModel(file, flapped, options.sections), opts, machs, solves));
    solves = solvesNow();
  }
  const withStations = options.forceStations || file.method.output === "full";
  let env: ReturnType<typeof createEnvelope> | undefined;
  let geometry: MachSolution["geometry"] | undefined;
  const massCases = new Map<string, MassCase>((file.massCases ?? []).map((mc) => [mc.id, mc]));
  for (let i = 0; i < file.cases.length; i++) {
    const c = file.cases[i];
    const sol = configs.get(Boolean(c.flaps))!.solutionFor(c.mach);
    if (solvesNow() > solves) yield { phase: "solves", done: (solves = solvesNow()) };
    geometry ??= sol.geometry;
    const massCase = c.massCase !== undefined ? massCases.get(c.massCase) : undefined;
    const lc: LoadCase =
      c.alpha !== undefined
        ? { id: c.id, mach: c.mach, altitude: c.altitude, alphaDeg: c.alpha, massCase }
        : { id: c.id, mach: c.mach, altitude: c.altitude, weightN: c.weight!, nz: c.nz!, tailLoadN: c.tailLoad, massCase };
    const r = evaluateCase(sol, lc, `cases[${i}]`);
    env ??= createEnvelope(r.y);
    // A rolling case: the loaded side replaces the symmetric loads; the envelope takes both sides, each named.
    let other: { shear: number[]; bending: number[]; torsion: number[] } | undefined;
    if (c.roll) {
      const sides = caseSides(file, c.roll, sol, r, `cases[${i}].roll`);
      Object.assign(r, sides.loaded, { root: { shear: sides.loaded.shear[0], bending: sides.loaded.bending[0], torsion: sides.loaded.torsion[0] } });
      other = sides.other;
      addToEnvelope(env, rollingSideLabel(r.id, "loaded"), r);
      addToEnvelope(env, rollingSideLabel(r.id, "other"), other);
    } else addToEnvelope(env, r.id, r);
    // The contract's field order: the case's figures, stations, root, then a rolling case's other side.
    const out: ResultCase = {
      id: r.id,
      mach: r.mach,
      altitude: r.altitude,
      beta: r.beta,
      dynamicPressure: r.dynamicPressure,
      alpha: r.alphaDeg,
      cl: r.CL,
      clAlpha: r.clAlphaPerRad,
      machCritical: r.machCritical,
      regime: r.regime,
      warnings: r.warnings,
      ...(withStations
        ? {
            stations: r.y.map((y, k) => ({
              y,
              chord: r.chord[k],
              cl: r.cl[k],
              cm: r.cm[k],
              lift: r.lift[k],
              shear: r.shear[k],
              bending: r.bending[k],
              torsion: r.torsion[k],
            })),
          }
        : {}),
      root: r.root,
    };
    if (c.roll && other) {
      const o = other;
      out.roll = {
        fraction: c.roll.fraction,
        aileron: c.roll.aileron,
        other: {
          ...(withStations ? { stations: r.y.map((y, k) => ({ y, shear: o.shear[k], bending: o.bending[k], torsion: o.torsion[k] })) } : {}),
          root: { shear: o.shear[0], bending: o.bending[0], torsion: o.torsion[0] },
        },
      };
    }
    emit(out);
    if ((i + 1) % CASES_PER_REPORT === 0) yield { phase: "cases", done: i + 1, total: file.cases.length };
  }
  const g = geometry!;
  // What the result states about the method is the clean wing's (the flapped wing's where every case has flaps).
  const main = configs.get(false) ?? configs.get(true)!;
  const { machs, grid } = main;
  // Convergence: halve the resolution at the lowest and the highest Mach number solved.
  const checks: ResolutionCheck[] = [...new Set([machs[0], machs[machs.length - 1]])].map((m) => main.check(m));
  const lattice = file.method.spanwise === "vortex-lattice";
  const resolution = opts.resolution ?? (lattice ? VORTEX_LATTICE_DEFAULT_STRIPS : LIFTING_LINE_DEFAULT_TERMS);
  return {
    schema: RESULT_SCHEMA_ID,
    engine: ENGINE_VERSION,
    method: {
      compressibility: file.method.compressibility,
      spanwise: file.method.spanwise,
      strips: lattice ? resolution : null,
      terms: lattice ? null : resolution,
      stations: file.method.stations,
      output: file.method.output,
      convergence: {
        halfResolution: checks[0].halfResolution,
        clAlpha: Math.max(...checks.map((c) => c.clAlpha)),
        rootBending: Math.max(...checks.map((c) => c.rootBending)),
        loading: Math.max(...checks.map((c) => c.loading)),
      },
      sectionScaling: summarise(main.solutionFor(machs[machs.length - 1]).sectionScaling),
      criticalMach: criticalMachBasis(main.solutionFor(machs[0]).cpMinSource),
      machGrid: grid
        ? { machs: machs.length, nodes: grid.nodes.length, solves: grid.solves(), maxError: grid.maxError, tolerance: MACH_GRID_DEFAULTS.tolerance, directRanges: grid.directRanges }
        : null,
    },
    wing: {
      area: g.area,
      span: g.span,
      aspectRatio: g.aspectRatio,
      taperRatio: g.taperRatio,
      mac: g.mac,
      yMac: g.yMac,
      xLeMac: g.xLeMac,
    },
    envelope: env ? envelopeRows(env) : [],
  };
}

/** One word for how the stations' section data were made compressible. */
function summarise(kinds: readonly SectionScaling[]): ResultMethod["sectionScaling"] {
  const set = new Set(kinds);
  return set.size === 1 ? kinds[0] : "mixed";
}

/** One word for what the critical Mach numbers rest on. */
function criticalMachBasis(sources: MachSolution["cpMinSource"]): ResultMethod["criticalMach"] {
  const kinds = new Set(sources.map((s) => (s === null ? "unchecked" : s.kind === "table" ? "cp-min-against-lift" : s.cl === null ? "single-cp-min" : "single-cp-min-at-stated-lift")));
  return kinds.size === 1 ? ([...kinds][0] as ResultMethod["criticalMach"]) : "mixed";
}
