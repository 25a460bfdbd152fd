import { describe, expect, it } from "vitest";
import { vnOption } from "./vn";
import { DEMO_VN_POINTS, demoVnOption } from "./vn.fixture";

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

describe("the V–n diagram shows every generated point", () => {
  it("puts every point but the 1-g stall in a scatter (the rolling ones in their own), and draws the flaps-extended stall line to flaps-A, n = 2.0 to VF and the VF gust lines", () => {
    const points = DEMO_VN_POINTS;
    const option = demoVnOption();
    const scatters = option.series.filter((s) => s.type === "scatter") as unknown as { name: string; symbol?: string; data: { name: string; value: [number, number] }[] }[];
    expect(scatters.flatMap((s) => s.data.map((d) => d.name.split(":")[0]))).toEqual(points.slice(1).map((p) => p.name));
    // The rolling conditions are diamonds of their own, so unsym-A on corner A is still seen and named.
    const rolling = scatters.find((s) => s.name === "Rolling conditions")!;
    expect(rolling.symbol).toBe("diamond");
    expect(rolling.data.map((d) => [d.name.split(":")[0], ...d.value])).toEqual([["unsym-A", 89, 3.1], ["roll-VA", 89, 2.0667], ["roll-VC", 112, 2.0667], ["roll-VD", 155, 2.0667]]);
    const byName = Object.fromEntries(option.series.map((s) => [s.name, s as unknown as { data: [number, number][] }]));
    const flaps = byName["Flaps extended"]!.data;
    // The flapped stall line n = ½ρ0V²S·CLmax,F/W (common practice, no source) ends at flaps-A, then n = 2.0 to VF.
    expect(flaps[0]).toEqual([0, 0]);
    expect(flaps.at(-2)).toEqual([59.2, 2]);
    expect(flaps.at(-1)).toEqual([77, 2]);
    expect(flaps.at(-3)![1]).toBeCloseTo((0.5 * 1.225 * 59.2 ** 2 * 27.6 * 2.1) / 62272, 12);
    expect(byName["Flaps-extended gust lines"]!.data.filter((p) => !Number.isNaN(p[0]))).toEqual([[0, 1], [77, 1.8], [0, 1], [77, 0.2]]);
  });
});
