import { describe, expect, it } from "vitest";
import { vnOption } from "./vn";

describe("the V–n diagram names its points without covering one name with another", () => {
  it("names a corner above (below where nz < 0) and the gust point beside it at the same speed to its right", () => {
    // Corner A and the V_B gust point a metre per second apart, as on the demo's diagram.
    const points = [
      { name: "A", veas: 89, nz: 3.1, rule: "corner" },
      { name: "gust+VB", veas: 88, nz: 2.9, rule: "gust" },
      { name: "G", veas: 112, nz: -1.24, rule: "corner" },
      { name: "gust-VC", veas: 112, nz: -0.9, rule: "gust" },
      { name: "tuned+VC", veas: 112, nz: 2.8, rule: "tuned gust" },
    ];
    const option = vnOption("V–n", points, { area: 16, clMax: 1.6, clMaxNegative: -1, weightN: 62000 }, { symbol: "m/s", fromSI: (v) => v });
    const scatter = option.series.find((s) => s.type === "scatter") as unknown as { data: { name: string; label: { position: string } }[]; labelLayout: object };
    const position = Object.fromEntries(scatter.data.map((d) => [d.name.split(":")[0], d.label.position]));
    expect(position).toEqual({ A: "top", "gust+VB": "right", G: "bottom", "gust-VC": "right", "tuned+VC": "right" });
    expect(scatter.labelLayout).toEqual({ moveOverlap: "shiftY", hideOverlap: true });
  });
});
