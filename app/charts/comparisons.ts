import type { SpanwiseComparison } from "~/domain/comparisons";
import type { ReportComparison } from "~/domain/report-comparison";
import type { EnvelopeRow } from "~/engine";
import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, spanAxis, station, type ChartOption } from "./theme";

/** A display unit: its symbol and the conversion from SI. */
export interface DisplayUnit {
  symbol: string;
  scale: (si: number) => number;
}

/**
 * The running lift of one case by each spanwise method that is valid for it, overlaid: the vortex
 * lattice, the lifting line and Schrenk's approximation keep their own colours and dash styles.
 */
export function spanwiseWaysOption(c: SpanwiseComparison, unit: DisplayUnit, units: UnitSystem): ChartOption {
  const base = baseOption(`Running lift of case ${c.caseId} by spanwise method`);
  return {
    ...base,
    xAxis: spanAxis(units),
    yAxis: axis(`Running lift [${unit.symbol}]`),
    series: c.ways.flatMap((w) => (w.valid ? [line(SERIES_STYLE[w.way].label, w.y.map((y, i) => [station(units, y), unit.scale(w.lift[i]!)] as [number, number]), SERIES_STYLE[w.way])] : [])),
  };
}

/**
 * The envelope of one load (shear, bending or torsion) of two report versions overlaid: the newer
 * version's maximum and minimum in the envelope colours, the older one's in the earlier-version
 * grey, dashed.
 */
export function envelopeVersionsOption(
  kind: "shear" | "bending" | "torsion",
  c: Pick<ReportComparison, "envelopes" | "from" | "to">,
  unit: DisplayUnit,
  units: UnitSystem,
): ChartOption {
  const title = { shear: "Shear force", bending: "Bending moment", torsion: "Torsion" }[kind];
  const base = baseOption(`${title} envelope: version ${c.from.version} and version ${c.to.version}`);
  const pts = (rows: EnvelopeRow[], k: "Max" | "Min") => rows.map((r) => [station(units, r.y), unit.scale(r[`${kind}${k}`])] as [number, number]);
  return {
    ...base,
    xAxis: spanAxis(units),
    yAxis: axis(`${title} [${unit.symbol}]`),
    series: [
      line(`v${c.to.version} max`, pts(c.envelopes.after, "Max"), SERIES_STYLE.envelopeMax),
      line(`v${c.to.version} min`, pts(c.envelopes.after, "Min"), SERIES_STYLE.envelopeMin),
      line(`v${c.from.version} max`, pts(c.envelopes.before, "Max"), SERIES_STYLE.earlier),
      line(`v${c.from.version} min`, pts(c.envelopes.before, "Min"), { ...SERIES_STYLE.earlier, type: "dotted" }),
    ],
  };
}

/** The distribution page's running lift of one case by each spanwise method, in the unit shown. The page and the server draw this option. */
export function spanwiseWaysChartOption(c: SpanwiseComparison, units: UnitSystem): ChartOption {
  return spanwiseWaysOption(c, { symbol: unitSymbol(units, "runningLoad"), scale: (si: number) => fromSI(units, "runningLoad", si) }, units);
}

/** The report comparison page's three envelope overlays, in the units shown. The page and the server draw these options. */
export function envelopeVersionsChartOptions(c: Pick<ReportComparison, "envelopes" | "from" | "to">, units: UnitSystem): Record<"shear" | "bending" | "torsion", ChartOption> {
  const one = (kind: "shear" | "bending" | "torsion") => {
    const quantity = kind === "shear" ? "force" : "moment";
    return envelopeVersionsOption(kind, c, { symbol: unitSymbol(units, quantity), scale: (v) => fromSI(units, quantity, v) }, units);
  };
  return { shear: one("shear"), bending: one("bending"), torsion: one("torsion") };
}
