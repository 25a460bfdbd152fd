import type { CompressibilityRule } from "~/engine";
import type { UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, spanAxis, station, type ChartOption } from "./theme";

export interface DistributionSeries {
  y: number[];
  loading: { solver: number[]; schrenk: number[] };
  cl: number[];
  clMax: (number | null)[];
  cm: number[];
  stationMachCritical: (number | null)[];
  /** Simple sweep theory's value per station, optimistic, shown beside the conservative one. */
  stationMachCriticalSwept: (number | null)[];
  mach: number;
  rules: { rule: CompressibilityRule; cl: number[]; cm: number[] }[];
  spanwise: string;
}

// Stations (SI metres) in the length unit shown.
const zipIn = (units: UnitSystem) => (x: number[], y: (number | null)[]): [number, number][] => x.flatMap((v, i) => (y[i] === null || y[i] === undefined ? [] : [[station(units, v), y[i] as number] as [number, number]]));

/** Spanwise loading c·cl/(c̄·CL): the solver against Schrenk's approximation. */
export function loadingOption(d: DistributionSeries, units: UnitSystem = "SI"): ChartOption {
  const zip = zipIn(units);
  return {
    ...baseOption("Spanwise loading"),
    xAxis: spanAxis(units),
    yAxis: axis("c·cl/(c̄·CL) [–]", { min: 0 }),
    series: [
      line(`${d.spanwise === "lifting-line" ? "Lifting line" : "Vortex lattice"}`, zip(d.y, d.loading.solver), SERIES_STYLE.solver),
      line(SERIES_STYLE.schrenk.label, zip(d.y, d.loading.schrenk), SERIES_STYLE.schrenk),
    ],
  };
}

/** Section lift coefficient with the section clmax where given. */
export function clOption(d: DistributionSeries, units: UnitSystem = "SI"): ChartOption {
  const zip = zipIn(units);
  return {
    ...baseOption("Section lift coefficient"),
    xAxis: spanAxis(units),
    yAxis: axis("cl [–]"),
    series: [line("cl", zip(d.y, d.cl), SERIES_STYLE.solver), line("clmax", zip(d.y, d.clMax), SERIES_STYLE.limit)],
  };
}

/** The same case under each compressibility rule: cl (or cm) along the span, fixed colours per rule. */
export function rulesOption(d: DistributionSeries, quantity: "cl" | "cm", units: UnitSystem = "SI"): ChartOption {
  const zip = zipIn(units);
  return {
    ...baseOption(quantity === "cl" ? "Section cl by compressibility rule" : "Section cm (quarter chord) by compressibility rule"),
    xAxis: spanAxis(units),
    yAxis: axis(quantity === "cl" ? "cl [–]" : "cm,c/4 [–]"),
    series: d.rules.map((r) => line(SERIES_STYLE[r.rule].label, zip(d.y, r[quantity]), SERIES_STYLE[r.rule])),
  };
}

/** Each station's critical Mach number at this case's lift against the case Mach number, with simple sweep theory's beside it. */
export function machCriticalOption(d: DistributionSeries, units: UnitSystem = "SI"): ChartOption {
  const zip = zipIn(units);
  return {
    ...baseOption("Critical Mach number along the span"),
    xAxis: spanAxis(units),
    yAxis: axis("Mach number [–]"),
    series: [
      line("Station critical Mach (unswept, conservative)", zip(d.y, d.stationMachCritical), SERIES_STYLE.solver),
      line("Simple sweep theory (cos Λ, optimistic)", zip(d.y, d.stationMachCriticalSwept), SERIES_STYLE.neutral),
      line("Case Mach", [[0, d.mach], [d.y[d.y.length - 1] ?? 0, d.mach]], SERIES_STYLE.limit),
    ],
  };
}

/** The distribution page's charts of the case shown. The page and the server draw these options. */
export function distributionChartOptions(d: DistributionSeries, units: UnitSystem) {
  return { loading: loadingOption(d, units), cl: clOption(d, units), rulesCl: rulesOption(d, "cl", units), rulesCm: rulesOption(d, "cm", units), machCritical: machCriticalOption(d, units) };
}
