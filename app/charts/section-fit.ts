import type { SectionsData } from "~/domain/step-data";
import { formatQuantity, type UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, type ChartOption } from "./theme";

/** cl against α of one polar table, the fitted line and the detected linear range shaded. */
export function sectionFitOption(table: SectionsData["tables"][number], fit: { a0: number; alphaL0: number }, units: UnitSystem): ChartOption {
  const xs = table.points.map((p) => p.alpha);
  const fitted: [number, number][] = [table.linearFrom, table.linearTo].map((a) => [a, (fit.a0 * (a - fit.alphaL0) * Math.PI) / 180]);
  return {
    ...baseOption(`Section at y = ${formatQuantity(units, "length", table.y)}`),
    xAxis: axis("Angle of attack α [°]", { min: Math.floor(Math.min(...xs)), max: Math.ceil(Math.max(...xs)) }),
    yAxis: axis("Section lift coefficient cl [–]"),
    series: [
      {
        type: "scatter" as const,
        name: "Table",
        data: table.points.map((p) => [p.alpha, p.cl]),
        itemStyle: { color: SERIES_STYLE.solver.color },
        markArea: { silent: true, itemStyle: { color: "rgba(0,114,178,0.08)" }, data: [[{ xAxis: table.linearFrom, name: "linear range" }, { xAxis: table.linearTo }]] },
      },
      line("Fitted a0, αL0", fitted, SERIES_STYLE["prandtl-glauert"]),
    ],
  };
}

/** The sections page's fit chart of each polar table of the saved data with a row at its station, by station. The page and the server draw these options. */
export function sectionFitOptions(saved: Pick<SectionsData, "tables" | "rows"> | null, units: UnitSystem): { y: number; option: ChartOption }[] {
  return (saved?.tables ?? []).flatMap((t) => {
    const row = saved!.rows.find((r) => r.y === t.y);
    return row ? [{ y: t.y, option: sectionFitOption(t, { a0: row.a0, alphaL0: row.alphaL0 }, units) }] : [];
  });
}
