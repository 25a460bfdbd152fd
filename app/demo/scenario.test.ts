import { describe, expect, it } from "vitest";
import { basisChecks } from "~/services/basis.server";
import { DEMO_CASE_INPUTS } from "./scenario";

/*
 * The released demo case must pass the rules of its own basis (a reviewer's first look). The
 * expectations are computed here from the regulations' formulas, never from the app:
 * - 14 CFR 23.337(a) (before Amendment 23-64), commuter: n ≥ 2.1 + 24 000/(W + 10 000), W in lb
 *   (REFERENCES.md §6.2; the paragraph text is from memory there, its table values verified).
 * - 14 CFR 23.335(a), (b) (REFERENCES.md §6.3, verified text): V_C ≥ 33·√(W/S) kt, the factor falling
 *   linearly from 33 at 20 psf to 28.6 at 100 psf; V_D ≥ 1.25·V_C and ≥ 1.40·V_C,min (commuter),
 *   the factor falling linearly to 1.35 at 100 psf.
 * - 14 CFR 23.335(c): V_A ≥ V_S1·√n; V_S1 = √(2W/(ρ0·S·C_Lmax)) (REFERENCES.md §6.6).
 * Exact conversions (NIST SP 811): 1 lb = 0.45359237 kg, 1 kt = 1852/3600 m/s, 1 psf = 47.880259 N/m²;
 * g0 = 9.80665 m/s², ρ0 = 1.225 kg/m³ (ISA sea level, ICAO Doc 7488).
 */
const G0 = 9.80665;
const RHO0 = 1.225;
const KT = 1852 / 3600;
const LB = 0.45359237;
const PSF = 47.880259;

describe("the demo basis meets its own rules", () => {
  const b = DEMO_CASE_INPUTS.basis;
  const weightN = b.mtow * G0;
  const weightLb = b.mtow / LB;
  const wsPsf = weightN / b.wingArea / PSF;
  const n1 = Math.min(3.8, 2.1 + 24_000 / (weightLb + 10_000));
  const vcFactor = wsPsf <= 20 ? 33 : 33 - ((33 - 28.6) * (Math.min(wsPsf, 100) - 20)) / 80;
  const vdFactor = wsPsf <= 20 ? 1.4 : 1.4 - ((1.4 - 1.35) * (Math.min(wsPsf, 100) - 20)) / 80;
  const vcMin = vcFactor * Math.sqrt(wsPsf) * KT;

  it("is a commuter aeroplane of the pre-amendment-64 rules, as its regulations line says", () => {
    expect(b.category).toBe("part23-commuter");
    expect(b.regulations).toMatch(/23\.335/);
  });

  it("types the 1-g stall speed that its CLmax gives, within 1 %", () => {
    const vs1 = Math.sqrt((2 * weightN) / (RHO0 * b.wingArea * b.clMax));
    expect(Math.abs(b.vs1 - vs1) / vs1).toBeLessThan(0.01);
  });

  it("has VA at least VS1·√n (14 CFR 23.335(c))", () => {
    expect(b.va).toBeGreaterThanOrEqual(b.vs1 * Math.sqrt(n1));
  });

  it("has VC at least the minimum of 14 CFR 23.335(a)", () => {
    expect(b.vc).toBeGreaterThanOrEqual(vcMin);
  });

  it("has VD at least 1.25·VC and the minimum of 14 CFR 23.335(b)", () => {
    expect(b.vd).toBeGreaterThanOrEqual(1.25 * b.vc);
    expect(b.vd).toBeGreaterThanOrEqual(vdFactor * vcMin);
  });

  it("passes every check the basis page shows", () => {
    const failed = basisChecks({ ...b, altitudes: [...b.altitudes] }).filter((c) => c.ok === false);
    expect(failed).toEqual([]);
  });
});
