import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, spanAxis, station, type ChartOption } from "./theme";

export type LoadQuantity = "shear" | "bending" | "torsion";

const TITLES: Record<LoadQuantity, string> = { shear: "Shear force", bending: "Bending moment", torsion: "Torsion (nose up positive)" };

/**
 * One internal load along the span: the chosen case and the envelope (max and min over all cases).
 * `scale` converts SI to the display unit named in `unit`; stations are shown in the length unit of `units`.
 */
export function loadsOption(
  quantity: LoadQuantity,
  data: { y: number[]; caseValues?: number[]; caseId?: string; max: number[]; min: number[]; otherValues?: number[] },
  unit: { symbol: string; scale: (si: number) => number },
  units: UnitSystem = "SI",
): ChartOption {
  // A rolling case shows both sides: the loaded one (its stations) and the other.
  const side = data.otherValues ? ", loaded side" : "";
  const pts = (v: number[]): [number, number][] => data.y.map((y, i) => [station(units, y), unit.scale(v[i]!)]);
  const base = baseOption(TITLES[quantity]);
  return {
    ...base,
    // Three legend entries wrap to two rows in the pages' third-width charts: keep the plot below them.
    grid: { ...base.grid, top: 80 },
    xAxis: spanAxis(units),
    yAxis: axis(`${TITLES[quantity].split(" (")[0]} [${unit.symbol}]`),
    series: [
      line(SERIES_STYLE.envelopeMax.label, pts(data.max), SERIES_STYLE.envelopeMax, { areaStyle: undefined }),
      line(SERIES_STYLE.envelopeMin.label, pts(data.min), SERIES_STYLE.envelopeMin),
      ...(data.caseValues ? [line(`Case ${data.caseId}${side}`, pts(data.caseValues), { color: SERIES_STYLE.solver.color, type: "dashed" as const })] : []),
      ...(data.otherValues ? [line(`Case ${data.caseId}, other side`, pts(data.otherValues), { color: SERIES_STYLE.rolling.color, type: "dotted" as const })] : []),
    ],
  };
}

/**
 * One case's load along the span split into its parts: the aerodynamic load, the inertia relief the
 * masses take off (drawn negative, so the net load is the sum of the two curves), and the net load.
 */
export function reliefOption(
  quantity: LoadQuantity,
  data: { y: number[]; aero: number[]; relief: number[]; net: number[]; caseId: string },
  unit: { symbol: string; scale: (si: number) => number },
  units: UnitSystem,
): ChartOption {
  const pts = (v: number[], sign = 1): [number, number][] => data.y.map((y, i) => [station(units, y), unit.scale(sign * v[i]!)]);
  const base = baseOption(`${TITLES[quantity]}, case ${data.caseId}`);
  return {
    ...base,
    grid: { ...base.grid, top: 80 },
    xAxis: spanAxis(units),
    yAxis: axis(`${TITLES[quantity].split(" (")[0]} [${unit.symbol}]`),
    series: [
      line(SERIES_STYLE.aerodynamic.label, pts(data.aero), SERIES_STYLE.aerodynamic),
      line(SERIES_STYLE.relief.label, pts(data.relief, -1), SERIES_STYLE.relief),
      line(SERIES_STYLE.net.label, pts(data.net), SERIES_STYLE.net),
    ],
  };
}

type Envelope = { y: number; shearMax: number; shearMin: number; bendingMax: number; bendingMin: number; torsionMax: number; torsionMin: number }[];
type StationLoads = { shear: number; bending: number; torsion: number }[];

/** The loads page's three charts: each load's envelope with the case shown (both sides of a rolling case). The page and the server draw these options. */
export function loadsChartOptions(envelope: Envelope, current: { id: string; stations?: StationLoads; roll?: { other: { stations?: StationLoads } } }, units: UnitSystem): Record<LoadQuantity, ChartOption> {
  const force = { symbol: unitSymbol(units, "force"), scale: (v: number) => fromSI(units, "force", v) };
  const moment = { symbol: unitSymbol(units, "moment"), scale: (v: number) => fromSI(units, "moment", v) };
  const series = (q: LoadQuantity) => ({
    y: envelope.map((e) => e.y),
    max: envelope.map((e) => e[`${q}Max`]),
    min: envelope.map((e) => e[`${q}Min`]),
    caseId: current.id,
    caseValues: current.stations?.map((s) => s[q]),
    otherValues: current.roll?.other.stations?.map((s) => s[q]),
  });
  return { shear: loadsOption("shear", series("shear"), force, units), bending: loadsOption("bending", series("bending"), moment, units), torsion: loadsOption("torsion", series("torsion"), moment, units) };
}

/** The loads page's breakdown of one case: aerodynamic load, relief and net load of each quantity. The page and the server draw these options. */
export function reliefChartOptions(parts: { y: number[]; aero: Record<LoadQuantity, number[]>; relief: Record<LoadQuantity, number[]>; net: Record<LoadQuantity, number[]> }, caseId: string, units: UnitSystem): Record<LoadQuantity, ChartOption> {
  const force = { symbol: unitSymbol(units, "force"), scale: (v: number) => fromSI(units, "force", v) };
  const moment = { symbol: unitSymbol(units, "moment"), scale: (v: number) => fromSI(units, "moment", v) };
  const one = (q: LoadQuantity) => reliefOption(q, { y: parts.y, aero: parts.aero[q], relief: parts.relief[q], net: parts.net[q], caseId }, q === "shear" ? force : moment, units);
  return { shear: one("shear"), bending: one("bending"), torsion: one("torsion") };
}
