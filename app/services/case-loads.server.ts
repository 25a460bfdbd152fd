import { DomainError } from "~/domain/errors";
import { evaluateCase, solveMach } from "~/engine";
import { caseWingModel, type CaseFileInput } from "~/exchange";
import { buildCaseFile, parseOrThrow, type CaseInputs } from "./analysis.server";
import { balanceRows, effectiveMasses, type BalanceRow } from "./masses.server";

/**
 * One case's loads split into their parts at the output stations: the aerodynamic loads, the inertia
 * relief its masses (in its mass state, at its load factor) take off, and the net loads — with its mass
 * case, tail load and wing lift. Net = aerodynamic − relief, as the exchange result has it.
 */
export function caseLoadsBreakdown(input: CaseFileInput, caseId: string) {
  const file = parseOrThrow(input);
  const i = file.cases.findIndex((c) => c.id === caseId);
  if (i < 0) throw new DomainError(`The case file has no load case "${caseId}".`, { kind: "not-found" });
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
 * What the loads page shows beside the results: each analysed case's mass case and kind, and the
 * balance of every trimmed case (typed tail loads, those from the balance, or none).
 */
export function loadsPageInfo(title: string, inputs: CaseInputs) {
  type Info = { cases: Record<string, { massCase: string | null; kind: string } | undefined>; balance: BalanceRow[]; problem: string | null };
  if (!inputs.planform || !inputs.sections || !inputs.envelope) return { cases: {}, balance: [], problem: null } as Info;
  try {
    const file = parseOrThrow(buildCaseFile(title, inputs));
    const masses = effectiveMasses(inputs);
    const kinds = new Map(inputs.envelope.cases.map((c) => [c.id, c.kind]));
    return {
      cases: Object.fromEntries(file.cases.map((c) => [c.id, { massCase: c.massCase ?? null, kind: kinds.get(c.id) ?? "manual" }])) as Record<string, { massCase: string | null; kind: string } | undefined>,
      balance: balanceRows(file, inputs.envelope.cases, masses),
      problem: null,
    };
  } catch (error) {
    if (error instanceof DomainError) return { cases: {}, balance: [], problem: error.message } as Info;
    throw error;
  }
}

export type LoadsPageInfo = ReturnType<typeof loadsPageInfo>;
