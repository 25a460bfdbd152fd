import type { SpanwiseComparison } from "~/domain/comparisons";
import { axis, baseOption, line, SERIES_STYLE } from "./theme";

/** A display unit: its symbol and the conversion from SI. */
export interface DisplayUnit {
  symbol: string;
  scale: (si: number) => number;
}

/**
 * The running lift of one case by each spanwise method that is valid for it, overlaid: the vortex
 * lattice, the lifting line and Schrenk's approximation keep their own colours and dash styles.
 */
export function spanwiseWaysOption(c: SpanwiseComparison, unit: DisplayUnit) {
  const base = baseOption(`Running lift of case ${c.caseId} by spanwise method`);
  return {
    ...base,
    xAxis: axis("Spanwise station y [m]", { min: 0, max: "dataMax" }),
    yAxis: axis(`Running lift [${unit.symbol}]`),
    series: c.ways.flatMap((w) => (w.valid ? [line(SERIES_STYLE[w.way].label, w.y.map((y, i) => [y, unit.scale(w.lift[i]!)] as [number, number]), SERIES_STYLE[w.way])] : [])),
  };
}
