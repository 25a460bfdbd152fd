import type { Role } from "~/domain/vocabulary";

/**
 * The invented demo scenario: Kelvard Fenlow Aircraft certifying its KF-60 Tern twin-turboprop commuter,
 * and an unrelated organisation, Northmoor Aerostructures, whose user shows that organisations are
 * isolated from each other. These passwords exist only for local demonstration.
 */
export const DEMO_ORGANISATIONS = {
  kelvard: { slug: "kelvard-fenlow", name: "Kelvard Fenlow Aircraft" },
  northmoor: { slug: "northmoor-aerostructures", name: "Northmoor Aerostructures" },
} as const;

export interface DemoUser {
  label: "engineer" | "checker" | "quality" | "admin" | "outsider";
  name: string;
  email: string;
  password: string;
  organisation: keyof typeof DEMO_ORGANISATIONS;
  roles: Role[];
}

export const DEMO_USERS: readonly DemoUser[] = [
  { label: "engineer", name: "Erin Hale", email: "erin.hale@kelvard-fenlow.example", password: "tern-engineer-2026", organisation: "kelvard", roles: ["engineer"] },
  { label: "checker", name: "Marek Oduya", email: "marek.oduya@kelvard-fenlow.example", password: "tern-checker-2026", organisation: "kelvard", roles: ["checker"] },
  { label: "quality", name: "Priya Lindqvist", email: "priya.lindqvist@kelvard-fenlow.example", password: "tern-quality-2026", organisation: "kelvard", roles: ["quality"] },
  { label: "admin", name: "Sam Okafor", email: "sam.okafor@kelvard-fenlow.example", password: "tern-admin-2026", organisation: "kelvard", roles: ["admin"] },
  { label: "outsider", name: "Jonas Reyes", email: "jonas.reyes@northmoor-aero.example", password: "skua-engineer-2026", organisation: "northmoor", roles: ["engineer", "admin"] },
];

export const DEMO_PROGRAMMES = [
  {
    organisation: "kelvard",
    code: "KF60",
    name: "KF-60 Tern type certification",
    aircraft: "KF-60 Tern, twin-turboprop commuter, 6 350 kg MTOW",
    description: "Wing loads for the initial type certificate.",
  },
  {
    organisation: "northmoor",
    code: "NA14",
    name: "NA-14 Skua wing redesign",
    aircraft: "NA-14 Skua, single-engine utility aeroplane",
    description: "Northmoor's own programme; Kelvard users must never see it.",
  },
] as const;

export const DEMO_CASES = [
  { programme: "KF60", reference: "TN-WL-001", title: "Wing loads, initial type certificate", description: "Manoeuvre and gust envelope of the KF-60 Tern wing, flaps up and take-off flaps." },
  { programme: "KF60", reference: "TN-WL-002", title: "Wing loads, increased MTOW study", description: "Empty case: the blank path for a new study." },
  { programme: "NA14", reference: "SK-L-07", title: "Outer wing loads", description: "Northmoor's case." },
] as const;

/**
 * Inputs of the demo case TN-WL-001, invented for the KF-60 Tern: a cranked, tapered wing of
 * 17.4 m span. SI units; the load cases are generated from the basis at seed time.
 */
