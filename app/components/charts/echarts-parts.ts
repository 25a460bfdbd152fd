import { LineChart, ScatterChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, MarkPointComponent, TitleComponent, TooltipComponent } from "echarts/components";
import { LabelLayout } from "echarts/features";

// Only what app/charts builds: line and scatter series, titles, grids, legends, tooltips, the
// shaded linear range (markArea), the tuned gust's critical point (markPoint) and labels moved
// apart (labelLayout). The live chart (canvas, echarts-client.tsx) and the server's drawing (SVG,
// app/charts/svg.server.ts) register the same parts, so the two draw an option alike.
export const CHART_PARTS = [LineChart, ScatterChart, GridComponent, LegendComponent, MarkAreaComponent, MarkPointComponent, TitleComponent, TooltipComponent, LabelLayout];
