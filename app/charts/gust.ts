import type { TunedGustResult } from "~/engine";
import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, type ChartOption } from "./theme";

/**
 * The tuned discrete gust: peak incremental load factor against the gust gradient H, from the rigid
 * aircraft in plunge with lift build-up and from Pratt's formula with the same design gust velocity;
 * the critical gradient marked. `length` converts m to the display unit.
 */
export function tunedGustOption(title: string, r: TunedGustResult, length: { symbol: string; fromSI: (m: number) => number }): ChartOption {
  const pts = (f: (row: TunedGustResult["rows"][number]) => number): [number, number][] => r.rows.map((row) => [length.fromSI(row.gradient), f(row)]);
  return {
    ...baseOption(title),
    xAxis: axis(`Gust gradient H [${length.symbol}]`),
    yAxis: axis("Incremental load factor Δn [–]"),
    series: [
      line(SERIES_STYLE.dynamicGust.label, pts((row) => row.deltaN), SERIES_STYLE.dynamicGust, {
        markPoint: {
          symbol: "circle",
          symbolSize: 8,
          data: [{ coord: [length.fromSI(r.critical.gradient), r.critical.deltaN], name: "critical", label: { show: true, formatter: "critical", position: "top" as const, fontSize: 10 } }],
        },
      }),
      line(SERIES_STYLE.prattGust.label, pts((row) => row.prattDeltaN), SERIES_STYLE.prattGust),
    ],
  };
}

/**
 * Time history of the plunge response at the critical gradient: the gust velocity over its peak and
 * the load factor increment over its quasi-steady sharp-edged value, against distance in chords.
 */
export function gustHistoryOption(title: string, history: { s: number; gust: number; k: number }[]): ChartOption {
  const chords = (s: number) => s / 2;
  return {
    ...baseOption(title),
    xAxis: axis("Distance travelled [mean chords]", { min: 0 }),
    yAxis: axis("Fraction of peak [–]"),
    series: [
      line("Gust velocity / U_ds", history.map((h) => [chords(h.s), h.gust] as [number, number]), SERIES_STYLE.neutral),
      line("Δn / Δn sharp-edged", history.map((h) => [chords(h.s), h.k] as [number, number]), SERIES_STYLE.dynamicGust),
    ],
  };
}

/** The two charts of one speed's tuned gust on the envelope page, in the length unit shown: the page and the server draw these options. */
export function tunedGustOptions(t: { speed: string; result: TunedGustResult; history: { s: number; gust: number; k: number }[] }, units: UnitSystem): { peak: ChartOption; history: ChartOption } {
  const length = { symbol: unitSymbol(units, "length"), fromSI: (m: number) => fromSI(units, "length", m) };
  return { peak: tunedGustOption(`Peak Δn against gust gradient, ${t.speed}`, t.result, length), history: gustHistoryOption(`Response at the critical gradient, ${t.speed}`, t.history) };
}