export const DEMO_CASE_INPUTS = {
  basis: {
    units: "SI",
    category: "part23-commuter",
    regulations: "14 CFR 23.301, 23.303, 23.321, 23.333, 23.335, 23.337, 23.341 (amendment level before 23-64), as agreed in the KF-60 certification basis (demo)",
    mtow: 6350,
    mzfw: 5900,
    minWeight: 4300,
    vs1: 50.4,
    va: 89,
    vb: 88,
    vc: 112,
    vd: 155,
    altitudes: [0, 3000, 6000],
    wingArea: 27.6,
    clMax: 1.45,
    clMaxNegative: -0.9,
    // Take-off flap: VF above the 23.345(b) minimum, the greater of 1.4·VS and 1.8·VSF (VSF 41.9 m/s at MTOW with CLmax 2.1).
    vf: 77,
    clMaxFlaps: 2.1,
  },
  planform: {
    stations: [
      { y: 0, xLe: 0, chord: 2.1, twist: 0 },
      { y: 3.2, xLe: 0.12, chord: 1.8, twist: -1 },
      { y: 8.7, xLe: 0.55, chord: 0.95, twist: -3 },
    ],
    axisRoot: 0.35,
    axisTip: 0.35,
  },
  sections: {
    rows: [
      { y: 0, a0: 6.05, alphaL0: -2.2, cmAc: -0.055, clMax: 1.72, cpMin: -0.62 },
      { y: 3.2, a0: 6.0, alphaL0: -2.0, cmAc: -0.05, clMax: 1.66, cpMin: -0.6 },
      { y: 8.7, a0: 5.9, alphaL0: -1.6, cmAc: -0.04, clMax: 1.5, cpMin: -0.55 },
    ],
    source: { kind: "typed" },
    tables: [],
    /** Single-slotted inboard flap at its take-off setting (invented), from the nacelle fairing to the aileron. */
    flaps: { yFrom: 0.6, yTo: 5.1, dAlphaL0: -5.5, dCmAc: -0.1, clMax: 2.2 },
    /**
     * Plain aileron outboard of the flap (invented): about a quarter of the chord, Δcl 0.048 per degree (a0·τ/57.3
     * with τ near 0.46), the simplified Δcm of 23.349 (−0.01 per degree) and 17° down at VA.
     */
    aileron: { yFrom: 5.4, yTo: 8.2, dClPerDeg: 0.048, dCmPerDeg: -0.01, deltaAtVa: 17 },
  },
  method: { compressibility: "prandtl-glauert", spanwise: "vortex-lattice", stations: 40 },
  /**
   * What one KF-60 semispan carries (invented): the turboprop and its nacelle ahead of the wing, the main
   * gear retracting into the nacelle, and two integral tanks; the aircraft's mass states with weight and CG.
   */
  masses: {
    structureKg: 310,
    items: [
      { id: "engine", label: "Turboprop, propeller and nacelle", kg: 290, x: -0.55, y: 2.6 },
      { id: "main-gear", label: "Main landing gear, retracted into the nacelle", kg: 95, x: 0.9, y: 2.6 },
      { id: "tank-inner", label: "Inner integral tank, full", kg: 260, x: 0.75, yFrom: 0.5, yTo: 2.3 },
      { id: "tank-outer", label: "Outer integral tank, full", kg: 320, x: 0.6, yFrom: 3.0, yTo: 6.2 },
    ],
    massCases: [
      { id: "MTOW-full", label: "Take-off weight, full wing tanks", weight: 6350, cg: 0.28, fill: {} },
      { id: "MTOW-MZFW", label: "Take-off weight at the zero-fuel limit: 450 kg of fuel, inner tanks first", weight: 6350, cg: 0.3, fill: { "tank-inner": 0.865, "tank-outer": 0 } },
      { id: "MZFW", label: "Zero-fuel weight, tanks empty", weight: 5900, cg: 0.24, fill: { "tank-inner": 0, "tank-outer": 0 } },
      { id: "MIN-reserve", label: "Minimum design weight, reserve fuel in the inner tanks", weight: 4300, cg: 0.22, fill: { "tank-inner": 0.3, "tank-outer": 0 } },
    ],
    balance: { cmBody: -0.018, tailArm: 6.4 },
    source: { kind: "typed" },
  },
  loads: { notes: "Demo notes: the envelope covers the four mass cases of the masses step at three altitudes; the critical case of each load is named in the envelope table with its mass case." },
  justification: "Demo disposition: the case lies on the stall line, where local clmax near the tip is reached by definition; kept so that the envelope covers the stall boundary.",
} as const;
