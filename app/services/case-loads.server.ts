import { DomainError } from "~/domain/errors";
import { evaluateCase, solveMach } from "~/engine";
import { caseWingModel, type CaseFile, type CaseFileInput } from "~/exchange";
import type { LoadCase, MassesData } from "~/domain/step-data";
import { analysedCaseCount, currentInputWith, fromCurrentSteps, parseOrThrow, storedInputKey } from "./analysis.server";
import { axisConvention, referenceAxisOf } from "~/domain/planform-panels";
import { balanceRows } from "./masses.server";

/**
 * One case's loads split into their parts at the output stations: the aerodynamic loads, the inertia
 * relief its masses (in its mass state, at its load factor) take off, and the net loads — with its mass
 * case, tail load and wing lift. Net = aerodynamic − relief, as the exchange result has it.
 */
export function caseLoadsBreakdown(input: CaseFileInput, caseId: string) {
  // Looked for before the check: a file handed over with only the asked-for case has none when it is not there.
  if (!input.cases.some((c) => c.id === caseId)) throw new DomainError(`The case file has no load case "${caseId}".`, { kind: "not-found" });
  const file = parseOrThrow(input);
  const i = file.cases.findIndex((c) => c.id === caseId);
  const c = file.cases[i]!;
  const massCase = c.massCase ? file.massCases?.find((m) => m.id === c.massCase) : undefined;
  const sol = solveMach(caseWingModel(file, c.flaps), c.mach, { spanwise: file.method.spanwise, rule: file.method.compressibility, stations: file.method.stations, resolution: file.method.strips });
  const r = evaluateCase(
    sol,
    c.alpha !== undefined
      ? { id: c.id, mach: c.mach, altitude: c.altitude, alphaDeg: c.alpha, massCase }
      : { id: c.id, mach: c.mach, altitude: c.altitude, weightN: c.weight!, nz: c.nz!, tailLoadN: c.tailLoad, massCase },
    `cases[${i}]`,
  );
  const aero = (net: number[], relief: number[]) => net.map((v, k) => v + relief[k]!);
  return {
    caseId: c.id,
    massCase: r.massCase,
    nz: r.nz,
    tailLoad: r.tailLoad,
    wingLift: r.wingLift,
    inertiaApplied: r.inertiaApplied,
    y: r.y,
    net: { shear: r.shear, bending: r.bending, torsion: r.torsion },
    relief: r.relief,
    aero: { shear: aero(r.shear, r.relief.shear), bending: aero(r.bending, r.relief.bending), torsion: aero(r.torsion, r.relief.torsion) },
  };
}

export type CaseLoadsBreakdown = ReturnType<typeof caseLoadsBreakdown>;

/**
 * The breakdown of one load case of the case's current input (the loads step's: dispositioned
 * exclusions left out, balanced tail loads in): only that case is taken out of the stored result's
 * input (or of the input built from the steps, for a small case not solved yet), so a case of
 * 100 000 load cases has neither its envelope read nor its case file built and checked per request.
 */
export async function currentCaseLoadsBreakdown(caseId: string, title: string, loadCase: string): Promise<CaseLoadsBreakdown> {
  const { file } = await currentInputWith(caseId, title, "final", [loadCase]);
  return caseLoadsBreakdown(file, loadCase);
}

/**
 * What the loads page shows beside the results of the cases it lists: each one's mass case and kind,
 * and the balance of each trimmed one (typed tail loads, those from the balance, or none). Only the
 * cases named in `shown`, so that a case of 100 000 load cases sends what is on the page, not all.
 */
export function loadsPageInfo(file: CaseFile, envelopeCases: readonly LoadCase[], masses: MassesData | null, shown: ReadonlySet<string>) {
  const listed: CaseFile = { ...file, cases: file.cases.filter((c) => shown.has(c.id)) };
  const stored = envelopeCases.filter((c) => shown.has(c.id));
  const kinds = new Map(stored.map((c) => [c.id, c.kind]));
  return {
    cases: Object.fromEntries(listed.cases.map((c) => [c.id, { massCase: c.massCase ?? null, kind: kinds.get(c.id) ?? "manual" }])) as Record<string, { massCase: string | null; kind: string } | undefined>,
    balance: balanceRows(listed, stored, masses),
  };
}

export type LoadsPageInfo = ReturnType<typeof loadsPageInfo>;

/**
 * What the loads page's document shows of the case's stored steps: units, the engineer's notes, how
 * many cases are analysed, the axis convention. The small steps are derived once per content (no
 * validation per page); the count of analysed cases comes from the recorded input of the current
 * steps (else PostgreSQL counts them): the envelope's load cases are neither sent nor checked.
 */
export async function loadsPageView(caseId: string, title: string) {
  const [shown, known] = await Promise.all([
    fromCurrentSteps(
      "loads-page",
      caseId,
      title,
      (inputs) => ({
        units: inputs.basis?.units ?? "SI",
        notes: inputs.loads?.notes ?? "",
        wing: Boolean(inputs.planform && inputs.sections),
        axisConvention: inputs.planform ? axisConvention(referenceAxisOf(inputs.planform)) : null,
      }),
      { without: ["masses", "envelope", "distribution"] },
    ),
    storedInputKey(caseId, title, "final"),
  ]);
  const caseCount = known?.caseCount ?? (await analysedCaseCount(caseId));
  return { units: shown.units, notes: shown.notes, caseCount: caseCount ?? 0, ready: shown.wing && caseCount !== null, axisConvention: shown.axisConvention };
}
