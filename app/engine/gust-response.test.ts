import { describe, expect, it } from "vitest";
import { UNITS } from "./certification";
import { EngineError } from "./errors";
import { KUSSNER_JONES, QUASI_STEADY, WAGNER_JONES, indicial, plungeGustResponse, sharpEdgedIncrement, tunedDiscreteGust } from "./gust-response";

// Pratt–Walker gust factor K_g = 0.88μ/(5.3 + μ): NACA TN 2964 (1953) and NACA Report 1206 (1954), the
// formula as written in 14 CFR 23.341(c) [V, REFERENCES 6.5]. The factor is a fit to the peak response of a
// rigid aircraft in plunge to a one-minus-cosine gust 25 chords long (gradient 12.5 chords) with unsteady
// lift [25-chord length: M, REFERENCES §10]. Our model is that one, so it must reproduce the fit.
const pratt = (mu: number) => (0.88 * mu) / (5.3 + mu);
const H_12_5_CHORDS = 25; // semichords

describe("rigid aircraft in plunge through a one-minus-cosine gust 25 chords long", () => {
  it.each([10, 20, 50, 100, 200, 500])("μ = %d: the peak factor matches Pratt's K_g within 0.5 % (NACA Report 1206)", (mu) => {
    const r = plungeGustResponse({ massRatio: mu, gradientSemichords: H_12_5_CHORDS });
    expect(Math.abs(r.peak / pratt(mu) - 1)).toBeLessThan(0.005);
  });

  it.each([3, 5])("μ = %d, at the light end of the fit (where it is least close): within 3.5 % of K_g", (mu) => {
    const r = plungeGustResponse({ massRatio: mu, gradientSemichords: H_12_5_CHORDS });
    expect(Math.abs(r.peak / pratt(mu) - 1)).toBeLessThan(0.035);
  });

  it("as μ grows the factor rises to the unalleviated value: 1 with quasi-steady lift (the sharp-edged formula), and with lift build-up the peak lift of a wing held still in the gust, ≈ 0.88 as Pratt's fit", () => {
    const quasi = [10, 100, 1e3, 1e5].map((mu) => plungeGustResponse({ massRatio: mu, gradientSemichords: H_12_5_CHORDS, kussner: QUASI_STEADY, wagner: QUASI_STEADY }).peak);
    for (let i = 1; i < quasi.length; i++) expect(quasi[i]).toBeGreaterThan(quasi[i - 1]);
    expect(quasi[3]).toBeCloseTo(1, 3);
    // A wing held still: peak over s of ∫₀ˢ ψ(s−σ)·g′(σ) dσ, evaluated here by direct trapezoid quadrature
    // (independent of the engine's state-space integration).
    const H = H_12_5_CHORDS;
    let still = 0;
    const ds = 0.02;
    for (let s = 0.25; s <= 2 * H + 10; s += 0.25) {
      let acc = 0;
      const n = Math.ceil(Math.min(s, 2 * H) / ds);
      for (let k = 0; k <= n; k++) {
        const sig = (k * Math.min(s, 2 * H)) / n;
        const w = k === 0 || k === n ? 0.5 : 1;
        acc += w * indicial(KUSSNER_JONES, s - sig) * ((0.5 * Math.PI) / H) * Math.sin((Math.PI * sig) / H);
      }
      still = Math.max(still, (acc * Math.min(s, 2 * H)) / n);
    }
    const heavy = plungeGustResponse({ massRatio: 1e6, gradientSemichords: H }).peak;
    expect(heavy).toBeCloseTo(still, 3);
    expect(Math.abs(heavy / 0.88 - 1)).toBeLessThan(0.005);
    const rising = [10, 100, 1e3, 1e6].map((mu) => plungeGustResponse({ massRatio: mu, gradientSemichords: H }).peak);
    for (let i = 1; i < rising.length; i++) expect(rising[i]).toBeGreaterThan(rising[i - 1]);
  });

  it("quasi-steady lift reduces the motion to a first-order lag, reproduced to 1e-8 against its closed form", () => {
    // K = g − v, v′ = (g − v)/τ, τ = 2μ, g = ½(1 − cos ωs): v = ½(1 − e^(−s/τ)) − ½[cos ωs + ωτ sin ωs − e^(−s/τ)]/(1 + ω²τ²)
    // (linear ODE with constant coefficients, solved by hand; no source needed).
    const mu = 12;
    const H = 20;
    const tau = 2 * mu;
    const w = Math.PI / H;
    const r = plungeGustResponse({ massRatio: mu, gradientSemichords: H, kussner: QUASI_STEADY, wagner: QUASI_STEADY, history: true });
    for (const smp of r.history.filter((x) => x.s > 0 && x.s < 2 * H)) {
      const e = Math.exp(-smp.s / tau);
      const v = 0.5 * (1 - e) - (0.5 * (Math.cos(w * smp.s) + w * tau * Math.sin(w * smp.s) - e)) / (1 + w * w * tau * tau);
      expect(smp.k).toBeCloseTo(smp.gust - v, 8);
    }
  });

  it("the indicial functions start where the theory puts them: Wagner φ(0) = 0.5, Küssner ψ(0) = 0.08, both → 1", () => {
    // φ(0) = ½ (Wagner 1925) and ψ(0) = 0 (Küssner 1936) exactly; Jones's approximation gives ψ(0) = 1 − 0.92 = 0.08 [M].
    expect(indicial(WAGNER_JONES, 0)).toBeCloseTo(0.5, 12);
    expect(indicial(KUSSNER_JONES, 0)).toBeCloseTo(0.08, 12);
    expect(indicial(WAGNER_JONES, 1e4)).toBeCloseTo(1, 12);
    expect(indicial(KUSSNER_JONES, 1e4)).toBeCloseTo(1, 12);
  });

  it("refuses a non-positive mass ratio", () => {
    expect(() => plungeGustResponse({ massRatio: 0, gradientSemichords: 25 })).toThrow(EngineError);
  });
});

