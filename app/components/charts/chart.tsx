import { lazy, Suspense, useRef } from "react";
import type ReactEChartsCore from "echarts-for-react/esm/core";
import type { ChartOption } from "~/charts/theme";
import { useAfterInteractive } from "~/components/ui/use-after-interactive";

// ECharts needs a browser: the server renders a sized frame and the chart appears once the page
// answers input, from a chunk of its own holding only the chart types and components the app draws.
const ReactECharts = lazy(() => import("./echarts-client"));

/** One chart with hover read-outs and PNG/SVG saving; options come from app/charts builders. */
export function Chart({ option, height = 320, label, fileName }: { option: ChartOption; height?: number; label: string; fileName: string }) {
  const client = useAfterInteractive();
  const ref = useRef<ReactEChartsCore | null>(null);
  const save = async (type: "png" | "svg") => {
    const a = document.createElement("a");
    a.download = `${fileName}.${type}`;
    if (type === "png") {
      const instance = ref.current?.getEchartsInstance();
      if (!instance) return;
      a.href = instance.getDataURL({ type: "png", pixelRatio: 2, backgroundColor: "#fff" });
    } else {
      // The same option rendered as vectors, as the PDF report does on the server.
      const { echarts } = await import("./echarts-svg");
      const off = echarts.init(null, null, { renderer: "svg", ssr: true, width: 900, height });
      off.setOption({ ...option, animation: false });
      a.href = URL.createObjectURL(new Blob([off.renderToSVGString()], { type: "image/svg+xml" }));
      off.dispose();
    }
    a.click();
  };
  return (
    <figure aria-label={label} className="rounded border border-line bg-surface p-2">
      {/* The canvas is drawn at the width of this box: contained, a chart never widens the column it sits in. */}
      <div style={{ height }} className="contain-inline-size">
        {client ? (
          <Suspense fallback={null}>
            <ReactECharts ref={ref} option={option} style={{ height, width: "100%" }} opts={{ renderer: "canvas" }} notMerge />
          </Suspense>
        ) : null}
      </div>
      <figcaption className="flex justify-end gap-2 text-xs">
        <button type="button" className="text-accent hover:underline" onClick={() => void save("png")}>
          Save PNG
        </button>
        <button type="button" className="text-accent hover:underline" onClick={() => void save("svg")}>
          Save SVG
        </button>
      </figcaption>
    </figure>
  );
}
