import { createHash } from "node:crypto";
import * as echarts from "echarts/core";
import { SVGRenderer } from "echarts/renderers";
import { CHART_PARTS } from "~/components/charts/echarts-parts";
import { withLegendRoom } from "./legend-room";
import type { ChartOption } from "./theme";

/*
 * Charts drawn on the server: the page's own ECharts option rendered to SVG (ECharts' server-side
 * rendering, as the PDF report does), sent with the page's data and shown at once; the live chart
 * (hover read-outs, PNG saving) is loaded only when the user reaches for it
 * (components/charts/chart.tsx). The same parts of ECharts are registered as in the browser
 * (echarts-parts.ts), so the drawing is the one the live chart makes.
 */

echarts.use([...CHART_PARTS, SVGRenderer]);

/**
 * The chart's drawing width, for each place a chart sits on the pages: the box's width at the app's
 * usual 1280 × 800 viewport (case rail and padding taken off): a panel in the page's column, the
 * column itself, half of it, half of a panel, a third, a third in a panel, a panel in a third.
 * Measured in Chromium, except "column" and "thirdOfPanels", worked out from the panels' padding. The server does not know the column's
 * width; the SVG keeps this width in its viewBox and scales to the box it is shown in (never above
 * its own size), so at another viewport it is the same drawing, a little smaller or with room beside.
 */
export const CHART_WIDTH = { full: 808, column: 841, half: 404, halfInPanel: 388, third: 258, thirdInPanel: 248, thirdOfPanels: 224 } as const;

export interface ChartSize {
  width: number;
  height: number;
}

/** A chart as the page shows it before the live chart is loaded: its SVG, drawn at `width` × `height`. */
export type ChartSvg = string;

// Rendered drawings by the option's content: a page loaded again (or another user's view of the same
// case) does not draw again. Content-keyed, so never stale; bounded, oldest first out.
const CACHE_LIMIT = 200;
const cache = new Map<string, ChartSvg>();

/** The option's content as text: data, labels and styles; the builders' functions by their source. */
function contentKey(option: ChartOption, size: ChartSize): string {
  const text = JSON.stringify(option, (_key, value: unknown) => (typeof value === "function" ? `fn:${String(value)}` : typeof value === "number" && !Number.isFinite(value) ? `num:${value}` : value));
  return createHash("sha256").update(`${size.width}x${size.height}:`).update(text).digest("hex").slice(0, 16);
}

/**
 * The option drawn as an SVG string at `size`. Its ids (clip paths, classes) are named after the
 * content, so several charts inlined in one page never share an id unless they are the same drawing.
 */
export function chartSvg(option: ChartOption, size: ChartSize): ChartSvg {
  const key = contentKey(option, size);
  const hit = cache.get(key);
  if (hit !== undefined) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const chart = echarts.init(null, null, { renderer: "svg", ssr: true, width: size.width, height: size.height });
  let svg: string;
  try {
    chart.setOption({ ...withLegendRoom(option, size.width), animation: false });
    svg = chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
  // ECharts names ids after its instance counter ("zr12-c0"): unique within this process only.
  svg = svg.replace(/\bzr\d+-/g, `c${key}-`);
  cache.set(key, svg);
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return svg;
}

/** Several named options drawn at one size. */
export function chartSvgs<K extends string>(options: Record<K, ChartOption>, size: ChartSize): Record<K, ChartSvg> {
  return Object.fromEntries(Object.entries<ChartOption>(options).map(([k, o]) => [k, chartSvg(o, size)])) as Record<K, ChartSvg>;
}
