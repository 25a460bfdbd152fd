import { describe, expect, it } from "vitest";
import { addToEnvelope, createEnvelope, envelopeRows } from "./envelope";

describe("envelope accumulator", () => {
  it("keeps the earlier case on ties and counts cases", () => {
    const env = createEnvelope([0, 2]);
    addToEnvelope(env, "first", { shear: [1, 1], bending: [2, 2], torsion: [3, 3] });
    addToEnvelope(env, "second", { shear: [1, 0], bending: [2, 5], torsion: [3, -1] });
    const r = envelopeRows(env);
    expect(env.count).toBe(2);
    expect(r[0]).toMatchObject({ y: 0, shearMax: 1, shearMaxCase: "first", shearMinCase: "first" });
    expect(r[1]).toMatchObject({ y: 2, shearMin: 0, shearMinCase: "second", bendingMax: 5, bendingMaxCase: "second", torsionMin: -1 });
  });
});
