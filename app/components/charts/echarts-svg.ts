import { SVGRenderer } from "echarts/renderers";
import { echarts } from "./echarts-client";

// A module of its own, so the SVG renderer is a chunk fetched only when a chart is saved as SVG.
echarts.use(SVGRenderer);

export { echarts };
