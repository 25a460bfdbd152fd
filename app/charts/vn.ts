import type { VnPoint } from "~/engine";
import { fromSI, unitSymbol, type UnitSystem } from "~/domain/units";
import { axis, baseOption, line, SERIES_STYLE, type ChartOption } from "./theme";

/**
 * The V–n diagram of one weight and altitude: the stall lines (n = ½ρ0V²S·CLmax/W), the manoeuvre
 * limits between their corner points, the gust lines from (0, 1) to the gust points (V_B, V_C, V_D; for
 * Part 25 the tuned gusts beside Pratt's for comparison), the flaps-extended points where given, and
 * every generated point labelled with its name (its rule in the tooltip); the rolling and unsymmetrical
 * conditions as diamonds of their own, named to their left (unsym-A lies on corner A).
 */
export function vnOption(title: string, points: VnPoint[], stall: { area: number; clMax: number; clMaxNegative: number; weightN: number; clMaxFlaps?: number }, speedUnit: { symbol: string; fromSI: (v: number) => number }) {
  const p = Object.fromEntries(points.map((pt) => [pt.name, pt]));
  const s = (v: number) => speedUnit.fromSI(v);
  const stallLine = (cl: number, toV: number): [number, number][] => {
    const out: [number, number][] = [];
    for (let i = 0; i <= 40; i++) {
      const v = (toV * i) / 40;
      out.push([s(v), (0.5 * 1.225 * v * v * stall.area * cl) / stall.weightN]);
    }
    return out;
  };
  const pts = (names: string[]): [number, number][] => names.filter((n) => p[n]).map((n) => [s(p[n]!.veas), p[n]!.nz]);
  const gust = (name: string): [number, number][] => (p[name] ? [[0, 1], [s(p[name]!.veas), p[name]!.nz]] : []);
  // Each gust line from (0, 1) to its point, the lines kept apart by a gap.
  const gustLines = (names: string[]): [number, number][] => names.filter((n) => p[n]).flatMap((n, i) => [...(i ? [[NaN, NaN] as [number, number]] : []), ...gust(n)]);
  return {
    ...baseOption(title),
    xAxis: axis(`Equivalent airspeed [${speedUnit.symbol}]`, { min: 0 }),
    yAxis: axis("Load factor nz [–]"),
    tooltip: { trigger: "item" as const },
    series: [
      line("Positive stall line", stallLine(stall.clMax, p.A?.veas ?? 0), SERIES_STYLE["prandtl-glauert"]),
      line("Negative stall line", stallLine(stall.clMaxNegative, p.H?.veas ?? 0), SERIES_STYLE["prandtl-glauert"]),
      line("Manoeuvre envelope", pts(["A", "D", "E", "F", "H"]), SERIES_STYLE.solver),
      line("Gust lines" + (p["tuned+VC"] ? " (Pratt, for comparison)" : ""), gustLines(["gust+VB", "gust-VB", "gust+VC", "gust-VC", "gust+VD", "gust-VD"]), SERIES_STYLE["karman-tsien"], { connectNulls: false }),
      ...(p["tuned+VC"] ? [line("Tuned gusts (rigid plunge)", gustLines(["tuned+VB", "tuned-VB", "tuned+VC", "tuned-VC", "tuned+VD", "tuned-VD"]), SERIES_STYLE.dynamicGust, { connectNulls: false })] : []),
      ...(p["flaps-VF"]
        ? [
            // The flapped stall line up to flaps-A, then n = 2.0 to V_F, and the V_F gust lines.
            line("Flaps extended", [...(stall.clMaxFlaps ? stallLine(stall.clMaxFlaps, p["flaps-A"]?.veas ?? 0) : []), ...pts(["flaps-A", "flaps-VF"])], SERIES_STYLE.laitone),
            line("Flaps-extended gust lines", gustLines(["flaps-gust+VF", "flaps-gust-VF"]), SERIES_STYLE.laitone, { connectNulls: false }),
          ]
        : []),
      {
        type: "scatter" as const,
        name: "Load cases",
        // A gust point lies beside a corner of the manoeuvre envelope at the same speed: corners are
        // named above (below, where nz < 0) and gust points to their right, so no name covers another.
        data: points
          .filter((pt) => pt.name !== "S" && !pt.roll)
          .map((pt) => ({ value: [s(pt.veas), pt.nz], name: `${pt.name}: ${pt.rule}`, label: { position: /^(gust|tuned|flaps)/.test(pt.name) ? ("right" as const) : pt.nz < 0 ? ("bottom" as const) : ("top" as const) } })),
        itemStyle: { color: SERIES_STYLE.solver.color },
        label: { show: true, formatter: (d: { name: string }) => d.name.split(":")[0], position: "top" as const, fontSize: 10 },
        // Names still too close (a tuned gust beside Pratt's) move apart; one that still overlaps is left to its tooltip.
        labelLayout: { moveOverlap: "shiftY" as const, hideOverlap: true },
        tooltip: { formatter: (d: { name: string; value?: unknown }) => {
          const [v, n] = d.value as [number, number];
          return `${d.name}<br/>V = ${v.toFixed(1)} ${speedUnit.symbol}, n = ${n.toFixed(3)}`;
        } },
      },
      ...(points.some((pt) => pt.roll)
        ? [
            {
              type: "scatter" as const,
              name: SERIES_STYLE.rolling.label,
              symbol: "diamond",
              symbolSize: 10,
              data: points
                .filter((pt) => pt.roll)
                .map((pt) => ({ value: [s(pt.veas), pt.nz], name: `${pt.name}: ${pt.rule} (other side ${(pt.roll!.fraction * 100).toFixed(0)} % of the airload, aileron ${pt.roll!.aileron.toFixed(2)}°)` })),
              itemStyle: { color: SERIES_STYLE.rolling.color },
              label: { show: true, formatter: (d: { name: string }) => d.name.split(":")[0], position: "left" as const, fontSize: 10 },
              // Weighed against the other points' names too: a name that would cover one is not drawn (the tooltip and the page's table still give it).
              labelLayout: { moveOverlap: "shiftY" as const, hideOverlap: true },
              tooltip: { formatter: (d: { name: string; value?: unknown }) => {
                const [v, n] = d.value as [number, number];
                return `${d.name}<br/>V = ${v.toFixed(1)} ${speedUnit.symbol}, n = ${n.toFixed(3)}`;
              } },
            },
          ]
        : []),
    ],
  } satisfies ChartOption;
}

const G0 = 9.80665;

/** The V–n diagram of one set of the envelope page (its weight and altitude), in the speed unit shown: the page and the server draw this one option. */
export function vnSetOption(set: { label: string; points: VnPoint[]; weightKg: number; flaps?: { clMax: number } }, stall: { area: number; clMax: number; clMaxNegative: number }, units: UnitSystem) {
  return vnOption(`V–n diagram, ${set.label}`, set.points, { ...stall, weightN: set.weightKg * G0, clMaxFlaps: set.flaps?.clMax }, { symbol: unitSymbol(units, "speed"), fromSI: (v) => fromSI(units, "speed", v) });
}
