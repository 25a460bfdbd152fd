import { LRUCache } from "lru-cache";
import { canonicalJson, sha256Hex } from "~/db/audit.server";
import { DomainError } from "~/domain/errors";
import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import type { BasisData, LoadCase, MassesData, PlanformData } from "~/domain/step-data";
import {
  balanceTailLoad,
  inertiaRelief,
  isEngineError,
  itemsCentreX,
  itemsMassKg,
  dynamicPressure,
  solveMach,
  wingAerodynamicCentre,
  wingGeometry,
  wingPitchingMoment,
  type MassCase,
  type MassItem,
} from "~/engine";
import { buildMachGrid } from "~/engine/mach-grid";
import { DIRECT_MACH_LIMIT, caseWingModel, type CaseFile, type CaseFileInput } from "~/exchange";

/**
 * The masses a case analyses with: the masses step where it is saved; otherwise the semispan mass
 * the loads step held before the masses step existed (cases saved then); otherwise none.
 */
export function effectiveMasses(inputs: { masses: MassesData | null; loads: { semispanMass?: number } | null }): MassesData | null {
  if (inputs.masses) return inputs.masses;
  const legacy = inputs.loads?.semispanMass ?? 0;
  return legacy > 0 ? { structureKg: legacy, items: [], massCases: [], source: { kind: "typed" } } : null;
}

/** The engine's item for a stored one (point where y is given, spread otherwise). */
export function engineItem(it: MassesData["items"][number]): MassItem {
  return it.y !== undefined ? { id: it.id, kg: it.kg, x: it.x, y: it.y } : { id: it.id, kg: it.kg, x: it.x, yFrom: it.yFrom!, yTo: it.yTo! };
}

/** The exchange format's `wing.mass` and `massCases` for the masses of a case (nothing where there is no mass). */
export function exchangeMasses(m: MassesData | null): { mass?: NonNullable<CaseFileInput["wing"]["mass"]>; massCases?: NonNullable<CaseFileInput["massCases"]> } {
  if (!m || (m.structureKg <= 0 && m.items.length === 0)) return {};
  return {
    mass: {
      ...(m.structureKg > 0 ? { kg: m.structureKg } : {}),
      distribution: "chord",
      ...(m.items.length ? { items: m.items.map(engineItem) } : {}),
    },
    ...(m.massCases.length ? { massCases: m.massCases.map((mc) => ({ id: mc.id, fill: { ...mc.fill } })) } : {}),
  };
}

/** Where a case's tail load comes from. */
export type TailLoadSource = "typed" | "balance" | "none";

/** The balance of one trimmed case, for the pages and the report. */
export interface BalanceRow {
  caseId: string;
  kind: LoadCase["kind"];
  massCase: string | null;
  /** Whole-aircraft weight, N. */
  weight: number;
  nz: number;
  /** Load factor the balance was taken at: the case's, or 1 for a gust (its increment goes on the wing). */
  balanceNz: number;
  cg: number | null;
  /** Tail load, N, up positive; wing lift nz·W − P, N. */
  tailLoad: number;
  wingLift: number;
  source: TailLoadSource;
  /** Wing aerodynamic centre and its Cm (from the wing solution at the case's Mach number), where balanced. */
  xAc?: number;
  cmAc?: number;
}

interface WingMoments {
  xAc: number;
  cmAc: number;
  area: number;
  mac: number;
  xLeMac: number;
}

// The wing's aerodynamic centre and Cm there per wing, method and Mach number: a function of exactly
// those, so an entry is never stale; the bound keeps memory flat.
const moments = new LRUCache<string, WingMoments>({ max: 4096 });

/**
 * The wing's aerodynamic centre and Cm there at each Mach number, of the clean or the flapped wing: one solve
 * each, or, for more Mach numbers than the exchange run solves directly, the same checked Mach grid the run uses.
 */
function wingMomentsAt(file: CaseFile, machs: readonly number[], flaps: boolean): Map<number, WingMoments> {
  const key = (mach: number) => sha256Hex(canonicalJson({ stations: file.wing.stations, axis: file.wing.axis, flaps: flaps ? (file.wing.flaps ?? null) : null, method: file.method, mach }));
  const out = new Map<number, WingMoments>();
  const missing = [...new Set(machs)].filter((m) => {
    const hit = moments.get(key(m));
    if (hit) out.set(m, hit);
    return !hit;
  });
  if (missing.length === 0) return out;
  const model = { ...caseWingModel(file, flaps), massKg: undefined, massItems: undefined };
  const opts = { spanwise: file.method.spanwise, rule: file.method.compressibility, stations: file.method.stations, resolution: file.method.strips };
  const sorted = [...missing].sort((a, b) => a - b);
  const grid = sorted.length > DIRECT_MACH_LIMIT ? buildMachGrid(model, opts, sorted[0]!, sorted[sorted.length - 1]!) : null;
  for (const mach of sorted) {
    const sol = grid ? grid.solutionAt(mach) : solveMach(model, mach, opts);
    const xAc = wingAerodynamicCentre(sol);
    const m = { xAc, cmAc: wingPitchingMoment(sol, 0, xAc), area: sol.geometry.area, mac: sol.geometry.mac, xLeMac: sol.geometry.xLeMac };
    moments.set(key(mach), m);
    out.set(mach, m);
  }
  return out;
}

