/**
 * The method statement: the published methods behind every result and where they stop being
 * valid. One text for the method page and the PDF report (written without characters the report's
 * fonts lack, such as the radical sign).
 */
export const METHOD_STATEMENT: readonly { title: string; body: string[] }[] = [
  {
    title: "Atmosphere and speeds",
    body: [
      "International Standard Atmosphere (ICAO Doc 7488; U.S. Standard Atmosphere 1976), geopotential altitude 0–32 km: troposphere to 11 km, isothermal layer to 20 km, then +1 K/km. Altitudes outside are refused, never extrapolated.",
      "Dynamic pressure q = 0.7·p·M²; equivalent airspeed EAS = TAS·σ^½. Design speeds and gusts are equivalent airspeeds.",
    ],
  },
  {
    title: "Compressibility of the sections",
    body: [
      "Prandtl–Glauert (Glauert 1928): Cp = Cp0/β, β = (1 − M²)^½. Kármán–Tsien (Tsien 1939; von Kármán 1941) and Laitone (1951) as published. By default the section lift slope and cm are scaled by each rule's Cp/Cp0 at the section's incompressible minimum Cp (Prandtl–Glauert's 1/β where no Cp,min is given). Where a section's incompressible chordwise pressure distribution is given at two or more angles, the rule is instead applied point by point over it and the corrected distribution integrated: the slope, zero-lift angle and cm follow from lines fitted over those angles.",
      "Critical pressure coefficient Cp* from the isentropic relations, γ = 1.4 (NACA Report 1135). Each section's critical Mach number is where its corrected minimum Cp reaches Cp*, found numerically at the first crossing. Where the section data give Cp,min against angle of attack, it is read at each case's own section lift, station by station; where only one Cp,min is given, it holds at the lift it was taken at (stated, or else taken as a cruise-like cl of 0.4), and cases far from that lift are flagged.",
      "The critical Mach number is the conservative value of the unswept sections. Simple sweep theory (the section value over the cosine of the quarter-chord sweep) is shown beside it for information only: it is optimistic and decides nothing.",
      "Validity: the rules hold only for subsonic flow below the critical Mach number. A case at or above the lowest critical Mach number on the span is computed, marked supercritical and flagged; Mach 1 and above is refused.",
    ],
  },
  {
    title: "Spanwise lift distribution",
    body: [
      "Lifting line (Glauert's Fourier series) for wings of small sweep: it does not model sweep and is refused beyond 15° of quarter-chord sweep. Vortex lattice (horseshoe vortices on the quarter-chord line, control points at three-quarter chord, cosine spacing, symmetry) for swept, tapered and cranked wings; its number of spanwise strips is part of the case, and every result states how much it moves when the strips are halved (the lattice converges at first order, so that is also the estimated error left).",
      "Compressibility in the spanwise solve by the Prandtl–Glauert / Göthert transformation (NACA TM 1105): the planform is stretched streamwise by 1/β and solved incompressibly.",
      "Superposition: at each Mach number the basic (zero-lift) and additional (per unit CL) distributions are solved once and combined for every case, which is exact for the linear theory.",
      "Schrenk's approximation (NACA TM 948) is shown beside the solver as the customary cross-check: the mean of the planform chord and an ellipse of equal area and span.",
    ],
  },
  {
    title: "Load cases",
    body: [
      "Manoeuvre limit load factors, stall lines and design speeds per the category chosen in the basis (14 CFR 25.333/25.335/25.337, or 23.333/23.335/23.337 before amendment 23-64), for each mass case (its weight) or, without mass cases, for MTOW, MZFW and the minimum design weight. Gust load factors by the Pratt formula (NACA TN 2964) with the alleviation factor and mass ratio at the design gust velocities for VB (commuters), VC and VD, each with the wing's lift slope at that speed's Mach number.",
      "Transport aeroplanes: the gust cases come from the tuned discrete gust of 14 CFR 25.341(a): one-minus-cosine gusts of gradient 30 to 350 ft with U_ds = U_ref·F_g·(H/350)^(1/6) on a rigid aircraft free only to plunge, with the lift built up by Küssner's and Wagner's functions (R. T. Jones's exponential approximations, NACA Report 681), the critical gradient being the one of largest load factor; Pratt's formula is shown beside it. F_g is 1 unless MLW and Z_mo are given. The rigid model leaves out the flexibility of the structure, the pitching of the aircraft and the tail's own lift; the dynamic analysis the authority accepts governs.",
    ],
  },
  {
    title: "Shear, bending and torsion",
    body: [
      "Running lift l(y) = q·c·cl per semispan; inertia relief from the semispan structural mass spread in proportion to chord, and from each mass item (point masses such as engines and gear, masses spread over a span range such as fuel) scaled by the case's mass case, times nz·g; an item off the reference axis adds torsion. Trimmed cases put nz·W less the balancing tail load on the wing; the tail load is typed, or taken from pitching-moment equilibrium about the mass case's centre of gravity with the wing's own aerodynamic centre and moment, a wing–body moment increment and the tail arm (steady flight, no pitch acceleration; gust cases balanced at 1 g). Shear, bending moment and torsion are integrated from the tip inward; the envelope is the maximum and minimum at each station with the case that gives it.",
      "Bending and torsion are resolved about the reference axis: the wing is cut at streamwise stations, the moment of all loads outboard of a cut is taken about the axis point at that station, and resolved into its component along the axis (torsion, nose up positive) and about the in-plane normal to the axis (bending, tip up positive). On an unswept axis these are the streamwise bending and pitching moments.",
      "Cases given by angle of attack carry no inertia relief because their load factor is not known.",
    ],
  },
];

