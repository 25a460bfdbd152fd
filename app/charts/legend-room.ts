import { format } from "echarts/core";
import { CHART_FONT, type ChartOption } from "./theme";

/*
 * Room for a legend that wraps. The legend's row sits between the title and the plot (theme.ts); in a
 * narrow chart (a third of the column, a panel) its items take two or three rows, and the plot, set
 * to start below one row, ran under them. The rows are counted as ECharts lays them out (its legend
 * view: each item its mark, 5 px, its text; items `itemGap` apart, wrapping at the box's edge), the
 * text measured by ECharts' own measure: the canvas's in the browser, its table of widths on the
 * server, where it draws the SVG with the same measure. Kept out of theme.ts, which every page loads:
 * it brings in the chart library, which only the chart chunk and the server hold.
 */

/** ECharts' legend defaults where an option sets none (LegendModel). */
const ITEM_GAP = 10;
const ITEM_WIDTH = 25;
const ITEM_HEIGHT = 14;
const PADDING = 5;
const FONT_SIZE = 12;
/** Between an item's mark and its text (ECharts' legend view). */
const TEXT_GAP = 5;

interface LegendSettings {
  show?: boolean;
  data?: (string | { name: string })[];
  left?: number | string;
  itemGap?: number;
  itemWidth?: number;
  itemHeight?: number;
  textStyle?: { fontSize?: number; fontFamily?: string };
}

/** The chart's (first) legend, if it shows. */
function legendOf(option: ChartOption): LegendSettings | null {
  const legend = (Array.isArray(option.legend) ? option.legend[0] : option.legend) as LegendSettings | undefined;
  return legend && legend.show !== false ? legend : null;
}

/** The names the legend shows: its own list, or each named series once, in order. */
function legendNames(option: ChartOption, legend: LegendSettings): string[] {
  if (legend.data) return legend.data.map((d) => (typeof d === "string" ? d : d.name));
  const series = (Array.isArray(option.series) ? option.series : option.series ? [option.series] : []) as { name?: unknown }[];
  return [...new Set(series.map((s) => s.name).filter((n): n is string => typeof n === "string" && n !== ""))];
}

/** The rows `legend` takes in a chart `width` px wide. */
function legendRows(option: ChartOption, legend: LegendSettings, width: number): number {
  const names = legendNames(option, legend);
  const gap = legend.itemGap ?? ITEM_GAP;
  const font = `${legend.textStyle?.fontSize ?? FONT_SIZE}px ${legend.textStyle?.fontFamily ?? CHART_FONT}`;
  const left = typeof legend.left === "number" ? legend.left : 0;
  const room = width - left - 2 * PADDING;
  let rows = 1;
  let x = 0;
  for (const name of names) {
    const itemWidth = (legend.itemWidth ?? ITEM_WIDTH) + TEXT_GAP + format.getTextRect(name, font).width;
    if (x > 0 && x + itemWidth > room) {
      rows++;
      x = 0;
    }
    x += itemWidth + gap;
  }
  return rows;
}

/** `option` with its plot moved down by the legend's rows beyond the first, at a chart `width` px wide. */
export function withLegendRoom(option: ChartOption, width: number): ChartOption {
  const legend = legendOf(option);
  const grid = option.grid;
  if (!legend || !grid || Array.isArray(grid)) return option;
  const rows = legendRows(option, legend, width);
  if (rows <= 1) return option;
  const pitch = Math.max(legend.itemHeight ?? ITEM_HEIGHT, (legend.textStyle?.fontSize ?? FONT_SIZE) * 1.2) + (legend.itemGap ?? ITEM_GAP);
  const top = typeof grid.top === "number" ? grid.top : 60;
  return { ...option, grid: { ...grid, top: top + (rows - 1) * pitch } };
}