/**
 * The balance of every trimmed case: a typed tail load is kept; otherwise, where the masses step gives
 * the balance inputs and the case's mass case its centre of gravity, the tail load comes from
 * pitching-moment equilibrium about the CG (a gust case at 1 g: its increment is put on the wing, which
 * is conservative for the wing); otherwise it is 0 and the wing carries nz·W.
 */
export function balanceRows(file: CaseFile, envelopeCases: readonly LoadCase[], masses: MassesData | null): BalanceRow[] {
  const byId = new Map(envelopeCases.map((c) => [c.id, c]));
  const massCases = new Map((masses?.massCases ?? []).map((mc) => [mc.id, mc]));
  const rows: BalanceRow[] = [];
  const balanced = (c: CaseFile["cases"][number]) => c.weight !== undefined && c.nz !== undefined && byId.get(c.id)?.tailLoad === undefined && c.mach > 0 && c.massCase !== undefined && massCases.get(c.massCase)?.cg !== undefined;
  // The flapped wing balances its cases with flaps: the flap's nose-down moment changes the tail load.
  const wingOf = (flaps: boolean) => (masses?.balance ? wingMomentsAt(file, file.cases.filter((c) => balanced(c) && Boolean(c.flaps) === flaps).map((c) => c.mach), flaps) : new Map<number, WingMoments>());
  const wing = { clean: wingOf(false), flaps: wingOf(true) };
  for (const c of file.cases) {
    if (c.weight === undefined || c.nz === undefined) continue;
    const stored = byId.get(c.id);
    const kind = stored?.kind ?? "manual";
    const mc = c.massCase ? massCases.get(c.massCase) : undefined;
    const balanceNz = kind === "gust" ? 1 : c.nz;
    const base = { caseId: c.id, kind, massCase: c.massCase ?? null, weight: c.weight, nz: c.nz, balanceNz, cg: mc?.cg ?? null };
    if (stored?.tailLoad !== undefined || (c.tailLoad !== undefined && !masses?.balance)) {
      const P = stored?.tailLoad ?? c.tailLoad!;
      rows.push({ ...base, tailLoad: P, wingLift: c.nz * c.weight - P, source: "typed" });
      continue;
    }
    if (!masses?.balance || mc?.cg === undefined || !(c.mach > 0)) {
      rows.push({ ...base, tailLoad: 0, wingLift: c.nz * c.weight, source: "none" });
      continue;
    }
    const w = (c.flaps ? wing.flaps : wing.clean).get(c.mach)!;
    const b = balanceTailLoad({
      weightN: c.weight,
      nz: balanceNz,
      dynamicPressure: dynamicPressure(c.mach, c.altitude),
      area: w.area,
      mac: w.mac,
      xAc: w.xAc,
      cmAc: w.cmAc,
      cmBody: masses.balance.cmBody,
      xCg: w.xLeMac + mc.cg * w.mac,
      xTail: w.xLeMac + 0.25 * w.mac + masses.balance.tailArm,
    });
    rows.push({ ...base, tailLoad: b.tailLoad, wingLift: c.nz * c.weight - b.tailLoad, source: "balance", xAc: w.xAc, cmAc: w.cmAc });
  }
  return rows;
}

/** The case document with each trimmed case's tail load from its balance (typed ones kept). */
export function withTailLoads(file: CaseFileInput, parsed: CaseFile, envelopeCases: readonly LoadCase[], masses: MassesData | null): CaseFileInput {
  const rows = new Map(balanceRows(parsed, envelopeCases, masses).map((r) => [r.caseId, r]));
  return {
    ...file,
    cases: file.cases.map((c) => {
      const r = rows.get(c.id);
      if (!r || r.source === "none") return c;
      return { ...c, tailLoad: r.tailLoad };
    }),
  };
}

/** One mass case as the masses page and the report show it. */
export interface MassCaseSummary {
  id: string;
  label: string;
  /** Whole-aircraft weight, kg, and CG (fraction of MAC), as given. */
  weight: number | null;
  cg: number | null;
  /** Items of one semispan at this fill, kg; both wings with structure, kg. */
  itemsKg: number;
  wingKg: number;
  /** Streamwise CG of the semispan's items, m, or null without item mass. */
  itemsX: number | null;
  checks: { ok: boolean; text: string }[];
}

/**
 * Each mass case with what it puts on the wing, and checks against the basis: the weight within the
 * minimum design weight and MTOW, the wing's own masses below the weight, the CG given.
 */
