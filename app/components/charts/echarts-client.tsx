import * as echarts from "echarts/core";
import { LineChart, ScatterChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, TitleComponent, TooltipComponent } from "echarts/components";
import { LabelLayout } from "echarts/features";
import { CanvasRenderer } from "echarts/renderers";
import ReactEChartsCore from "echarts-for-react/esm/core";
import type { EChartsReactProps } from "echarts-for-react";
import { forwardRef } from "react";

// Only what app/charts builds: line and scatter series, titles, grids, legends, tooltips, the
// shaded linear range (markArea) and labels moved apart (labelLayout), drawn on canvas; the SVG renderer comes with "Save SVG"
// (echarts-svg.ts). The whole library is twice the size and came with every page with a chart.
echarts.use([LineChart, ScatterChart, GridComponent, LegendComponent, MarkAreaComponent, TitleComponent, TooltipComponent, LabelLayout, CanvasRenderer]);

export { echarts };

/** echarts-for-react bound to the parts registered above. */
const ReactECharts = forwardRef<ReactEChartsCore, Omit<EChartsReactProps, "echarts">>(function ReactECharts(props, ref) {
  return <ReactEChartsCore ref={ref} echarts={echarts} {...props} />;
});
export default ReactECharts;
