import * as echarts from "echarts/core";
import { CanvasRenderer } from "echarts/renderers";
import ReactEChartsCore from "echarts-for-react/esm/core";
import type { EChartsReactProps } from "echarts-for-react";
import { forwardRef, useLayoutEffect, useMemo, useRef, useState } from "react";
import { withLegendRoom } from "~/charts/legend-room";
import type { ChartOption } from "~/charts/theme";
import { CHART_PARTS } from "./echarts-parts";

// Only the parts app/charts builds (echarts-parts.ts), drawn on canvas; the SVG renderer comes with "Save SVG"
// of a chart the server did not draw (echarts-svg.ts). The whole library is twice the size and came with every page with a chart.
echarts.use([...CHART_PARTS, CanvasRenderer]);

export { echarts };

/**
 * echarts-for-react bound to the parts registered above. The option is given room for its legend at
 * the width the chart is drawn (legend-room.ts), as the server's drawing of it is: measured before the
 * chart is made, and again when the box's width changes.
 */
const ReactECharts = forwardRef<ReactEChartsCore, Omit<EChartsReactProps, "echarts"> & { option: ChartOption }>(function ReactECharts({ option, ...props }, ref) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState<number | null>(null);
  useLayoutEffect(() => {
    const el = box.current;
    if (!el) return;
    setWidth(el.clientWidth);
    const observer = new ResizeObserver(([entry]) => setWidth(Math.round(entry!.contentRect.width)));
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  const fitted = useMemo(() => (width === null ? null : withLegendRoom(option, width)), [option, width]);
  return <div ref={box}>{fitted ? <ReactEChartsCore ref={ref} echarts={echarts} option={fitted} {...props} /> : null}</div>;
});
export default ReactECharts;
