import { ISA } from "./atmosphere";
import { EngineError } from "./errors";

// Masses carried by one semispan and the inertia relief they give. Every mass acts downward with
// nz·g·kg; the loads here are per unit load factor with the weight counted upward positive, so a
// case subtracts nz times them from the aerodynamic loads (net = aerodynamic − relief).

/** A concentrated mass (engine, gear, store) with its centre of gravity at (x, y), m. */
export interface PointMassItem {
  id: string;
  kg: number;
  x: number;
  y: number;
}

/** A mass spread evenly over a span range (fuel in a tank bay), its centre of gravity at x, m. */
export interface SpreadMassItem {
  id: string;
  kg: number;
  x: number;
  yFrom: number;
  yTo: number;
}

export type MassItem = PointMassItem | SpreadMassItem;

/** A named mass state: fill factor (0–1) per item id; items not named count fully. */
export interface MassCase {
  id: string;
  fill: Readonly<Record<string, number>>;
}

/** Loads at stations per unit multiplier: shear N, bending N·m, torsion N·m. */
export interface StationLoads {
  shear: number[];
  bending: number[];
  torsion: number[];
}

/** One item's loads per unit load factor at the output stations. */
export interface ItemUnitLoads {
  id: string;
  kg: number;
  loads: StationLoads;
}

export function isSpreadItem(item: MassItem): item is SpreadMassItem {
  return "yFrom" in item;
}

/**
 * Check mass items against the semispan (m): unique ids, kg ≥ 0, positions finite, a point's y and a
 * spread item's yFrom < yTo inside [0, semispan].
 * @throws EngineError naming the field, e.g. "wing.mass.items[2].yTo".
 */
export function validateMassItems(items: readonly MassItem[], semispan: number, field = "wing.mass.items"): void {
  const seen = new Set<string>();
  items.forEach((it, i) => {
    const f = `${field}[${i}]`;
    if (!it.id) throw new EngineError("invalid-argument", "must not be empty", `${f}.id`);
    if (seen.has(it.id)) throw new EngineError("invalid-argument", `must be unique ("${it.id}" repeats)`, `${f}.id`);
    seen.add(it.id);
    if (!(Number.isFinite(it.kg) && it.kg >= 0)) throw new EngineError("invalid-argument", "must be 0 or more (kg)", `${f}.kg`);
    if (!Number.isFinite(it.x)) throw new EngineError("invalid-argument", "must be a finite number (m)", `${f}.x`);
    const inside = `must lie inside the semispan, 0 to ${semispan} m`;
    if (isSpreadItem(it)) {
      if (!(it.yFrom >= 0 && it.yFrom <= semispan)) throw new EngineError("invalid-argument", inside, `${f}.yFrom`);
      if (!(it.yTo >= 0 && it.yTo <= semispan)) throw new EngineError("invalid-argument", inside, `${f}.yTo`);
      if (!(it.yFrom < it.yTo)) throw new EngineError("invalid-argument", "must be greater than yFrom", `${f}.yTo`);
    } else if (!(it.y >= 0 && it.y <= semispan)) {
      throw new EngineError("invalid-argument", inside, `${f}.y`);
    }
  });
}

/**
 * Check mass cases against the items: unique ids, fill factors between 0 and 1 naming existing items.
 * @throws EngineError naming the field, e.g. "massCases[1].fill.outer-tank".
 */
export function validateMassCases(cases: readonly MassCase[], items: readonly MassItem[], field = "massCases"): void {
  const ids = new Set(items.map((i) => i.id));
  const seen = new Set<string>();
  cases.forEach((mc, i) => {
    const f = `${field}[${i}]`;
    if (!mc.id) throw new EngineError("invalid-argument", "must not be empty", `${f}.id`);
    if (seen.has(mc.id)) throw new EngineError("invalid-argument", `must be unique ("${mc.id}" repeats)`, `${f}.id`);
    seen.add(mc.id);
    for (const [id, v] of Object.entries(mc.fill)) {
      if (!ids.has(id)) throw new EngineError("invalid-argument", `names no item of wing.mass.items ("${id}")`, `${f}.fill.${id}`);
      if (!(v >= 0 && v <= 1)) throw new EngineError("invalid-argument", "must be between 0 and 1 (a fill factor)", `${f}.fill.${id}`);
    }
  });
}

/** Fill factor of an item in a mass case (1 where the case does not name it, or without a case). */
export function fillOf(massCase: MassCase | undefined, id: string): number {
  return massCase?.fill[id] ?? 1;
}

/** Mass of the items of one semispan in a mass state, kg (the structural mass not included). */
export function itemsMassKg(items: readonly MassItem[], massCase?: MassCase): number {
  return items.reduce((s, it) => s + it.kg * fillOf(massCase, it.id), 0);
}

/** Streamwise centre of gravity (m) of the items of one semispan in a mass state, or null without mass. */
export function itemsCentreX(items: readonly MassItem[], massCase?: MassCase): number | null {
  const m = itemsMassKg(items, massCase);
  if (!(m > 0)) return null;
  return items.reduce((s, it) => s + it.kg * fillOf(massCase, it.id) * it.x, 0) / m;
}

/**
 * Loads of one item's weight per unit load factor (N per unit nz, upward positive) at stations `y`
 * (m), with torsion about the reference-axis point `xRef[k]` of each station (streamwise cut, nose up
 * positive). Exact beam statics: a point mass acts on every station strictly inboard of it; a spread
 * mass on the part of its range outboard of the station, at the middle of that part.
 */
export function itemUnitLoads(item: MassItem, y: readonly number[], xRef: readonly number[]): StationLoads {
  const W = item.kg * ISA.g0;
  const n = y.length;
  const shear = new Array<number>(n).fill(0);
  const bending = new Array<number>(n).fill(0);
  const torsion = new Array<number>(n).fill(0);
  for (let k = 0; k < n; k++) {
    let F = 0;
    let arm = 0;
    if (isSpreadItem(item)) {
      const lo = Math.max(item.yFrom, y[k]);
      if (item.yTo > lo) {
        F = (W * (item.yTo - lo)) / (item.yTo - item.yFrom);
        arm = (lo + item.yTo) / 2 - y[k];
      }
    } else if (item.y > y[k]) {
      F = W;
      arm = item.y - y[k];
    }
    if (F === 0) continue;
    shear[k] = F;
    bending[k] = F * arm;
    torsion[k] = F * (xRef[k] - item.x);
  }
  return { shear, bending, torsion };
}

/**
 * Inertia relief (N, N·m) at the stations for load factor `nz`: nz × (structure + Σ fill·item), the
 * amount the masses take off the aerodynamic shear, bending and torsion (net = aerodynamic − relief).
 */
export function inertiaRelief(structure: StationLoads, items: readonly ItemUnitLoads[], nz: number, massCase?: MassCase): StationLoads {
  const n = structure.shear.length;
  const out: StationLoads = { shear: new Array(n), bending: new Array(n), torsion: new Array(n) };
  const weights = items.map((it) => nz * fillOf(massCase, it.id));
  for (let k = 0; k < n; k++) {
    let V = nz * structure.shear[k];
    let M = nz * structure.bending[k];
    let T = nz * structure.torsion[k];
    for (let j = 0; j < items.length; j++) {
      const w = weights[j];
      if (w === 0) continue;
      const l = items[j].loads;
      V += w * l.shear[k];
      M += w * l.bending[k];
      T += w * l.torsion[k];
    }
    out.shear[k] = V;
    out.bending[k] = M;
    out.torsion[k] = T;
  }
  return out;
}
