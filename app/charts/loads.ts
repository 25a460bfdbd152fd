import type { UnitSystem } from "~/domain/units";
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
