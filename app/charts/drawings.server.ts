import { envelopeVersionsChartOptions, spanwiseWaysChartOption } from "./comparisons";
import { distributionChartOptions, type DistributionSeries } from "./distribution";
import { tunedGustOptions } from "./gust";
import { loadsChartOptions, reliefChartOptions } from "./loads";
import { sectionFitOptions } from "./section-fit";
import { CHART_WIDTH, chartSvg, chartSvgs, type ChartSvg } from "./svg.server";
import { vnSetOption } from "./vn";
import type { SpanwiseComparison } from "~/domain/comparisons";
import type { ReportComparison } from "~/domain/report-comparison";
import type { SectionsData } from "~/domain/step-data";
import type { UnitSystem } from "~/domain/units";

/*
 * The server's drawings of the charts each page shows first, sent with the data they are drawn
 * from (a loader's, or the resource route a page fetches it from): the pages show them without the
 * chart library, which is loaded when the user reaches for a chart. Each is the page's own option
 * (the builder here the page calls), at the width its box has at the usual viewport. Presentation
 * only: the routes call these with data their services gave them.
 */

const HEIGHT = 320;

/** The V–n diagram of the first set, and the tuned gust's charts of its first speed (what the envelope page shows first). */
export function envelopeDrawings(sets: (Parameters<typeof vnSetOption>[0] & { tuned?: Parameters<typeof tunedGustOptions>[0][] })[], stall: { area: number; clMax: number; clMaxNegative: number } | null, units: UnitSystem) {
  const set = sets[0];
  if (!set || !stall) return null;
  const tuned = set.tuned?.[0];
  return {
    // The diagram spans the page's column up to the 2xl breakpoint (1536 px), half of it from there.
    vn: chartSvg(vnSetOption(set, stall, units), { width: CHART_WIDTH.full, height: HEIGHT }),
    tuned: tuned ? chartSvgs(tunedGustOptions(tuned, units), { width: CHART_WIDTH.halfInPanel, height: HEIGHT }) : null,
  };
}
export type EnvelopeDrawings = NonNullable<ReturnType<typeof envelopeDrawings>>;

/** The distribution page's charts of one case (two to a row). */
export function distributionDrawings(view: DistributionSeries, units: UnitSystem) {
  return chartSvgs(distributionChartOptions(view, units), { width: CHART_WIDTH.half, height: HEIGHT });
}
export type DistributionDrawings = ReturnType<typeof distributionDrawings>;

/** The distribution page's running lift of one case by each spanwise method (beside its table). */
export function spanwiseWaysDrawing(comparison: SpanwiseComparison, units: UnitSystem): ChartSvg {
  return chartSvg(spanwiseWaysChartOption(comparison, units), { width: CHART_WIDTH.halfInPanel, height: HEIGHT });
}

/** The loads page's three charts (three to a row). */
export function loadsDrawings(view: { envelope: Parameters<typeof loadsChartOptions>[0]; current: Parameters<typeof loadsChartOptions>[1] }, units: UnitSystem) {
  return chartSvgs(loadsChartOptions(view.envelope, view.current, units), { width: CHART_WIDTH.third, height: HEIGHT });
}
export type LoadsDrawings = ReturnType<typeof loadsDrawings>;

/** The loads page's breakdown of one case into aerodynamic load, relief and net load (three to a row). */
export function reliefDrawings(parts: Parameters<typeof reliefChartOptions>[0] & { caseId: string }, units: UnitSystem) {
  return chartSvgs(reliefChartOptions(parts, parts.caseId, units), { width: CHART_WIDTH.thirdInPanel, height: HEIGHT });
}
export type ReliefDrawings = ReturnType<typeof reliefDrawings>;

/** The sections page's fit chart of each polar table, by station (a column of their own). */
export function sectionFitDrawings(saved: SectionsData | null, units: UnitSystem): Record<string, ChartSvg> {
  return Object.fromEntries(sectionFitOptions(saved, units).map(({ y, option }) => [String(y), chartSvg(option, { width: CHART_WIDTH.column, height: 260 })]));
}

/** The report comparison page's envelope overlays of the two versions (three to a row, each in a panel). */
export function reportCompareDrawings(comparison: Pick<ReportComparison, "envelopes" | "from" | "to">, units: UnitSystem) {
  return chartSvgs(envelopeVersionsChartOptions(comparison, units), { width: CHART_WIDTH.thirdOfPanels, height: HEIGHT });
}