export function massCaseSummaries(m: MassesData, basis: BasisData | null, units: UnitSystem = "SI"): MassCaseSummary[] {
  const kg = (v: number) => `${fromSI(units, "mass", v).toFixed(0)} ${unitSymbol(units, "mass")}`;
  const items = m.items.map(engineItem);
  return m.massCases.map((mc) => {
    const c: MassCase = { id: mc.id, fill: mc.fill };
    const itemsKg = itemsMassKg(items, c);
    const wingKg = 2 * (m.structureKg + itemsKg);
    const checks: MassCaseSummary["checks"] = [];
    if (mc.weight === undefined) checks.push({ ok: false, text: "No weight given: the envelope cannot be generated from this mass case." });
    else {
      if (basis) {
        checks.push({
          ok: mc.weight <= basis.mtow + 1e-9 && mc.weight >= basis.minWeight - 1e-9,
          text: `Weight within the basis: minimum design weight ${kg(basis.minWeight)} to MTOW ${kg(basis.mtow)}`,
        });
      }
      checks.push({ ok: wingKg < mc.weight, text: `Both wings with their items (${kg(wingKg)}) weigh less than the aircraft` });
    }
    if (mc.cg === undefined) checks.push({ ok: false, text: "No centre of gravity given: trimmed cases of this mass case take no balancing tail load." });
    return { id: mc.id, label: mc.label, weight: mc.weight ?? null, cg: mc.cg ?? null, itemsKg, wingKg, itemsX: itemsCentreX(items, c), checks };
  });
}

/** Items lying outside the wing, as refusals naming the row of the masses step. */
export function itemsOutsideWing(m: MassesData, planform: PlanformData): Record<string, string[]> {
  const s = planform.stations[planform.stations.length - 1]!.y;
  const out: Record<string, string[]> = {};
  m.items.forEach((it, i) => {
    for (const k of ["y", "yFrom", "yTo"] as const) {
      const v = it[k];
      if (v !== undefined && v > s + 1e-9) out[`items.${i}.${k}`] = [`Item ${it.id}: ${k === "y" ? "y" : k === "yFrom" ? "y from" : "y to"} ${v} m lies outside the wing (semispan ${s} m)`];
    }
  });
  return out;
}

/** The planform's semispan and MAC, for the masses page (where the CG in % MAC sits). */
export function macOf(planform: PlanformData): { semispan: number; mac: number; xLeMac: number; yMac: number } {
  const g = wingGeometry(planform.stations.map((s) => ({ ...s, a0: 2 * Math.PI, alphaL0: 0, cmAc: 0 })));
  return { semispan: g.semispan, mac: g.mac, xLeMac: g.xLeMac, yMac: g.yMac };
}

/** Refuses a case that names a mass case the masses step does not have. */
export function checkMassCaseNames(cases: readonly LoadCase[], masses: MassesData | null): void {
  const ids = new Set((masses?.massCases ?? []).map((mc) => mc.id));
  const bad = cases.find((c) => c.massCase && !ids.has(c.massCase));
  if (bad) throw new DomainError(`Case ${bad.id} names mass case ${bad.massCase}, which the masses step does not have: regenerate the cases or correct the mass case.`, { field: "cases", kind: "conflict" });
}


/** Inertia relief per unit load factor at the root of one semispan (N, N·m), for one mass state. */
export interface RootReliefPerG {
  massCase: string | null;
  shear: number;
  bending: number;
  torsion: number;
}

/**
 * What the masses page shows beside the form: the planform with its MAC (to place items and the CG),
 * each mass case checked against the basis, and the inertia relief per g at the root of each mass state
 * (torsion and bending resolved about the reference axis, as the loads are).
 */
export function massesOverview(input: { planform: PlanformData | null; basis: BasisData | null; masses: MassesData | null }) {
  const { planform, basis, masses } = input;
  const summaries = masses ? massCaseSummaries(masses, basis, basis?.units) : [];
  if (!planform) return { mac: null, summaries, relief: [] as RootReliefPerG[], problem: "Save the planform first: items are placed on the wing and the centre of gravity on its MAC." };
  const mac = macOf(planform);
  if (!masses) return { mac, summaries, relief: [], problem: null };
  // The relief needs only the planform and the reference axis: neutral section data stand in.
  const model = {
    stations: planform.stations.map((s) => ({ ...s, a0: 2 * Math.PI, alphaL0: 0, cmAc: 0 })),
    axis: { rootChordFraction: planform.axisRoot, tipChordFraction: planform.axisTip },
    massKg: masses.structureKg > 0 ? masses.structureKg : undefined,
    massItems: masses.items.map(engineItem),
  };
  let sol;
  try {
    sol = solveMach(model, 0.3, { spanwise: "vortex-lattice", rule: "prandtl-glauert", stations: 8, resolution: 16 });
  } catch (error) {
    if (isEngineError(error)) return { mac, summaries, relief: [], problem: error.message };
    throw error;
  }
  const states: (MassCase | undefined)[] = masses.massCases.length ? masses.massCases.map((mc) => ({ id: mc.id, fill: mc.fill })) : [undefined];
  const relief = states.map((mc) => {
    const r = inertiaRelief(sol.massPerNz, sol.itemsPerNz, 1, mc);
    return { massCase: mc?.id ?? null, shear: r.shear[0]!, bending: r.bending[0]!, torsion: r.torsion[0]! };
  });
  return { mac, summaries, relief, problem: null };
}
