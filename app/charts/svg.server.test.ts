import { describe, expect, it } from "vitest";
import { format } from "echarts/core";
import { tunedGustOption } from "./gust";
import { loadsOption } from "./loads";
import { chartSvg } from "./svg.server";
import { CHART_FONT } from "./theme";
import { DEMO_VN_POINTS, demoVnOption } from "./vn.fixture";

const y = [0, 2, 4, 6, 8.7];
const option = (scale: number) => loadsOption("shear", { y, max: y.map((v) => scale * (8.7 - v)), min: y.map((v) => -scale * (8.7 - v) / 3), caseId: "W1-A", caseValues: y.map((v) => scale * 0.8 * (8.7 - v)) }, { symbol: "kN", scale: (si) => si / 1000 }, "SI");
const texts = (svg: string) => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!.trim());
/** Where a text of the drawing is centred vertically (its translate, plus its own y; dominant-baseline central). */
const centreY = (m: RegExpMatchArray) => Number(/translate\([\d.]+ ([\d.]+)\)/.exec(m[0])![1]) + Number(/ y="([\d.-]+)"/.exec(m[0])?.[1] ?? 0);
const ids = (svg: string) => [...svg.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]!);

describe("a chart drawn on the server", () => {
  it("is an SVG of the page's option at the size asked for: its title, legend and axis names as text", () => {
    const svg = chartSvg(option(1000), { width: 404, height: 320 });
    expect(svg).toMatch(/^<svg width="404" height="320" [^>]*viewBox="0 0 404 320"/);
    const labels = texts(svg);
    expect(labels).toEqual(expect.arrayContaining(["Shear force", "Envelope max", "Envelope min", "Case W1-A", "Shear force [kN]", "Spanwise station y [m]"]));
    // The span axis ends at a round value (app/charts/theme.ts roundUp: 8.7 → 8.8), as the live chart's does.
    expect(labels).toContain("8.8");
  });

  it("sets its text in the app's face, as a family list CSS accepts", () => {
    const svg = chartSvg(option(1000), { width: 404, height: 320 });
    expect(svg).toContain("font-family:'Source Sans 3 Variable', sans-serif");
  });

  it("names its ids after its content: two different charts inlined in one page share none, the same chart drawn again keeps them", () => {
    const a = chartSvg(option(1000), { width: 404, height: 320 });
    const b = chartSvg(option(2000), { width: 404, height: 320 });
    expect(ids(a).length).toBeGreaterThan(0);
    expect(ids(a).filter((id) => ids(b).includes(id))).toEqual([]);
    // Every clip path used is defined in the same drawing.
    for (const svg of [a, b]) for (const m of svg.matchAll(/url\(#([^)]+)\)/g)) expect(ids(svg)).toContain(m[1]);
    expect(chartSvg(option(1000), { width: 404, height: 320 })).toBe(a);
  });

  it("is drawn again for another size or other data, never taken from a drawing of other content", () => {
    const small = chartSvg(option(1000), { width: 258, height: 320 });
    expect(small).toMatch(/^<svg width="258" height="320"/);
    const other = chartSvg(option(3000), { width: 258, height: 320 });
    expect(texts(other)).not.toEqual(texts(small));
  });

  it("writes text a user typed (a load case's id in the legend) as text, never as markup the page would run", () => {
    const y = [0, 4, 8.7];
    const id = `W1"><script>alert(1)</script><img src=x onerror=alert(2)>`;
    const svg = chartSvg(loadsOption("shear", { y, max: [3, 2, 0], min: [-1, -0.5, 0], caseId: id, caseValues: [2, 1, 0] }, { symbol: "kN", scale: (si) => si / 1000 }, "SI"), { width: 404, height: 320 });
    // Every "<" of the id is written as "&lt;": no element of it reaches the page, only its text.
    expect(svg).not.toMatch(/<script|<img/i);
    expect(svg).toContain("Case W1&quot;&gt;&lt;script&gt;alert(1)&lt;/script&gt;&lt;img src=x onerror=alert(2)&gt;</text>");
  });

  it("keeps its title above its legend: the two never share a line", () => {
    // ECharts 6 puts a title 15 px down unless told; the legend's row starts 22 px down (theme.ts).
    const svg = chartSvg(option(1000), { width: 404, height: 320 });
    const title = [...svg.matchAll(/<text[^>]*font-size:13px[^>]*>Shear force<\/text>/g)].map(centreY);
    const legend = [...svg.matchAll(/<text[^>]*font-size:11px[^>]*>(Envelope max|Envelope min|Case W1-A)<\/text>/g)].map(centreY);
    expect(title).toHaveLength(1);
    expect(legend).toHaveLength(3);
    // Text centres (dominant-baseline central): half the title's 13 px and half the legend's 11 px apart at least.
    for (const y of legend) expect(y - title[0]!).toBeGreaterThanOrEqual(6.5 + 5.5);
  });

  it("starts its plot below the legend's last row when the legend wraps in a narrow chart", () => {
    // Four items in a third of the column (258 px): three rows.
    const y = [0, 4, 8.7];
    const narrow = loadsOption("shear", { y, max: [3, 2, 0], min: [-1, -0.5, 0], caseId: "W2-roll-VC, loaded side", caseValues: [2, 1, 0], otherValues: [1, 0.5, 0] }, { symbol: "kN", scale: (si) => si / 1000 }, "SI");
    const svg = chartSvg(narrow, { width: 258, height: 320 });
    const legendCentres = [...svg.matchAll(/<text[^>]*font-size:11px[^>]*>[^<]+<\/text>/g)].map(centreY);
    expect(new Set(legendCentres.map(Math.round)).size).toBeGreaterThan(1);
    // The plot's top edge is its highest horizontal grid line.
    const gridTop = Math.min(...[...svg.matchAll(/<path d="M[\d.]+ ([\d.]+)L[\d.]+ \1" fill="none" pointer-events="visible" stroke="#e6eaf0"/g)].map((m) => Number(m[1])));
    // The y axis's top value is centred on that line (6 px above it): the legend's last row (11 px text) ends above that.
    expect(Math.max(...legendCentres) + 5.5).toBeLessThanOrEqual(gridTop - 6);
  });
});

describe("the V–n diagram drawn on the server", () => {
  it("names its points without one name covering another", () => {
    // The demo's kind of diagram (vn.fixture.ts): flaps-VF beside roll-VA, unsym-A on corner A.
    const option = demoVnOption();
    const svg = chartSvg(option, { width: 808, height: 320 });
    // Each point's name as drawn (10 px text): its box from the anchor, the alignment and ECharts' own measure of the text.
    const boxes = [...svg.matchAll(/<text ([^>]*font-size:10px[^>]*)>([^<]+)<\/text>/g)].map((m) => {
      const attrs = m[1]!;
      const [x, y] = /translate\(([\d.-]+) ([\d.-]+)\)/.exec(attrs)!.slice(1).map(Number) as [number, number];
      const dx = Number(/ x="([\d.-]+)"/.exec(attrs)?.[1] ?? 0);
      const dy = Number(/ y="([\d.-]+)"/.exec(attrs)?.[1] ?? 0);
      const w = format.getTextRect(m[2]!, `10px ${CHART_FONT}`).width;
      const anchor = /text-anchor="(\w+)"/.exec(attrs)?.[1] ?? "start";
      const left = x + dx - (anchor === "middle" ? w / 2 : anchor === "end" ? w : 0);
      return { name: m[2]!, left, right: left + w, top: y + dy - 5, bottom: y + dy + 5 };
    });
    expect(boxes.map((b) => b.name)).toEqual(expect.arrayContaining(["A", "D", "flaps-VF"]));
    // Every point but the 1-g stall is named, one name at most left out where it would cover another.
    expect(boxes.length).toBeGreaterThanOrEqual(DEMO_VN_POINTS.length - 2);
    const covered = boxes.flatMap((a, i) => boxes.slice(i + 1).filter((b) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom).map((b) => `${a.name} / ${b.name}`));
    expect(covered).toEqual([]);
  });
});

describe("the tuned gust's chart drawn on the server", () => {
  it("marks the critical gradient, as the report's figure does", () => {
    // A row per gradient: only what the chart draws (gradient, Δn, Pratt's Δn) matters here.
    const row = (gradient: number, deltaN: number) => ({ gradient, gradientChords: gradient / 1.6, uds: 15, k: 0.8, deltaN, prattDeltaN: deltaN * 0.95 });
    const rows = [row(9.1, 0.8), row(30, 1.1), row(60, 1.25), row(107, 1.05)];
    const option = tunedGustOption("Tuned gust", { massRatio: 20, prattKg: 0.7, rows, critical: rows[2]!, rule: "14 CFR 25.341(a)", method: "plunge" } as Parameters<typeof tunedGustOption>[1], { symbol: "m", fromSI: (m) => m });
    const svg = chartSvg(option, { width: 388, height: 320 });
    expect(svg).toMatch(/>critical<\/text>/);
  });
});

