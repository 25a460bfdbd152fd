import { lazy, Suspense, useMemo, useRef, useState } from "react";
import type ReactEChartsCore from "echarts-for-react/esm/core";
import type { ChartOption } from "~/charts/theme";
import { useAfterInteractive } from "~/components/ui/use-after-interactive";

// ECharts needs a browser and is a large chunk: a chart the server drew (app/charts/svg.server.ts)
// shows as its SVG, and the live chart (hover read-outs, PNG saving) is loaded, from a chunk of its
// own holding only the chart types and components the app draws, when the user reaches for it —
// the pointer or a touch on the figure, focus within it, "Save PNG". A chart with no server drawing
// is drawn live once the page answers input.
const ReactECharts = lazy(() => import("./echarts-client"));

/** The attribute value `text` as HTML writes it. */
const attribute = (text: string) => text.replace(/&/g, "&amp;").replace(/"/g, "&quot;").replace(/</g, "&lt;");

/**
 * The server's SVG as the page shows it: an image named by the figure's label, filling the chart's
 * box and scaled down (never up) to its width, drawn from its left edge as the live chart is.
 */
function shownSvg(svg: string, label: string) {
  return svg.replace(/^<svg width="\d+(?:\.\d+)?" height="\d+(?:\.\d+)?"/, `<svg role="img" aria-label="${attribute(label)}" width="100%" height="100%" preserveAspectRatio="xMinYMin meet" style="display:block"`);
}

type Instance = ReturnType<ReactEChartsCore["getEchartsInstance"]>;

/** One chart with hover read-outs and PNG/SVG saving; options come from app/charts builders, `svg` from the server's drawing of the same option. */
export function Chart({ option, svg, height = 320, label, fileName }: { option: ChartOption; svg?: string | null; height?: number; label: string; fileName: string }) {
  const idle = useAfterInteractive();
  const [reached, setReached] = useState(false);
  const live = svg ? reached : idle;
  const ref = useRef<ReactEChartsCore | null>(null);
  const waiting = useRef<((instance: Instance) => void)[]>([]);
  const image = useMemo(() => (svg ? { __html: shownSvg(svg, label) } : null), [svg, label]);
  const reach = () => {
    if (!reached) setReached(true);
  };
  /** The live chart's instance, loading the live chart first if the page shows the SVG. */
  const instance = (): Promise<Instance> => {
    if (ref.current) return Promise.resolve(ref.current.getEchartsInstance());
    reach();
    return new Promise((resolve) => waiting.current.push(resolve));
  };
  const save = async (type: "png" | "svg") => {
    const a = document.createElement("a");
    a.download = `${fileName}.${type}`;
    if (type === "png") {
      a.href = (await instance()).getDataURL({ type: "png", pixelRatio: 2, backgroundColor: "#fff" });
    } else if (svg) {
      // The drawing the page showed, as the server rendered it.
      a.href = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml" }));
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
  const drawing = image ? <div className="h-full" data-chart="svg" dangerouslySetInnerHTML={image} /> : null;
  return (
    <figure aria-label={label} className="rounded border border-line bg-surface p-2" onPointerEnter={svg ? reach : undefined} onTouchStart={svg ? reach : undefined} onFocus={svg ? reach : undefined}>
      {/* The box keeps the chart's height whichever is shown, so the live chart replaces the SVG in place. Contained: a chart never widens the column it sits in. */}
      <div style={{ height }} className="contain-inline-size">
        {live ? (
          <Suspense fallback={drawing}>
            <ReactECharts
              ref={ref}
              option={option}
              style={{ height, width: "100%" }}
              opts={{ renderer: "canvas" }}
              notMerge
              onChartReady={(chart: Instance) => waiting.current.splice(0).forEach((resolve) => resolve(chart))}
            />
          </Suspense>
        ) : (
          drawing
        )}
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