/** What a result says it used (`spanwright.result/1` `method`), as the pages and the report put it in words. */
export interface MethodUsedInput {
  spanwise: "vortex-lattice" | "lifting-line";
  strips: number | null;
  terms: number | null;
  stations: number;
  convergence: { halfResolution: number; clAlpha: number; rootBending: number; loading: number };
  sectionScaling: "prandtl-glauert" | "at-cp-min" | "point-by-point" | "mixed";
  criticalMach: "single-cp-min" | "single-cp-min-at-stated-lift" | "cp-min-against-lift" | "unchecked" | "mixed";
  machGrid: { machs: number; nodes: number; solves: number; maxError: number; tolerance: number } | null;
}

const SCALING_WORDS: Record<MethodUsedInput["sectionScaling"], string> = {
  "prandtl-glauert": "Prandtl–Glauert's 1/β on every section",
  "at-cp-min": "the rule's ratio at each section's single Cp,min (the default)",
  "point-by-point": "the rule applied point by point over each section's chordwise pressures",
  mixed: "point by point where the sections give chordwise pressures, the rule's ratio at Cp,min elsewhere",
};

const CRITICAL_WORDS: Record<MethodUsedInput["criticalMach"], string> = {
  "single-cp-min": "one Cp,min per section, its lift not stated (taken as a cruise-like cl of 0.4; cases far from it are flagged)",
  "single-cp-min-at-stated-lift": "one Cp,min per section at its stated lift (cases far from it are flagged)",
  "cp-min-against-lift": "Cp,min against lift: each case at its own lift, station by station",
  unchecked: "not checked: no section gives Cp,min",
  mixed: "Cp,min against lift where given, one Cp,min per section elsewhere",
};

const percent = (v: number) => `${(100 * v).toPrecision(2)} %`;

/** The method a result used, line by line (label, text): solver and resolution, convergence, sections, critical Mach, Mach grid. */
export function methodUsedLines(m: MethodUsedInput): [string, string][] {
  const lattice = m.spanwise === "vortex-lattice";
  const c = m.convergence;
  const lines: [string, string][] = [
    ["Spanwise solver", `${lattice ? `Vortex lattice, ${m.strips} strips per semispan` : `Lifting line, ${m.terms} Fourier terms`}; ${m.stations} output stations per semispan`],
    [
      "Convergence estimate",
      `With half the ${lattice ? "strips" : "terms"} (${c.halfResolution}) CLα moves by ${percent(c.clAlpha)}, the root bending moment per unit CL by ${percent(c.rootBending)} and the spanwise loading by up to ${percent(c.loading)} of its peak. ` +
        (lattice ? "The lattice converges at first order, so these also estimate the error left at the strips used." : "The lifting line converges faster, so these over-state its error."),
    ],
    ["Section compressibility", SCALING_WORDS[m.sectionScaling]],
    ["Critical Mach number", CRITICAL_WORDS[m.criticalMach]],
  ];
  if (m.machGrid) {
    lines.push([
      "Mach grid",
      `${m.machGrid.machs} distinct Mach numbers from ${m.machGrid.solves} solves on a grid of ${m.machGrid.nodes}; interpolation error at most ${percent(m.machGrid.maxError)} of the loads at CL = 1 (held under ${percent(m.machGrid.tolerance)}).`,
    ]);
  }
  return lines;
}
