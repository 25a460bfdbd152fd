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
      "Prandtl–Glauert (Glauert 1928): Cp = Cp0/β, β = (1 − M²)^½. Kármán–Tsien (Tsien 1939; von Kármán 1941) and Laitone (1951) as published; section lift slope and cm are scaled by each rule's Cp/Cp0 at the section's incompressible minimum Cp (Prandtl–Glauert's 1/β where no Cp,min is given).",
      "Critical pressure coefficient Cp* from the isentropic relations, γ = 1.4 (NACA Report 1135). Each section's critical Mach number is where its corrected minimum Cp reaches Cp*, found numerically at the first crossing.",
      "Validity: the rules hold only for subsonic flow below the critical Mach number. A case at or above the lowest critical Mach number on the span is computed, marked supercritical and flagged; Mach 1 and above is refused.",
    ],
  },
  {
    title: "Spanwise lift distribution",
    body: [
      "Lifting line (Glauert's Fourier series) for wings of small sweep; vortex lattice (horseshoe vortices on the quarter-chord line, control points at three-quarter chord, cosine spacing, symmetry) for swept, tapered and cranked wings.",
      "Compressibility in the spanwise solve by the Prandtl–Glauert / Göthert transformation (NACA TM 1105): the planform is stretched streamwise by 1/β and solved incompressibly.",
      "Superposition: at each Mach number the basic (zero-lift) and additional (per unit CL) distributions are solved once and combined for every case, which is exact for the linear theory.",
      "Schrenk's approximation (NACA TM 948) is shown beside the solver as the customary cross-check: the mean of the planform chord and an ellipse of equal area and span.",
    ],
  },
  {
    title: "Load cases",
    body: [
      "Manoeuvre limit load factors, stall lines and design speeds per the category chosen in the basis (14 CFR 25.333/25.335/25.337, or 23.333/23.335/23.337 before amendment 23-64). Gust load factors by the Pratt formula (NACA TN 2964) with the alleviation factor and mass ratio at the design gust velocities for VC and VD.",
      "For transport aeroplanes the Pratt gust points are a preliminary estimate only: 14 CFR 25.341(a) requires a dynamic discrete-gust analysis, and flight-profile alleviation is not applied.",
    ],
  },
  {
    title: "Shear, bending and torsion",
    body: [
      "Running lift l(y) = q·c·cl per semispan; inertia relief from the semispan structural mass spread in proportion to chord, times nz·g. Shear, bending moment and torsion are integrated from the tip inward; the envelope is the maximum and minimum at each station with the case that gives it.",
      "Bending and torsion are resolved about the reference axis: the wing is cut at streamwise stations, the moment of all loads outboard of a cut is taken about the axis point at that station, and resolved into its component along the axis (torsion, nose up positive) and about the in-plane normal to the axis (bending, tip up positive). On an unswept axis these are the streamwise bending and pitching moments.",
      "Cases given by angle of attack carry no inertia relief because their load factor is not known.",
    ],
  },
];
