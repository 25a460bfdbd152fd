import type { LineSeriesOption, ScatterSeriesOption } from "echarts/charts";
import type { GridComponentOption, LegendComponentOption, MarkAreaComponentOption, MarkPointComponentOption, TitleComponentOption, TooltipComponentOption } from "echarts/components";
import type { ComposeOption } from "echarts/core";

/** An option built only of the parts the app registers (components/charts/echarts-client.tsx). */
export type ChartOption = ComposeOption<LineSeriesOption | ScatterSeriesOption | GridComponentOption | LegendComponentOption | MarkAreaComponentOption | MarkPointComponentOption | TitleComponentOption | TooltipComponentOption>;
import { formatNumber, fromSI, unitSymbol, type UnitSystem } from "~/domain/units";

/**
 * Series styles that never change between pages and the PDF: the three compressibility rules,
 * the solver and Schrenk's approximation each keep one colour and dash style. Colours are from the
 * Okabe–Ito palette, chosen to stay distinct for colour-blind readers.
 */
export const SERIES_STYLE = {
  "prandtl-glauert": { color: "#0072B2", type: "solid" as const, label: "Prandtl–Glauert" },
  "karman-tsien": { color: "#D55E00", type: "dashed" as const, label: "Kármán–Tsien" },
  laitone: { color: "#009E73", type: "dotted" as const, label: "Laitone" },
  solver: { color: "#17202b", type: "solid" as const, label: "Spanwise solver" },
  schrenk: { color: "#CC79A7", type: "dashed" as const, label: "Schrenk approximation" },
  "vortex-lattice": { color: "#17202b", type: "solid" as const, label: "Vortex lattice" },
  "lifting-line": { color: "#E69F00", type: "dotted" as const, label: "Lifting line" },
  earlier: { color: "#7a8694", type: "dashed" as const, label: "Earlier version" },
  envelopeMax: { color: "#0072B2", type: "solid" as const, label: "Envelope max" },
  envelopeMin: { color: "#D55E00", type: "solid" as const, label: "Envelope min" },
  limit: { color: "#a82424", type: "dashed" as const, label: "Limit" },
  aerodynamic: { color: "#0072B2", type: "dashed" as const, label: "Aerodynamic load" },
  relief: { color: "#CC79A7", type: "dotted" as const, label: "Inertia relief (taken off)" },
  net: { color: "#17202b", type: "solid" as const, label: "Net load" },
  dynamicGust: { color: "#0072B2", type: "solid" as const, label: "Rigid plunge with lift build-up" },
  prattGust: { color: "#D55E00", type: "dashed" as const, label: "Pratt formula" },
  rolling: { color: "#E69F00", type: "solid" as const, label: "Rolling conditions" },
  neutral: { color: "#7a8694", type: "solid" as const, label: "" },
} as const;

// The family app.css declares (@fontsource-variable), so the charts are set in the loaded face. Quoted:
// a name with a word that is a number ("3") is not a valid unquoted CSS family, and a canvas or an SVG
// style given an invalid family list ignores it (the canvas then draws every label in 10px sans-serif).
export const CHART_FONT = "'Source Sans 3 Variable', sans-serif";

/**
 * The round value at or above `v`, on a step of a fifth of v's decade (7.993832 → 8, 8.7 → 8.8,
 * 0.93 → 0.94, 12.3 → 14), so an axis set to end at its data ends at a value a person reads at once.
 */
export function roundUp(v: number): number {
  if (!Number.isFinite(v) || v === 0) return v;
  const step = 10 ** Math.floor(Math.log10(Math.abs(v))) / 5;
  // Rounded to the step's own digits, so 8.8 is not 8.800000000000001.
  return Number((Math.ceil(v / step - 1e-9) * step).toPrecision(12));
}

/** An axis maximum that follows the data to the next round value (ECharts calls it with the data's extent). */
export const roundedDataMax = (extent: { max: number }) => roundUp(extent.max);

/** Axis settings shared by every chart: the name always carries quantity and unit. */
export function axis(name: string, extra: Record<string, unknown> = {}) {
  return {
    type: "value" as const,
    name,
    nameLocation: "middle" as const,
    nameGap: 34,
    nameTextStyle: { fontFamily: CHART_FONT, fontSize: 12, color: "#4d5a69" },
    axisLabel: { fontFamily: CHART_FONT, color: "#4d5a69" },
    splitLine: { lineStyle: { color: "#e6eaf0" } },
    scale: true,
    ...extra,
  };
}

/** The spanwise station axis in the length unit shown. */
export const spanAxis = (units: UnitSystem) => axis(`Spanwise station y [${unitSymbol(units, "length")}]`, { min: 0, max: roundedDataMax });

/** A station (SI metres) in the length unit shown. */
export const station = (units: UnitSystem, y: number) => fromSI(units, "length", y);

export function baseOption(title: string) {
  return {
    animation: false,
    // Top-left, above the legend's row (22 px down): ECharts 6 otherwise sets a title 15 px down, on it.
    title: { text: title, left: 0, top: 0, textStyle: { fontFamily: CHART_FONT, fontSize: 13, fontWeight: 600, color: "#17202b" } },
    textStyle: { fontFamily: CHART_FONT },
    grid: { left: 64, right: 20, top: 62, bottom: 48, containLabel: false },
    legend: { top: 22, left: 0, itemWidth: 18, textStyle: { fontFamily: CHART_FONT, fontSize: 11 } },
    tooltip: { trigger: "axis" as const, valueFormatter: (v: unknown) => (typeof v === "number" ? formatNumber(v) : String(v)) },
  };
}

export function line(name: string, data: [number, number][], style: { color: string; type: "solid" | "dashed" | "dotted" }, extra: Record<string, unknown> = {}) {
  return { type: "line" as const, name, data, showSymbol: false, lineStyle: { color: style.color, type: style.type, width: 2 }, itemStyle: { color: style.color }, ...extra };
}
