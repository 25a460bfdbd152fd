import * as echarts from "echarts/core";
import { CanvasRenderer } from "echarts/renderers";
import ReactEChartsCore from "echarts-for-react/esm/core";
import type { EChartsReactProps } from "echarts-for-react";
import { CHART_PARTS } from "./echarts-parts";
import { forwardRef } from "react";

// Only the parts app/charts builds (echarts-parts.ts), drawn on canvas; the SVG renderer comes with "Save SVG"
// of a chart the server did not draw (echarts-svg.ts). The whole library is twice the size and came with every page with a chart.
echarts.use([...CHART_PARTS, CanvasRenderer]);

export { echarts };

/** echarts-for-react bound to the parts registered above. */
const ReactECharts = forwardRef<ReactEChartsCore, Omit<EChartsReactProps, "echarts">>(function ReactECharts(props, ref) {
  return <ReactEChartsCore ref={ref} echarts={echarts} {...props} />;
});
export default ReactECharts;