describe("tuned discrete gust of 14 CFR 25.341(a)", () => {
  // REFERENCES 6.5 worked example, SI at sea level [C]: W/S = 1596.009 N/m², c̄ = 1.524 m, a = 5 /rad,
  // V_e = 102.8889 m/s, U = 15.240 m/s → μ = 34.8701, K_g = 0.76389, Δn = 2.29841 (Pratt, SI form).
  const base = { veas: 102.8889, density: 1.225, wingLoading: 1596.009, meanChord: 1.524, liftSlope: 5, uRef: 15.24, fg: 1 };

  it("Pratt's Δn at H = 350 ft (U_ds = U_ref·F_g) is the worked example's 2.29841, μ = 34.8701, K_g = 0.76389", () => {
    const r = tunedDiscreteGust({ ...base, gradients: [350 * UNITS.ftToM] });
    expect(r.massRatio).toBeCloseTo(34.8701, 3);
    expect(r.prattKg).toBeCloseTo(0.76389, 5);
    expect(r.rows[0].uds).toBeCloseTo(15.24, 10);
    expect(r.rows[0].prattDeltaN).toBeCloseTo(2.29841, 4);
    expect(sharpEdgedIncrement(base.veas, 5, 15.24, base.wingLoading) * r.prattKg).toBeCloseTo(2.29841, 4);
  });

  it("U_ds = U_ref·F_g·(H/350 ft)^(1/6) (25.341(a)(4) [M]); at the gradient of 12.5 chords the plunge response equals Pratt's within 1 %", () => {
    const H = 12.5 * base.meanChord;
    const r = tunedDiscreteGust({ ...base, gradients: [H] });
    expect(r.rows[0].uds).toBeCloseTo(15.24 * Math.pow(H / (350 * 0.3048), 1 / 6), 10);
    expect(Math.abs(r.rows[0].deltaN / r.rows[0].prattDeltaN - 1)).toBeLessThan(0.01);
  });

  it("searches 30–350 ft and names the critical gradient: the largest Δn of all rows, inside the range", () => {
    const r = tunedDiscreteGust(base);
    expect(r.rows.length).toBeGreaterThanOrEqual(33);
    for (const row of r.rows) expect(row.deltaN).toBeLessThanOrEqual(r.critical.deltaN);
    expect(r.critical.gradient).toBeGreaterThanOrEqual(30 * 0.3048 - 1e-9);
    expect(r.critical.gradient).toBeLessThanOrEqual(350 * 0.3048 + 1e-9);
    expect(r.rule).toBe("14 CFR 25.341(a)");
  });

  it("refuses a gradient outside 30–350 ft, naming it", () => {
    expect(() => tunedDiscreteGust({ ...base, gradients: [5] })).toThrow(/gradients\[0\]/);
  });
});
