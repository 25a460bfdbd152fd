import { describe, expect, it } from "vitest";
import { loadsOption } from "./loads";
import { chartSvg } from "./svg.server";

const y = [0, 2, 4, 6, 8.7];
const option = (scale: number) => loadsOption("shear", { y, max: y.map((v) => scale * (8.7 - v)), min: y.map((v) => -scale * (8.7 - v) / 3), caseId: "W1-A", caseValues: y.map((v) => scale * 0.8 * (8.7 - v)) }, { symbol: "kN", scale: (si) => si / 1000 }, "SI");
const texts = (svg: string) => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!.trim());
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
});
