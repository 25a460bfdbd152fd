/**
 * Panel-wise planform entry: each panel is given by its span along the panel (as drawings state it),
 * root and tip chord, leading-edge sweep, dihedral and tip twist, and becomes one more station.
 * Dihedral projects the panel span onto the plane of the wing reference (Δy = span·cos Γ); the
 * loads are computed on that projected planform.
 */
export interface PanelInput {
  span: number;
  rootChord: number;
  tipChord: number;
  sweepLeDeg: number;
  dihedralDeg: number;
  tipTwistDeg: number;
}

export interface StationRow {
  y: number;
  xLe: number;
  chord: number;
  twist: number;
}

const DEG = Math.PI / 180;

export function panelsToStations(rootTwistDeg: number, panels: readonly PanelInput[]): StationRow[] {
  const out: StationRow[] = [{ y: 0, xLe: 0, chord: panels[0]?.rootChord ?? 0, twist: rootTwistDeg }];
  for (const p of panels) {
    const last = out[out.length - 1]!;
    const dy = p.span * Math.cos(p.dihedralDeg * DEG);
    out.push({ y: last.y + dy, xLe: last.xLe + dy * Math.tan(p.sweepLeDeg * DEG), chord: p.tipChord, twist: p.tipTwistDeg });
  }
  return out;
}

/** The straight reference axis of a planform: its chord fractions at root and tip and its sweep (deg, aft positive). */
export function referenceAxisOf(planform: { stations: readonly StationRow[]; axisRoot: number; axisTip: number }): { rootFraction: number; tipFraction: number; sweepDeg: number } {
  const r = planform.stations[0]!;
  const t = planform.stations[planform.stations.length - 1]!;
  const dx = t.xLe + planform.axisTip * t.chord - (r.xLe + planform.axisRoot * r.chord);
  return { rootFraction: planform.axisRoot, tipFraction: planform.axisTip, sweepDeg: Math.atan2(dx, t.y - r.y) / DEG };
}

/** In words, how bending and torsion are taken about the reference axis (loads page and report). */
export function axisConvention(axis: { rootFraction: number; tipFraction: number; sweepDeg: number }): string {
  const pct = (f: number) => `${Number((100 * f).toFixed(1))} %`;
  const swept = Math.abs(axis.sweepDeg) < 0.05 ? "unswept" : `swept ${Math.abs(axis.sweepDeg).toFixed(1)}° ${axis.sweepDeg > 0 ? "aft" : "forward"}`;
  return (
    `Bending and torsion are resolved about the reference axis, the straight line from ${pct(axis.rootFraction)} of the root chord to ${pct(axis.tipFraction)} of the tip chord (${swept}). ` +
    "The wing is cut at streamwise stations; the moment of everything outboard of a cut — lift at the quarter chord, section pitching moments, inertia — is taken about the axis point at that station and resolved: " +
    "torsion is its component along the axis (nose up positive), bending its component about the in-plane normal to the axis (tip up positive). Shear is normal to the wing plane." +
    (Math.abs(axis.sweepDeg) < 0.05 ? " On this unswept axis they are the streamwise bending and pitching moments." : "")
  );
}
